import type { MigrationInterface, QueryRunner } from 'typeorm'

/**
 * room_activity: one row per room with what the rooms list cannot derive from other tables — the
 * last frame edit (who, what, when; written a few seconds after a burst of edits, never per drag)
 * and the outcome of the last solve (settled / unsettled with its reason, a small plan picture).
 */
export class RoomActivity1796232849418 implements MigrationInterface {
  name = 'RoomActivity1796232849418'

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE TABLE \`room_activity\` (
      \`room_id\` CHAR(36) NOT NULL,
      \`edit_user_id\` CHAR(36) NULL,
      \`edit_summary\` VARCHAR(160) NULL,
      \`edit_at\` DATETIME(3) NULL,
      \`solve_state\` VARCHAR(16) NULL,
      \`solve_reason\` VARCHAR(40) NULL,
      \`solved_at\` DATETIME(3) NULL,
      \`thumbnail\` MEDIUMBLOB NULL,
      \`thumbnail_at\` DATETIME(3) NULL,
      PRIMARY KEY (\`room_id\`),
      CONSTRAINT \`fk_room_activity_room\` FOREIGN KEY (\`room_id\`) REFERENCES \`rooms\` (\`id\`) ON DELETE CASCADE,
      CONSTRAINT \`fk_room_activity_user\` FOREIGN KEY (\`edit_user_id\`) REFERENCES \`users\` (\`id\`) ON DELETE SET NULL
    ) ENGINE=InnoDB`)
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query('DROP TABLE `room_activity`')
  }
}
