import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Foundation: organisations, sites, users and roles, the gas and cylinder catalogue, suppliers,
 * the audit log, the local mail service's store and the rate-limit counters.
 * Times are DATETIME(3) in UTC; money is integer minor units; quantities are DOUBLE.
 */
export class Foundation1764650000000 implements MigrationInterface {
  name = 'Foundation1764650000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE TABLE organisation (
      id INT AUTO_INCREMENT PRIMARY KEY,
      name VARCHAR(190) NOT NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3)
    ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

    await q.query(`CREATE TABLE site (
      id INT AUTO_INCREMENT PRIMARY KEY,
      organisation_id INT NOT NULL,
      name VARCHAR(190) NOT NULL,
      kind VARCHAR(20) NOT NULL,
      address VARCHAR(500) NOT NULL DEFAULT '',
      time_zone VARCHAR(64) NOT NULL,
      reference_code VARCHAR(8) NOT NULL,
      unit_system VARCHAR(8) NOT NULL,
      altitude_m DOUBLE NOT NULL,
      atmospheric_bar DOUBLE NOT NULL,
      currency CHAR(3) NOT NULL,
      cylinder_colours VARCHAR(10) NOT NULL,
      store_temperature_c DOUBLE NOT NULL,
      beds INT NOT NULL DEFAULT 0,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      updated_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3),
      UNIQUE KEY uq_site_org_name (organisation_id, name),
      CONSTRAINT fk_site_org FOREIGN KEY (organisation_id) REFERENCES organisation(id)
    ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

    await q.query(`CREATE TABLE app_user (
      id INT AUTO_INCREMENT PRIMARY KEY,
      organisation_id INT NOT NULL,
      email VARCHAR(190) NOT NULL,
      name VARCHAR(190) NOT NULL,
      password_hash VARCHAR(100) NOT NULL,
      active TINYINT(1) NOT NULL DEFAULT 1,
      failed_logins INT NOT NULL DEFAULT 0,
      locked_until DATETIME(3) NULL,
      password_changed_at DATETIME(3) NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      UNIQUE KEY uq_user_email (email),
      CONSTRAINT fk_user_org FOREIGN KEY (organisation_id) REFERENCES organisation(id)
    ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

    await q.query(`CREATE TABLE user_role (
      user_id INT NOT NULL,
      role VARCHAR(32) NOT NULL,
      PRIMARY KEY (user_id, role),
      CONSTRAINT fk_user_role_user FOREIGN KEY (user_id) REFERENCES app_user(id) ON DELETE CASCADE
    ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

    await q.query(`CREATE TABLE user_site (
      user_id INT NOT NULL,
      site_id INT NOT NULL,
      PRIMARY KEY (user_id, site_id),
      CONSTRAINT fk_user_site_user FOREIGN KEY (user_id) REFERENCES app_user(id) ON DELETE CASCADE,
      CONSTRAINT fk_user_site_site FOREIGN KEY (site_id) REFERENCES site(id) ON DELETE CASCADE
    ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

    await q.query(`CREATE TABLE gas (
      code VARCHAR(16) PRIMARY KEY,
      name VARCHAR(100) NOT NULL,
      state VARCHAR(16) NOT NULL,
      iso32_colours VARCHAR(100) NOT NULL,
      cga_colours VARCHAR(100) NOT NULL,
      sort_order INT NOT NULL DEFAULT 0
    ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

    // Shoulder colours: ISO 32 and the US convention (CGA C-9), hex approximations of the named
    // colours (from memory: white, black, blue, grey, brown, dark green; US green and yellow).
    const gases: [string, string, string, string, string][] = [
      ['O2', 'Oxygen', 'compressed', '#f4f4f0', '#2e8b57'],
      ['AIR', 'Medical air', 'compressed', '#f4f4f0,#1c1c1c', '#f2c500'],
      ['N2O', 'Nitrous oxide', 'liquefied', '#1e4a8c', '#1e4a8c'],
      ['N2O_O2_50', 'Nitrous oxide/oxygen 50:50', 'compressed', '#1e4a8c,#f4f4f0', '#1e4a8c,#2e8b57'],
      ['CO2', 'Carbon dioxide', 'liquefied', '#8a8d8f', '#8a8d8f'],
      ['HE', 'Helium', 'compressed', '#6b4a36', '#6b4a36'],
      ['HE_O2_79', 'Helium/oxygen 79/21', 'compressed', '#6b4a36,#f4f4f0', '#6b4a36,#2e8b57'],
      ['HE_O2_80', 'Helium/oxygen 80/20', 'compressed', '#6b4a36,#f4f4f0', '#6b4a36,#2e8b57'],
      ['N2', 'Nitrogen (surgical tools)', 'compressed', '#1c1c1c', '#1c1c1c'],
      ['AR', 'Argon', 'compressed', '#2e5b3c', ''],
    ];
    for (const [i, g] of gases.entries()) {
      await q.query(`INSERT INTO gas (code, name, state, iso32_colours, cga_colours, sort_order) VALUES (?, ?, ?, ?, ?, ?)`, [...g, i]);
    }

    await q.query(`CREATE TABLE cylinder_type (
      id INT AUTO_INCREMENT PRIMARY KEY,
      organisation_id INT NOT NULL,
      gas_code VARCHAR(16) NOT NULL,
      water_capacity_l DOUBLE NOT NULL,
      fill_pressure_bar DOUBLE NOT NULL,
      tare_kg DOUBLE NULL,
      max_filling_ratio_kg_per_l DOUBLE NULL,
      material VARCHAR(60) NOT NULL DEFAULT '',
      valve_notes VARCHAR(300) NOT NULL DEFAULT '',
      active TINYINT(1) NOT NULL DEFAULT 1,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      updated_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3),
      UNIQUE KEY uq_cyl_type (organisation_id, gas_code, water_capacity_l, fill_pressure_bar),
      CONSTRAINT fk_cyl_org FOREIGN KEY (organisation_id) REFERENCES organisation(id),
      CONSTRAINT fk_cyl_gas FOREIGN KEY (gas_code) REFERENCES gas(code)
    ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

    await q.query(`CREATE TABLE supplier (
      id INT AUTO_INCREMENT PRIMARY KEY,
      organisation_id INT NOT NULL,
      name VARCHAR(190) NOT NULL,
      order_email VARCHAR(190) NOT NULL,
      phone VARCHAR(40) NOT NULL DEFAULT '',
      lead_time_hours INT NOT NULL,
      rental_minor_per_cylinder_day INT NOT NULL DEFAULT 0,
      min_bulk_drop_kg DOUBLE NOT NULL DEFAULT 0,
      currency CHAR(3) NOT NULL,
      active TINYINT(1) NOT NULL DEFAULT 1,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      updated_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3),
      UNIQUE KEY uq_supplier_name (organisation_id, name),
      CONSTRAINT fk_supplier_org FOREIGN KEY (organisation_id) REFERENCES organisation(id)
    ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

    await q.query(`CREATE TABLE supplier_price (
      id INT AUTO_INCREMENT PRIMARY KEY,
      supplier_id INT NOT NULL,
      cylinder_type_id INT NULL,
      gas_code VARCHAR(16) NULL,
      unit VARCHAR(10) NOT NULL,
      price_minor INT NOT NULL,
      CONSTRAINT fk_price_supplier FOREIGN KEY (supplier_id) REFERENCES supplier(id) ON DELETE CASCADE,
      CONSTRAINT fk_price_cyl FOREIGN KEY (cylinder_type_id) REFERENCES cylinder_type(id) ON DELETE CASCADE,
      CONSTRAINT fk_price_gas FOREIGN KEY (gas_code) REFERENCES gas(code)
    ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

    await q.query(`CREATE TABLE audit_log (
      id BIGINT AUTO_INCREMENT PRIMARY KEY,
      organisation_id INT NULL,
      user_id INT NULL,
      user_email VARCHAR(190) NULL,
      action VARCHAR(32) NOT NULL,
      entity VARCHAR(64) NOT NULL,
      entity_id VARCHAR(64) NULL,
      before_json LONGTEXT NULL,
      after_json LONGTEXT NULL,
      request_id VARCHAR(64) NULL,
      at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      KEY ix_audit_org_at (organisation_id, at),
      KEY ix_audit_entity (entity, entity_id)
    ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

    await q.query(`CREATE TABLE mail_message (
      id INT AUTO_INCREMENT PRIMARY KEY,
      received_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      mail_from VARCHAR(500) NOT NULL,
      mail_to VARCHAR(2000) NOT NULL,
      subject VARCHAR(500) NOT NULL,
      text_body LONGTEXT NOT NULL,
      html_body LONGTEXT NULL,
      message_id VARCHAR(300) NULL,
      size_bytes INT NOT NULL,
      KEY ix_mail_received (received_at)
    ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

    await q.query(`CREATE TABLE mail_attachment (
      id INT AUTO_INCREMENT PRIMARY KEY,
      mail_message_id INT NOT NULL,
      filename VARCHAR(300) NOT NULL,
      content_type VARCHAR(120) NOT NULL,
      size_bytes INT NOT NULL,
      content LONGBLOB NOT NULL,
      CONSTRAINT fk_attachment_message FOREIGN KEY (mail_message_id) REFERENCES mail_message(id) ON DELETE CASCADE
    ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

    await q.query(`CREATE TABLE rate_limit_hit (
      k VARCHAR(190) PRIMARY KEY,
      hits INT NOT NULL,
      reset_at DATETIME(3) NOT NULL
    ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

    // Session store table (express-mysql-session's layout), created here so production runs the same schema.
    await q.query(`CREATE TABLE sessions (
      session_id VARCHAR(128) CHARACTER SET utf8mb4 COLLATE utf8mb4_bin NOT NULL PRIMARY KEY,
      expires INT(11) UNSIGNED NOT NULL,
      data MEDIUMTEXT CHARACTER SET utf8mb4 COLLATE utf8mb4_bin
    ) ENGINE=InnoDB`);
  }

  async down(q: QueryRunner): Promise<void> {
    for (const t of [
      'sessions',
      'rate_limit_hit',
      'mail_attachment',
      'mail_message',
      'audit_log',
      'supplier_price',
      'supplier',
      'cylinder_type',
      'gas',
      'user_site',
      'user_role',
      'app_user',
      'site',
      'organisation',
    ]) {
      await q.query(`DROP TABLE IF EXISTS ${t}`);
    }
  }
}
