import type { MigrationInterface, QueryRunner } from 'typeorm'

// Tables for users, rooms and their members, invites, the room document, snapshots, pins and
// the session store (express-mysql-session's own schema, created here so the store never does DDL).
const tables = [
  `CREATE TABLE users (
    id char(36) NOT NULL, email varchar(254) NOT NULL, name varchar(120) NOT NULL,
    password_hash varchar(100) NOT NULL, created_at datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
    PRIMARY KEY (id), UNIQUE INDEX uq_users_email (email)) ENGINE=InnoDB`,
  `CREATE TABLE rooms (
    id char(36) NOT NULL, name varchar(120) NOT NULL, description text NOT NULL,
    created_at datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
    updated_at datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3),
    PRIMARY KEY (id)) ENGINE=InnoDB`,
  `CREATE TABLE memberships (
    id char(36) NOT NULL, room_id char(36) NOT NULL, user_id char(36) NOT NULL,
    role enum('owner','editor','reviewer','viewer') NOT NULL,
    created_at datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
    PRIMARY KEY (id), UNIQUE INDEX uq_memberships_room_user (room_id, user_id),
    CONSTRAINT fk_memberships_room FOREIGN KEY (room_id) REFERENCES rooms (id) ON DELETE CASCADE,
    CONSTRAINT fk_memberships_user FOREIGN KEY (user_id) REFERENCES users (id) ON DELETE CASCADE) ENGINE=InnoDB`,
  `CREATE TABLE invites (
    id char(36) NOT NULL, room_id char(36) NOT NULL, email varchar(254) NOT NULL,
    role enum('owner','editor','reviewer','viewer') NOT NULL, token_hash char(64) NOT NULL,
    expires_at datetime(3) NOT NULL, accepted_at datetime(3) NULL, revoked_at datetime(3) NULL,
    invited_by char(36) NOT NULL, created_at datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
    PRIMARY KEY (id), UNIQUE INDEX uq_invites_token_hash (token_hash), INDEX ix_invites_email (email),
    CONSTRAINT fk_invites_room FOREIGN KEY (room_id) REFERENCES rooms (id) ON DELETE CASCADE,
    CONSTRAINT fk_invites_invited_by FOREIGN KEY (invited_by) REFERENCES users (id) ON DELETE CASCADE) ENGINE=InnoDB`,
  `CREATE TABLE room_documents (
    room_id char(36) NOT NULL, state longblob NOT NULL,
    updated_at datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3),
    PRIMARY KEY (room_id),
    CONSTRAINT fk_room_documents_room FOREIGN KEY (room_id) REFERENCES rooms (id) ON DELETE CASCADE) ENGINE=InnoDB`,
  `CREATE TABLE snapshots (
    id char(36) NOT NULL, room_id char(36) NOT NULL, name varchar(120) NOT NULL, note text NOT NULL,
    author_id char(36) NULL, frame json NOT NULL, surface longblob NOT NULL, figures json NOT NULL,
    created_at datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
    PRIMARY KEY (id), INDEX ix_snapshots_room_created (room_id, created_at),
    CONSTRAINT fk_snapshots_room FOREIGN KEY (room_id) REFERENCES rooms (id) ON DELETE CASCADE,
    CONSTRAINT fk_snapshots_author FOREIGN KEY (author_id) REFERENCES users (id) ON DELETE SET NULL) ENGINE=InnoDB`,
  `CREATE TABLE pins (
    id char(36) NOT NULL, room_id char(36) NOT NULL, author_id char(36) NULL,
    x double NOT NULL, y double NOT NULL, z double NOT NULL, doc_version int unsigned NOT NULL,
    body text NOT NULL, resolved tinyint NOT NULL DEFAULT 0,
    created_at datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
    PRIMARY KEY (id),
    CONSTRAINT fk_pins_room FOREIGN KEY (room_id) REFERENCES rooms (id) ON DELETE CASCADE,
    CONSTRAINT fk_pins_author FOREIGN KEY (author_id) REFERENCES users (id) ON DELETE SET NULL) ENGINE=InnoDB`,
  `CREATE TABLE pin_replies (
    id char(36) NOT NULL, pin_id char(36) NOT NULL, author_id char(36) NULL, body text NOT NULL,
    created_at datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
    PRIMARY KEY (id),
    CONSTRAINT fk_pin_replies_pin FOREIGN KEY (pin_id) REFERENCES pins (id) ON DELETE CASCADE,
    CONSTRAINT fk_pin_replies_author FOREIGN KEY (author_id) REFERENCES users (id) ON DELETE SET NULL) ENGINE=InnoDB`,
  `CREATE TABLE sessions (
    session_id varchar(128) COLLATE utf8mb4_bin NOT NULL, expires int(11) unsigned NOT NULL,
    data mediumtext COLLATE utf8mb4_bin, PRIMARY KEY (session_id)) ENGINE=InnoDB`,
]

const dropOrder = [
  'sessions',
  'pin_replies',
  'pins',
  'snapshots',
  'room_documents',
  'invites',
  'memberships',
  'rooms',
  'users',
]

export class InitialSchema1796169000000 implements MigrationInterface {
  name = 'InitialSchema1796169000000'

  async up(queryRunner: QueryRunner): Promise<void> {
    for (const sql of tables) await queryRunner.query(sql)
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    for (const table of dropOrder) await queryRunner.query(`DROP TABLE ${table}`)
  }
}
