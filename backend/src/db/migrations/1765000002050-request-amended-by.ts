import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Who last changed a reorder request's quantity or price. The four-eyes rule counts that person as the
 * raiser: someone else must approve what they changed.
 */
export class RequestAmendedBy1765000002050 implements MigrationInterface {
  name = 'RequestAmendedBy1765000002050';

  async up(q: QueryRunner): Promise<void> {
    await q.query(
      'ALTER TABLE reorder_request ADD COLUMN amended_by_user_id INT NULL AFTER requested_by_user_id, ADD CONSTRAINT fk_request_amended_by FOREIGN KEY (amended_by_user_id) REFERENCES app_user(id)',
    );
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query('ALTER TABLE reorder_request DROP FOREIGN KEY fk_request_amended_by, DROP COLUMN amended_by_user_id');
  }
}
