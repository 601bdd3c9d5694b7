import type { MigrationInterface, QueryRunner } from 'typeorm'

/**
 * The live room's update log (room_updates) and the document version counter stored with the
 * compacted state (room_documents.version: incremented by the server on every accepted update).
 */
export class RoomUpdates1796180000000 implements MigrationInterface {
  name = 'RoomUpdates1796180000000'

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE TABLE \`room_updates\` (
      \`id\` BIGINT UNSIGNED NOT NULL AUTO_INCREMENT,
      \`room_id\` CHAR(36) NOT NULL,
      \`update\` LONGBLOB NOT NULL,
      \`version\` INT UNSIGNED NOT NULL,
      \`created_at\` DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      PRIMARY KEY (\`id\`),
      KEY \`idx_room_updates_room\` (\`room_id\`, \`id\`),
      CONSTRAINT \`fk_room_updates_room\` FOREIGN KEY (\`room_id\`) REFERENCES \`rooms\` (\`id\`) ON DELETE CASCADE
    ) ENGINE=InnoDB`)
    await q.query('ALTER TABLE `room_documents` ADD COLUMN `version` INT UNSIGNED NOT NULL DEFAULT 0')
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query('ALTER TABLE `room_documents` DROP COLUMN `version`')
    await q.query('DROP TABLE `room_updates`')
  }
}
