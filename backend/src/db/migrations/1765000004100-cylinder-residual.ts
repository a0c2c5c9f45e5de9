import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * The gauge pressure at which a cylinder of a type is changed (gas left behind), bar(g). NULL means the
 * stated default (10 % of the fill pressure); cylinder-store forecasts no longer drain cylinders flat.
 */
export class CylinderResidual1765000004100 implements MigrationInterface {
  name = 'CylinderResidual1765000004100';

  async up(q: QueryRunner): Promise<void> {
    await q.query('ALTER TABLE cylinder_type ADD COLUMN residual_gauge_bar DOUBLE NULL');
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query('ALTER TABLE cylinder_type DROP COLUMN residual_gauge_bar');
  }
}
