import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * A per-user session generation, stored in each signed-in session and compared on every request: a new
 * password (changed by the user or reset by an administrator) bumps it, which ends every other session of
 * that user in every app process at once.
 */
export class SessionGeneration1765000002000 implements MigrationInterface {
  name = 'SessionGeneration1765000002000';

  async up(q: QueryRunner): Promise<void> {
    await q.query('ALTER TABLE app_user ADD COLUMN session_generation INT NOT NULL DEFAULT 0 AFTER password_changed_at');
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query('ALTER TABLE app_user DROP COLUMN session_generation');
  }
}
