import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Sign-in defences: how many temporary locks an account has had since its last successful sign-in (each
 * lock lasts twice as long as the one before, up to a cap), and the same counter for e-mails that have no
 * active account, so that their answers are the same as an account's (the lock does not reveal who exists).
 */
export class SignInDefences1765000001000 implements MigrationInterface {
  name = 'SignInDefences1765000001000';

  async up(q: QueryRunner): Promise<void> {
    await q.query('ALTER TABLE app_user ADD COLUMN lock_count INT NOT NULL DEFAULT 0 AFTER locked_until');
    await q.query(`CREATE TABLE sign_in_unknown (
      email_key VARCHAR(190) NOT NULL PRIMARY KEY,
      failed_logins INT NOT NULL DEFAULT 0,
      lock_count INT NOT NULL DEFAULT 0,
      locked_until DATETIME(3) NULL,
      updated_at DATETIME(3) NOT NULL,
      KEY ix_sign_in_unknown_updated (updated_at)
    ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query('DROP TABLE IF EXISTS sign_in_unknown');
    await q.query('ALTER TABLE app_user DROP COLUMN lock_count');
  }
}
