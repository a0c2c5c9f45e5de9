import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Ward grants: which wards a ward lead reports for. A ward lead sees and files only the wards granted
 * here (on top of the site grant in user_site); other roles keep site-level access. The composite key
 * is the primary key, so every row is addressable (a Galera cluster needs a primary key on every table).
 */
export class WardGrants1765000003000 implements MigrationInterface {
  name = 'WardGrants1765000003000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE TABLE user_ward (
      user_id INT NOT NULL,
      ward_id INT NOT NULL,
      granted_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      PRIMARY KEY (user_id, ward_id),
      KEY ix_user_ward_ward (ward_id),
      CONSTRAINT fk_user_ward_user FOREIGN KEY (user_id) REFERENCES app_user(id) ON DELETE CASCADE,
      CONSTRAINT fk_user_ward_ward FOREIGN KEY (ward_id) REFERENCES ward(id) ON DELETE CASCADE
    ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query('DROP TABLE IF EXISTS user_ward');
  }
}
