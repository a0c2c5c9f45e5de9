import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Usage: ward usage reports and their lines, reminder bookkeeping, CSV uploads (file by content hash,
 * background job with its progress), flow-meter totals and historic usage per ward and day.
 * Local dates are CHAR(10) `yyyy-MM-dd` (the ward's calendar day, not an instant): no time-zone
 * conversion can move them, and they sort as text.
 */
export class Usage1764690000000 implements MigrationInterface {
  name = 'Usage1764690000000';

  async up(q: QueryRunner): Promise<void> {
    const T = 'ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci';
    await q.query(`CREATE TABLE usage_report (
      id INT AUTO_INCREMENT PRIMARY KEY,
      site_id INT NOT NULL,
      ward_id INT NOT NULL,
      report_date CHAR(10) NOT NULL,
      note VARCHAR(1000) NOT NULL DEFAULT '',
      submitted_by_user_id INT NULL,
      submitted_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      updated_by_user_id INT NULL,
      updated_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3),
      UNIQUE KEY uq_usage_report_ward_date (ward_id, report_date),
      KEY ix_usage_report_site_date (site_id, report_date),
      CONSTRAINT fk_usage_report_site FOREIGN KEY (site_id) REFERENCES site(id),
      CONSTRAINT fk_usage_report_ward FOREIGN KEY (ward_id) REFERENCES ward(id) ON DELETE CASCADE
    ) ${T}`);
    await q.query(`CREATE TABLE usage_report_line (
      id INT AUTO_INCREMENT PRIMARY KEY,
      report_id INT NOT NULL,
      line_kind VARCHAR(10) NOT NULL,
      device VARCHAR(24) NULL,
      patients_now INT NULL,
      patients_shift INT NULL,
      cylinder_type_id INT NULL,
      cylinders_used INT NULL,
      cylinders_returned INT NULL,
      KEY ix_usage_line_report (report_id),
      CONSTRAINT fk_usage_line_report FOREIGN KEY (report_id) REFERENCES usage_report(id) ON DELETE CASCADE,
      CONSTRAINT fk_usage_line_cyl FOREIGN KEY (cylinder_type_id) REFERENCES cylinder_type(id)
    ) ${T}`);
    await q.query(`CREATE TABLE usage_reminder (
      id INT AUTO_INCREMENT PRIMARY KEY,
      site_id INT NOT NULL,
      ward_id INT NOT NULL,
      local_date CHAR(10) NOT NULL,
      recipients VARCHAR(2000) NOT NULL DEFAULT '',
      sent_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      UNIQUE KEY uq_usage_reminder (ward_id, local_date),
      CONSTRAINT fk_usage_reminder_site FOREIGN KEY (site_id) REFERENCES site(id),
      CONSTRAINT fk_usage_reminder_ward FOREIGN KEY (ward_id) REFERENCES ward(id) ON DELETE CASCADE
    ) ${T}`);
    await q.query(`CREATE TABLE import_file (
      id INT AUTO_INCREMENT PRIMARY KEY,
      organisation_id INT NOT NULL,
      site_id INT NOT NULL,
      sha256 CHAR(64) NOT NULL,
      original_name VARCHAR(255) NOT NULL,
      size_bytes BIGINT NOT NULL,
      line_count INT NOT NULL DEFAULT 0,
      storage_path VARCHAR(500) NULL,
      uploaded_by_user_id INT NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      KEY ix_import_file_hash (site_id, sha256),
      CONSTRAINT fk_import_file_site FOREIGN KEY (site_id) REFERENCES site(id)
    ) ${T}`);
    await q.query(`CREATE TABLE import_job (
      id INT AUTO_INCREMENT PRIMARY KEY,
      organisation_id INT NOT NULL,
      site_id INT NOT NULL,
      file_id INT NOT NULL,
      kind VARCHAR(24) NOT NULL,
      status VARCHAR(12) NOT NULL,
      options_json LONGTEXT NOT NULL,
      header_json LONGTEXT NULL,
      sample_json LONGTEXT NULL,
      preview_json LONGTEXT NULL,
      errors_json LONGTEXT NULL,
      error_count INT NOT NULL DEFAULT 0,
      total_rows INT NULL,
      processed_rows INT NOT NULL DEFAULT 0,
      inserted_rows INT NOT NULL DEFAULT 0,
      message VARCHAR(1000) NOT NULL DEFAULT '',
      cancel_requested TINYINT(1) NOT NULL DEFAULT 0,
      confirm_duplicate TINYINT(1) NOT NULL DEFAULT 0,
      attempts INT NOT NULL DEFAULT 0,
      worker_id VARCHAR(64) NULL,
      heartbeat_at DATETIME(3) NULL,
      created_by_user_id INT NULL,
      committed_by_user_id INT NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      started_at DATETIME(3) NULL,
      finished_at DATETIME(3) NULL,
      updated_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3),
      KEY ix_import_job_status (status),
      KEY ix_import_job_site (site_id, created_at),
      CONSTRAINT fk_import_job_site FOREIGN KEY (site_id) REFERENCES site(id),
      CONSTRAINT fk_import_job_file FOREIGN KEY (file_id) REFERENCES import_file(id)
    ) ${T}`);
    await q.query(`CREATE TABLE flow_meter_reading (
      id BIGINT AUTO_INCREMENT PRIMARY KEY,
      site_id INT NOT NULL,
      ward_id INT NULL,
      source_id INT NULL,
      taken_at DATETIME(3) NOT NULL,
      total_l DOUBLE NOT NULL,
      note VARCHAR(500) NOT NULL DEFAULT '',
      import_job_id INT NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      KEY ix_meter_ward_time (ward_id, taken_at),
      KEY ix_meter_source_time (source_id, taken_at),
      CONSTRAINT fk_meter_site FOREIGN KEY (site_id) REFERENCES site(id),
      CONSTRAINT fk_meter_ward FOREIGN KEY (ward_id) REFERENCES ward(id) ON DELETE CASCADE,
      CONSTRAINT fk_meter_source FOREIGN KEY (source_id) REFERENCES supply_source(id) ON DELETE CASCADE
    ) ${T}`);
    await q.query(`CREATE TABLE usage_history (
      id BIGINT AUTO_INCREMENT PRIMARY KEY,
      site_id INT NOT NULL,
      ward_id INT NOT NULL,
      gas_code VARCHAR(16) NOT NULL,
      usage_date CHAR(10) NOT NULL,
      volume_l DOUBLE NOT NULL,
      note VARCHAR(500) NOT NULL DEFAULT '',
      import_job_id INT NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      UNIQUE KEY uq_usage_history (ward_id, gas_code, usage_date),
      CONSTRAINT fk_usage_history_site FOREIGN KEY (site_id) REFERENCES site(id),
      CONSTRAINT fk_usage_history_ward FOREIGN KEY (ward_id) REFERENCES ward(id) ON DELETE CASCADE
    ) ${T}`);
  }

  async down(q: QueryRunner): Promise<void> {
    for (const t of ['usage_history', 'flow_meter_reading', 'import_job', 'import_file', 'usage_reminder', 'usage_report_line', 'usage_report'])
      await q.query(`DROP TABLE IF EXISTS ${t}`);
  }
}
