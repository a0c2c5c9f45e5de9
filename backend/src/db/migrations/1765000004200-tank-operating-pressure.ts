import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * The working pressure of a bulk liquid tank, bar(g): litres of liquid are converted to kg at the
 * saturated-liquid density at this pressure. NULL means the stated default (7 bar g).
 */
export class TankOperatingPressure1765000004200 implements MigrationInterface {
  name = 'TankOperatingPressure1765000004200';

  async up(q: QueryRunner): Promise<void> {
    await q.query('ALTER TABLE supply_source ADD COLUMN operating_pressure_bar DOUBLE NULL');
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query('ALTER TABLE supply_source DROP COLUMN operating_pressure_bar');
  }
}
