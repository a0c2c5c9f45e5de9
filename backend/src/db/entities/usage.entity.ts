import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';

/** A ward's daily usage report: filed by its ward lead for one local date (one per ward and date). */
@Entity('usage_report')
export class UsageReport {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  siteId!: number;

  @Column({ type: 'int' })
  wardId!: number;

  /** The ward's local calendar date, yyyy-MM-dd. */
  @Column({ type: 'char', length: 10 })
  reportDate!: string;

  @Column({ type: 'varchar', length: 1000, default: '' })
  note!: string;

  @Column({ type: 'int', nullable: true })
  submittedByUserId!: number | null;

  @Column({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  submittedAt!: Date;

  @Column({ type: 'int', nullable: true })
  updatedByUserId!: number | null;

  @UpdateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)', onUpdate: 'CURRENT_TIMESTAMP(3)' })
  updatedAt!: Date;
}

/** One line of a report: patients on a device (line kind `device`) or cylinders of a type (`cylinder`). */
@Entity('usage_report_line')
export class UsageReportLine {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  reportId!: number;

  /** device | cylinder */
  @Column({ type: 'varchar', length: 10 })
  lineKind!: string;

  @Column({ type: 'varchar', length: 24, nullable: true })
  device!: string | null;

  @Column({ type: 'int', nullable: true })
  patientsNow!: number | null;

  @Column({ type: 'int', nullable: true })
  patientsShift!: number | null;

  @Column({ type: 'int', nullable: true })
  cylinderTypeId!: number | null;

  @Column({ type: 'int', nullable: true })
  cylindersUsed!: number | null;

  @Column({ type: 'int', nullable: true })
  cylindersReturned!: number | null;
}

/** A reminder sent for a ward's missing report on a local date (at most one per ward and date). */
@Entity('usage_reminder')
export class UsageReminder {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  siteId!: number;

  @Column({ type: 'int' })
  wardId!: number;

  @Column({ type: 'char', length: 10 })
  localDate!: string;

  @Column({ type: 'varchar', length: 2000, default: '' })
  recipients!: string;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  sentAt!: Date;
}

/** An uploaded file, known by the SHA-256 of its bytes (a re-upload of the same content is recognised). */
@Entity('import_file')
export class ImportFile {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  organisationId!: number;

  @Column({ type: 'int' })
  siteId!: number;

  @Column({ type: 'char', length: 64 })
  sha256!: string;

  @Column({ type: 'varchar', length: 255 })
  originalName!: string;

  /** BIGINT: comes back as a string from the driver; read with Number(). */
  @Column({ type: 'bigint' })
  sizeBytes!: string;

  @Column({ type: 'int', default: 0 })
  lineCount!: number;

  /** Where the bytes wait between upload and import; null once the file is deleted. */
  @Column({ type: 'varchar', length: 500, nullable: true })
  storagePath!: string | null;

  @Column({ type: 'int', nullable: true })
  uploadedByUserId!: number | null;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt!: Date;
}

/**
 * An upload's life: mapping → validating → ready | invalid → queued → running → done | failed | cancelled.
 * Its state lives here (not in memory), so the progress bar survives a page reload and a restart.
 */
@Entity('import_job')
export class ImportJob {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  organisationId!: number;

  @Column({ type: 'int' })
  siteId!: number;

  @Column({ type: 'int' })
  fileId!: number;

  @Column({ type: 'varchar', length: 24 })
  kind!: string;

  @Column({ type: 'varchar', length: 12 })
  status!: string;

  /** Target, unit, date order, mapping and the detected separator (JSON). */
  @Column({ type: 'longtext' })
  optionsJson!: string;

  @Column({ type: 'longtext', nullable: true })
  headerJson!: string | null;

  /** The first lines as read (before mapping), for the mapping screen. */
  @Column({ type: 'longtext', nullable: true })
  sampleJson!: string | null;

  /** The first rows as they will be stored, with the range of times. */
  @Column({ type: 'longtext', nullable: true })
  previewJson!: string | null;

  /** The first row errors: [{row, column, value, reason}]. */
  @Column({ type: 'longtext', nullable: true })
  errorsJson!: string | null;

  @Column({ type: 'int', default: 0 })
  errorCount!: number;

  @Column({ type: 'int', nullable: true })
  totalRows!: number | null;

  @Column({ type: 'int', default: 0 })
  processedRows!: number;

  @Column({ type: 'int', default: 0 })
  insertedRows!: number;

  @Column({ type: 'varchar', length: 1000, default: '' })
  message!: string;

  @Column({ type: 'boolean', default: false })
  cancelRequested!: boolean;

  @Column({ type: 'boolean', default: false })
  confirmDuplicate!: boolean;

  @Column({ type: 'int', default: 0 })
  attempts!: number;

  @Column({ type: 'varchar', length: 64, nullable: true })
  workerId!: string | null;

  @Column({ type: 'datetime', precision: 3, nullable: true })
  heartbeatAt!: Date | null;

  @Column({ type: 'int', nullable: true })
  createdByUserId!: number | null;

  @Column({ type: 'int', nullable: true })
  committedByUserId!: number | null;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt!: Date;

  @Column({ type: 'datetime', precision: 3, nullable: true })
  startedAt!: Date | null;

  @Column({ type: 'datetime', precision: 3, nullable: true })
  finishedAt!: Date | null;

  @UpdateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)', onUpdate: 'CURRENT_TIMESTAMP(3)' })
  updatedAt!: Date;
}

/** A flow meter's running total (free gas at the site's reference conditions, L) on a ward or a source. */
@Entity('flow_meter_reading')
export class FlowMeterReading {
  @PrimaryGeneratedColumn({ type: 'bigint' })
  id!: string;

  @Column({ type: 'int' })
  siteId!: number;

  @Column({ type: 'int', nullable: true })
  wardId!: number | null;

  @Column({ type: 'int', nullable: true })
  sourceId!: number | null;

  @Column({ type: 'datetime', precision: 3 })
  takenAt!: Date;

  @Column({ type: 'double' })
  totalL!: number;

  @Column({ type: 'varchar', length: 500, default: '' })
  note!: string;

  @Column({ type: 'int', nullable: true })
  importJobId!: number | null;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt!: Date;
}

/** Usage of a ward for one gas on one local day from an older record (free gas at the reference, L). */
@Entity('usage_history')
export class UsageHistory {
  @PrimaryGeneratedColumn({ type: 'bigint' })
  id!: string;

  @Column({ type: 'int' })
  siteId!: number;

  @Column({ type: 'int' })
  wardId!: number;

  @Column({ type: 'varchar', length: 16 })
  gasCode!: string;

  @Column({ type: 'char', length: 10 })
  usageDate!: string;

  @Column({ type: 'double' })
  volumeL!: number;

  @Column({ type: 'varchar', length: 500, default: '' })
  note!: string;

  @Column({ type: 'int', nullable: true })
  importJobId!: number | null;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt!: Date;
}
