import type { MigrationInterface, QueryRunner } from 'typeorm';

/** Capacity: diversity rule sets, pipeline zones, pipe runs and the engineer's sign-offs. */
export class Capacity1764670000000 implements MigrationInterface {
  name = 'Capacity1764670000000';

  async up(q: QueryRunner): Promise<void> {
    const T = 'ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci';
    await q.query(`CREATE TABLE rule_set (
      id INT AUTO_INCREMENT PRIMARY KEY,
      organisation_id INT NOT NULL,
      name VARCHAR(120) NOT NULL,
      based_on VARCHAR(32) NULL,
      json LONGTEXT NOT NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      updated_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3),
      UNIQUE KEY uq_rule_set_name (organisation_id, name),
      CONSTRAINT fk_rule_set_org FOREIGN KEY (organisation_id) REFERENCES organisation(id)
    ) ${T}`);
    // gas_code has no foreign key: vacuum (VAC) is a pipeline service, not a catalogue gas.
    await q.query(`CREATE TABLE pipeline_zone (
      id INT AUTO_INCREMENT PRIMARY KEY,
      site_id INT NOT NULL,
      name VARCHAR(120) NOT NULL,
      gas_code VARCHAR(16) NOT NULL,
      department VARCHAR(32) NOT NULL,
      terminal_units INT NOT NULL,
      source_id INT NULL,
      rule_set_id INT NULL,
      builtin_rule_set VARCHAR(32) NOT NULL DEFAULT 'default',
      diversity_method VARCHAR(16) NOT NULL DEFAULT 'rule_set',
      unit_flow_l_min DOUBLE NULL,
      use_probability DOUBLE NULL,
      confidence DOUBLE NULL,
      notes VARCHAR(1000) NOT NULL DEFAULT '',
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      updated_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3),
      UNIQUE KEY uq_zone_name (site_id, name),
      CONSTRAINT chk_zone_units CHECK (terminal_units >= 1),
      CONSTRAINT fk_zone_site FOREIGN KEY (site_id) REFERENCES site(id),
      CONSTRAINT fk_zone_source FOREIGN KEY (source_id) REFERENCES supply_source(id) ON DELETE SET NULL,
      CONSTRAINT fk_zone_rule_set FOREIGN KEY (rule_set_id) REFERENCES rule_set(id)
    ) ${T}`);
    await q.query(`CREATE TABLE pipe_run (
      id INT AUTO_INCREMENT PRIMARY KEY,
      zone_id INT NOT NULL,
      name VARCHAR(120) NOT NULL,
      length_m DOUBLE NOT NULL,
      tube VARCHAR(16) NOT NULL,
      fittings_allowance_percent DOUBLE NOT NULL DEFAULT 20,
      line_pressure_kpa DOUBLE NOT NULL DEFAULT 400,
      allowed_drop_kpa DOUBLE NULL,
      gas_temperature_c DOUBLE NULL,
      sort_order INT NOT NULL DEFAULT 0,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      updated_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3),
      UNIQUE KEY uq_pipe_run_name (zone_id, name),
      CONSTRAINT chk_pipe_length CHECK (length_m > 0),
      CONSTRAINT fk_pipe_run_zone FOREIGN KEY (zone_id) REFERENCES pipeline_zone(id) ON DELETE CASCADE
    ) ${T}`);
    await q.query(`CREATE TABLE capacity_signoff (
      id INT AUTO_INCREMENT PRIMARY KEY,
      site_id INT NOT NULL,
      engineer_name VARCHAR(190) NOT NULL,
      user_id INT NULL,
      signed_at DATETIME(3) NOT NULL,
      inputs_hash CHAR(64) NOT NULL,
      note VARCHAR(1000) NOT NULL DEFAULT '',
      summary_json LONGTEXT NOT NULL,
      KEY ix_signoff_site_time (site_id, signed_at),
      CONSTRAINT fk_signoff_site FOREIGN KEY (site_id) REFERENCES site(id),
      CONSTRAINT fk_signoff_user FOREIGN KEY (user_id) REFERENCES app_user(id) ON DELETE SET NULL
    ) ${T}`);
  }

  async down(q: QueryRunner): Promise<void> {
    for (const t of ['capacity_signoff', 'pipe_run', 'pipeline_zone', 'rule_set']) await q.query(`DROP TABLE IF EXISTS ${t}`);
  }
}
