import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Orders: reorder requests with their timeline and approvals, purchase orders numbered from a gapless
 * per-organisation sequence, deliveries against them, the mail outbox, idempotency keys, approval limits
 * and site alert subscriptions. Money is integer minor units of the site's currency.
 */
export class Orders1764680000000 implements MigrationInterface {
  name = 'Orders1764680000000';

  async up(q: QueryRunner): Promise<void> {
    const T = 'ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci';
    // open_source_id is the source while the request is open and NULL once it is closed, so the unique key
    // allows any number of closed requests but only one open request per source (auto-raise stays idempotent
    // however often the forecast runs, across processes).
    await q.query(`CREATE TABLE reorder_request (
      id INT AUTO_INCREMENT PRIMARY KEY,
      organisation_id INT NOT NULL,
      site_id INT NOT NULL,
      source_id INT NOT NULL,
      supplier_id INT NULL,
      origin VARCHAR(8) NOT NULL,
      status VARCHAR(16) NOT NULL,
      unit VARCHAR(10) NOT NULL,
      gas_code VARCHAR(16) NOT NULL,
      cylinder_type_id INT NULL,
      suggested_quantity DOUBLE NOT NULL,
      quantity DOUBLE NOT NULL,
      quantity_reason VARCHAR(500) NOT NULL DEFAULT '',
      unit_price_minor INT NULL,
      total_minor INT NULL,
      currency CHAR(3) NOT NULL,
      needed_by DATETIME(3) NULL,
      trigger_json LONGTEXT NULL,
      problem VARCHAR(500) NOT NULL DEFAULT '',
      note VARCHAR(1000) NOT NULL DEFAULT '',
      requested_by_user_id INT NULL,
      version INT NOT NULL DEFAULT 1,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      updated_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3),
      open_source_id INT AS (CASE WHEN status IN ('draft','submitted','approved','ordered') THEN source_id ELSE NULL END) PERSISTENT,
      UNIQUE KEY uq_request_open_source (open_source_id),
      KEY ix_request_org_status (organisation_id, status),
      KEY ix_request_site (site_id),
      CONSTRAINT fk_request_org FOREIGN KEY (organisation_id) REFERENCES organisation(id),
      CONSTRAINT fk_request_site FOREIGN KEY (site_id) REFERENCES site(id),
      CONSTRAINT fk_request_source FOREIGN KEY (source_id) REFERENCES supply_source(id),
      CONSTRAINT fk_request_supplier FOREIGN KEY (supplier_id) REFERENCES supplier(id),
      CONSTRAINT fk_request_user FOREIGN KEY (requested_by_user_id) REFERENCES app_user(id)
    ) ${T}`);
    await q.query(`CREATE TABLE reorder_request_event (
      id BIGINT AUTO_INCREMENT PRIMARY KEY,
      request_id INT NOT NULL,
      at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      user_id INT NULL,
      user_name VARCHAR(190) NOT NULL DEFAULT '',
      action VARCHAR(24) NOT NULL,
      from_status VARCHAR(16) NULL,
      to_status VARCHAR(16) NULL,
      comment VARCHAR(1000) NOT NULL DEFAULT '',
      detail_json LONGTEXT NULL,
      KEY ix_event_request (request_id, at),
      CONSTRAINT fk_event_request FOREIGN KEY (request_id) REFERENCES reorder_request(id) ON DELETE CASCADE
    ) ${T}`);
    await q.query(`CREATE TABLE request_approval (
      id INT AUTO_INCREMENT PRIMARY KEY,
      request_id INT NOT NULL,
      user_id INT NOT NULL,
      limit_minor INT NOT NULL,
      total_minor INT NOT NULL,
      comment VARCHAR(1000) NOT NULL DEFAULT '',
      at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      UNIQUE KEY uq_approval (request_id, user_id),
      CONSTRAINT fk_approval_request FOREIGN KEY (request_id) REFERENCES reorder_request(id) ON DELETE CASCADE,
      CONSTRAINT fk_approval_user FOREIGN KEY (user_id) REFERENCES app_user(id)
    ) ${T}`);
    await q.query(`CREATE TABLE po_sequence (
      organisation_id INT PRIMARY KEY,
      last_value INT NOT NULL DEFAULT 0,
      CONSTRAINT fk_po_sequence_org FOREIGN KEY (organisation_id) REFERENCES organisation(id)
    ) ${T}`);
    await q.query(`CREATE TABLE purchase_order (
      id INT AUTO_INCREMENT PRIMARY KEY,
      organisation_id INT NOT NULL,
      request_id INT NOT NULL,
      seq INT NOT NULL,
      po_number VARCHAR(32) NOT NULL,
      site_id INT NOT NULL,
      source_id INT NOT NULL,
      supplier_id INT NOT NULL,
      status VARCHAR(16) NOT NULL,
      description VARCHAR(300) NOT NULL,
      unit VARCHAR(10) NOT NULL,
      quantity DOUBLE NOT NULL,
      unit_price_minor INT NOT NULL,
      total_minor INT NOT NULL,
      currency CHAR(3) NOT NULL,
      window_start DATETIME(3) NOT NULL,
      window_end DATETIME(3) NOT NULL,
      delivery_address VARCHAR(700) NOT NULL DEFAULT '',
      contact_name VARCHAR(190) NOT NULL DEFAULT '',
      contact_email VARCHAR(190) NOT NULL DEFAULT '',
      approved_by_json VARCHAR(1000) NOT NULL DEFAULT '[]',
      scheduled_delivery_id INT NULL,
      delivered_quantity DOUBLE NULL,
      sent_at DATETIME(3) NULL,
      pdf LONGBLOB NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      updated_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3),
      UNIQUE KEY uq_po_number (organisation_id, po_number),
      UNIQUE KEY uq_po_seq (organisation_id, seq),
      UNIQUE KEY uq_po_request (request_id),
      KEY ix_po_site (site_id, created_at),
      CONSTRAINT fk_po_org FOREIGN KEY (organisation_id) REFERENCES organisation(id),
      CONSTRAINT fk_po_request FOREIGN KEY (request_id) REFERENCES reorder_request(id),
      CONSTRAINT fk_po_site FOREIGN KEY (site_id) REFERENCES site(id),
      CONSTRAINT fk_po_supplier FOREIGN KEY (supplier_id) REFERENCES supplier(id)
    ) ${T}`);
    await q.query(`CREATE TABLE delivery_record (
      id INT AUTO_INCREMENT PRIMARY KEY,
      purchase_order_id INT NOT NULL,
      site_id INT NOT NULL,
      source_id INT NOT NULL,
      delivery_note VARCHAR(60) NOT NULL,
      delivered_at DATETIME(3) NOT NULL,
      quantity DOUBLE NOT NULL,
      unit VARCHAR(10) NOT NULL,
      empties_collected INT NOT NULL DEFAULT 0,
      reading_id BIGINT NULL,
      note VARCHAR(500) NOT NULL DEFAULT '',
      recorded_by_user_id INT NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      UNIQUE KEY uq_delivery_order (purchase_order_id),
      KEY ix_delivery_site (site_id, delivered_at),
      CONSTRAINT fk_delivery_po FOREIGN KEY (purchase_order_id) REFERENCES purchase_order(id)
    ) ${T}`);
    await q.query(`CREATE TABLE mail_outbox (
      id BIGINT AUTO_INCREMENT PRIMARY KEY,
      organisation_id INT NOT NULL,
      kind VARCHAR(20) NOT NULL,
      to_address VARCHAR(500) NOT NULL,
      cc_address VARCHAR(1000) NOT NULL DEFAULT '',
      subject VARCHAR(300) NOT NULL,
      text_body LONGTEXT NOT NULL,
      purchase_order_id INT NULL,
      request_id INT NULL,
      dedupe_key VARCHAR(190) NULL,
      status VARCHAR(10) NOT NULL DEFAULT 'pending',
      attempts INT NOT NULL DEFAULT 0,
      next_attempt_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      last_error VARCHAR(1000) NOT NULL DEFAULT '',
      message_id VARCHAR(300) NULL,
      sent_at DATETIME(3) NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      UNIQUE KEY uq_outbox_dedupe (dedupe_key),
      KEY ix_outbox_due (status, next_attempt_at),
      KEY ix_outbox_org (organisation_id, created_at)
    ) ${T}`);
    await q.query(`CREATE TABLE idempotency_key (
      user_id INT NOT NULL,
      idem_key VARCHAR(100) NOT NULL,
      scope VARCHAR(120) NOT NULL,
      response_json LONGTEXT NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      PRIMARY KEY (user_id, idem_key),
      KEY ix_idem_created (created_at)
    ) ${T}`);
    await q.query(`CREATE TABLE user_approval_limit (
      user_id INT PRIMARY KEY,
      organisation_id INT NOT NULL,
      limit_minor INT NOT NULL,
      currency CHAR(3) NOT NULL,
      updated_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3),
      CONSTRAINT fk_limit_user FOREIGN KEY (user_id) REFERENCES app_user(id) ON DELETE CASCADE
    ) ${T}`);
    await q.query(`CREATE TABLE site_subscription (
      user_id INT NOT NULL,
      site_id INT NOT NULL,
      mode VARCHAR(10) NOT NULL,
      policy_days DOUBLE NOT NULL,
      last_digest_at DATETIME(3) NULL,
      PRIMARY KEY (user_id, site_id),
      CONSTRAINT fk_sub_user FOREIGN KEY (user_id) REFERENCES app_user(id) ON DELETE CASCADE,
      CONSTRAINT fk_sub_site FOREIGN KEY (site_id) REFERENCES site(id) ON DELETE CASCADE
    ) ${T}`);
    await q.query(`CREATE TABLE alert_state (
      user_id INT NOT NULL,
      source_id INT NOT NULL,
      below TINYINT(1) NOT NULL DEFAULT 0,
      risk_code VARCHAR(32) NULL,
      updated_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3),
      PRIMARY KEY (user_id, source_id),
      CONSTRAINT fk_alert_state_source FOREIGN KEY (source_id) REFERENCES supply_source(id) ON DELETE CASCADE
    ) ${T}`);
    await q.query(`CREATE TABLE alert_event (
      id BIGINT AUTO_INCREMENT PRIMARY KEY,
      user_id INT NOT NULL,
      site_id INT NOT NULL,
      source_id INT NOT NULL,
      at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      text VARCHAR(1000) NOT NULL,
      digested_at DATETIME(3) NULL,
      KEY ix_alert_event_user (user_id, digested_at)
    ) ${T}`);
  }

  async down(q: QueryRunner): Promise<void> {
    for (const t of [
      'alert_event',
      'alert_state',
      'site_subscription',
      'user_approval_limit',
      'idempotency_key',
      'mail_outbox',
      'delivery_record',
      'purchase_order',
      'po_sequence',
      'request_approval',
      'reorder_request_event',
      'reorder_request',
    ]) {
      await q.query(`DROP TABLE IF EXISTS ${t}`);
    }
  }
}
