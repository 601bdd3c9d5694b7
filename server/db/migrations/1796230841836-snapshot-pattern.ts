import type { MigrationInterface, QueryRunner } from 'typeorm'

/** A snapshot keeps the room's flat patterns (PRODUCT.md "pattern result") when it had seams. */
export class SnapshotPattern1796230841836 implements MigrationInterface {
  name = 'SnapshotPattern1796230841836'

  async up(q: QueryRunner): Promise<void> {
    await q.query('ALTER TABLE `snapshots` ADD COLUMN `pattern` JSON NULL')
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query('ALTER TABLE `snapshots` DROP COLUMN `pattern`')
  }
}
