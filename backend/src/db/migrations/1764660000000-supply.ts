import type { MigrationInterface, QueryRunner } from 'typeorm';

/** Supply: wards, sources, readings, feeds, the demand model, scenarios and scheduled deliveries. */
export class Supply1764660000000 implements MigrationInterface {
  name = 'Supply1764660000000';

  async up(q: QueryRunner): Promise<void> {
    const T = 'ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci';
    await q.query(`CREATE TABLE ward (
      id INT AUTO_INCREMENT PRIMARY KEY,
      site_id INT NOT NULL,
      name VARCHAR(120) NOT NULL,
      department VARCHAR(32) NOT NULL,
      beds INT NOT NULL DEFAULT 0,
      leakage_percent DOUBLE NOT NULL DEFAULT 0,
      active TINYINT(1) NOT NULL DEFAULT 1,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      updated_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3),
      UNIQUE KEY uq_ward_name (site_id, name),
      CONSTRAINT fk_ward_site FOREIGN KEY (site_id) REFERENCES site(id)
    ) ${T}`);
    await q.query(`CREATE TABLE supply_source (
      id INT AUTO_INCREMENT PRIMARY KEY,
      site_id INT NOT NULL,
      name VARCHAR(120) NOT NULL,
      type VARCHAR(24) NOT NULL,
      gas_code VARCHAR(16) NOT NULL,
      supplier_id INT NULL,
      capacity_kg DOUBLE NULL,
      evaporation_percent_per_day DOUBLE NULL,
      vaporiser_m3_h DOUBLE NULL,
      vaporiser_derating DOUBLE NULL,
      min_level_alarm_percent DOUBLE NULL,
      reserve_percent DOUBLE NULL,
      calibration_json LONGTEXT NULL,
      calibration_unit VARCHAR(24) NULL,
      cylinder_type_id INT NULL,
      cylinders_per_bank INT NULL,
      regulator_l_min DOUBLE NULL,
      changeover_gauge_bar DOUBLE NULL,
      temperature_c DOUBLE NULL,
      backs_up_json VARCHAR(500) NULL,
      reorder_mode VARCHAR(10) NOT NULL DEFAULT 'none',
      reorder_level DOUBLE NULL,
      order_up_to DOUBLE NULL,
      lead_time_hours INT NULL,
      forecast_basis VARCHAR(10) NOT NULL DEFAULT 'model',
      model_correction_factor DOUBLE NOT NULL DEFAULT 1,
      notes VARCHAR(1000) NOT NULL DEFAULT '',
      active TINYINT(1) NOT NULL DEFAULT 1,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      updated_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3),
      UNIQUE KEY uq_source_name (site_id, name),
      CONSTRAINT fk_source_site FOREIGN KEY (site_id) REFERENCES site(id),
      CONSTRAINT fk_source_gas FOREIGN KEY (gas_code) REFERENCES gas(code),
      CONSTRAINT fk_source_supplier FOREIGN KEY (supplier_id) REFERENCES supplier(id),
      CONSTRAINT fk_source_cyl FOREIGN KEY (cylinder_type_id) REFERENCES cylinder_type(id)
    ) ${T}`);
    await q.query(`CREATE TABLE source_reading (
      id BIGINT AUTO_INCREMENT PRIMARY KEY,
      source_id INT NOT NULL,
      taken_at DATETIME(3) NOT NULL,
      kind VARCHAR(20) NOT NULL,
      value DOUBLE NULL,
      detail_json LONGTEXT NULL,
      contents DOUBLE NOT NULL,
      method VARCHAR(16) NOT NULL,
      taken_by_user_id INT NULL,
      note VARCHAR(500) NOT NULL DEFAULT '',
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      KEY ix_reading_source_time (source_id, taken_at),
      CONSTRAINT fk_reading_source FOREIGN KEY (source_id) REFERENCES supply_source(id) ON DELETE CASCADE
    ) ${T}`);
    await q.query(`CREATE TABLE ward_feed (
      id INT AUTO_INCREMENT PRIMARY KEY,
      ward_id INT NOT NULL,
      source_id INT NOT NULL,
      gas_code VARCHAR(16) NOT NULL,
      role VARCHAR(10) NOT NULL,
      UNIQUE KEY uq_feed (ward_id, gas_code, source_id),
      CONSTRAINT fk_feed_ward FOREIGN KEY (ward_id) REFERENCES ward(id) ON DELETE CASCADE,
      CONSTRAINT fk_feed_source FOREIGN KEY (source_id) REFERENCES supply_source(id) ON DELETE CASCADE
    ) ${T}`);
    await q.query(`CREATE TABLE therapy_line (
      id INT AUTO_INCREMENT PRIMARY KEY,
      ward_id INT NOT NULL,
      gas_code VARCHAR(16) NOT NULL,
      device VARCHAR(24) NOT NULL,
      patients DOUBLE NOT NULL,
      flow_l_min DOUBLE NULL,
      hours_json VARCHAR(120) NULL,
      weekdays_json VARCHAR(40) NULL,
      label VARCHAR(120) NOT NULL DEFAULT '',
      KEY ix_therapy_ward (ward_id),
      CONSTRAINT fk_therapy_ward FOREIGN KEY (ward_id) REFERENCES ward(id) ON DELETE CASCADE
    ) ${T}`);
    await q.query(`CREATE TABLE device_flow (
      id INT AUTO_INCREMENT PRIMARY KEY,
      organisation_id INT NOT NULL,
      device VARCHAR(24) NOT NULL,
      flow_l_min DOUBLE NOT NULL,
      UNIQUE KEY uq_device_flow (organisation_id, device),
      CONSTRAINT fk_device_flow_org FOREIGN KEY (organisation_id) REFERENCES organisation(id)
    ) ${T}`);
    await q.query(`CREATE TABLE scenario (
      id INT AUTO_INCREMENT PRIMARY KEY,
      site_id INT NOT NULL,
      name VARCHAR(120) NOT NULL,
      multiplier DOUBLE NOT NULL DEFAULT 1,
      extra_patients DOUBLE NOT NULL DEFAULT 0,
      extra_flow_l_min DOUBLE NOT NULL DEFAULT 0,
      ward_id INT NULL,
      ward_change VARCHAR(8) NULL,
      from_local VARCHAR(16) NOT NULL,
      until_local VARCHAR(16) NULL,
      note VARCHAR(500) NOT NULL DEFAULT '',
      UNIQUE KEY uq_scenario_name (site_id, name),
      CONSTRAINT fk_scenario_site FOREIGN KEY (site_id) REFERENCES site(id),
      CONSTRAINT fk_scenario_ward FOREIGN KEY (ward_id) REFERENCES ward(id) ON DELETE SET NULL
    ) ${T}`);
    await q.query(`CREATE TABLE scheduled_delivery (
      id INT AUTO_INCREMENT PRIMARY KEY,
      source_id INT NOT NULL,
      due_at DATETIME(3) NOT NULL,
      kg DOUBLE NULL,
      cylinders INT NULL,
      status VARCHAR(12) NOT NULL DEFAULT 'scheduled',
      reference VARCHAR(120) NOT NULL DEFAULT '',
      KEY ix_delivery_source (source_id, due_at),
      CONSTRAINT fk_delivery_source FOREIGN KEY (source_id) REFERENCES supply_source(id) ON DELETE CASCADE
    ) ${T}`);
  }

  async down(q: QueryRunner): Promise<void> {
    for (const t of ['scheduled_delivery', 'scenario', 'device_flow', 'therapy_line', 'ward_feed', 'source_reading', 'supply_source', 'ward'])
      await q.query(`DROP TABLE IF EXISTS ${t}`);
  }
}
