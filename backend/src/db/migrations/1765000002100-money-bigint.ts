import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Order totals and approval limits in BIGINT: a quantity times a unit price passes the 2^31 − 1 minor
 * units of an INT (a hundred cylinders at the price list's maximum), which MariaDB refused as out of range.
 * Unit prices stay INT (the schemas bound them well inside it).
 */
export class MoneyBigint1765000002100 implements MigrationInterface {
  name = 'MoneyBigint1765000002100';

  async up(q: QueryRunner): Promise<void> {
    await q.query('ALTER TABLE reorder_request MODIFY total_minor BIGINT NULL');
    await q.query('ALTER TABLE request_approval MODIFY limit_minor BIGINT NOT NULL, MODIFY total_minor BIGINT NOT NULL');
    await q.query('ALTER TABLE purchase_order MODIFY total_minor BIGINT NOT NULL');
    await q.query('ALTER TABLE user_approval_limit MODIFY limit_minor BIGINT NOT NULL');
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query('ALTER TABLE user_approval_limit MODIFY limit_minor INT NOT NULL');
    await q.query('ALTER TABLE purchase_order MODIFY total_minor INT NOT NULL');
    await q.query('ALTER TABLE request_approval MODIFY limit_minor INT NOT NULL, MODIFY total_minor INT NOT NULL');
    await q.query('ALTER TABLE reorder_request MODIFY total_minor INT NULL');
  }
}
