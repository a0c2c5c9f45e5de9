import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * A per-site data version, bumped by every write that changes a forecast input (sources, readings,
 * wards, demand model, scenarios, deliveries). App processes cache computed forecasts by it, so a change
 * made in any process is seen by all of them at once.
 */
export class SiteDataVersion1764665000000 implements MigrationInterface {
  name = 'SiteDataVersion1764665000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query('ALTER TABLE site ADD COLUMN data_version BIGINT NOT NULL DEFAULT 0');
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query('ALTER TABLE site DROP COLUMN data_version');
  }
}
