import type { MigrationInterface, QueryRunner } from 'typeorm'

// Underlay images per room, the fake SMTP server's mailbox, and an updated_at on pins so the API
// can tell when a pin's text or resolved flag last changed.
export class TeamworkTables1796170500000 implements MigrationInterface {
  name = 'TeamworkTables1796170500000'

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`CREATE TABLE room_underlays (
      room_id char(36) NOT NULL, image longblob NOT NULL, mime varchar(20) NOT NULL,
      width int unsigned NOT NULL, height int unsigned NOT NULL,
      ax double NOT NULL, ay double NOT NULL, bx double NOT NULL, \`by\` double NOT NULL,
      distance double NOT NULL, origin_x double NOT NULL, origin_y double NOT NULL,
      updated_by char(36) NULL,
      updated_at datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3),
      PRIMARY KEY (room_id),
      CONSTRAINT fk_room_underlays_room FOREIGN KEY (room_id) REFERENCES rooms (id) ON DELETE CASCADE,
      CONSTRAINT fk_room_underlays_user FOREIGN KEY (updated_by) REFERENCES users (id) ON DELETE SET NULL) ENGINE=InnoDB`)
    await queryRunner.query(`CREATE TABLE dev_mail (
      id char(36) NOT NULL, to_addr varchar(1000) NOT NULL, subject text NOT NULL,
      text mediumtext NOT NULL, html mediumtext NULL, received_at datetime(3) NOT NULL,
      PRIMARY KEY (id), INDEX ix_dev_mail_received (received_at)) ENGINE=InnoDB`)
    await queryRunner.query(`ALTER TABLE pins ADD COLUMN updated_at datetime(3) NOT NULL
      DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3) AFTER created_at`)
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query('ALTER TABLE pins DROP COLUMN updated_at')
    await queryRunner.query('DROP TABLE dev_mail')
    await queryRunner.query('DROP TABLE room_underlays')
  }
}
