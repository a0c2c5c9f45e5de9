import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';

/** A ward (or department) of a site: its gas demand is built from therapy lines. */
@Entity('ward')
export class Ward {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  siteId!: number;

  @Column({ type: 'varchar', length: 120 })
  name!: string;

  /** ward | critical_care | theatre | emergency | recovery | maternity | day_unit | other */
  @Column({ type: 'varchar', length: 32 })
  department!: string;

  @Column({ type: 'int', default: 0 })
  beds!: number;

  /** Pipeline leakage allowance added to the ward's modelled demand, %. */
  @Column({ type: 'double', default: 0 })
  leakagePercent!: number;

  @Column({ type: 'boolean', default: true })
  active!: boolean;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt!: Date;

  @UpdateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)', onUpdate: 'CURRENT_TIMESTAMP(3)' })
  updatedAt!: Date;
}

/**
 * A supply source of a site: bulk liquid tank (VIE), cylinder manifold, cylinder store (one cylinder
 * type each) or emergency reserve. Type-specific columns are null where they do not apply.
 */
@Entity('supply_source')
export class SupplySource {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  siteId!: number;

  @Column({ type: 'varchar', length: 120 })
  name!: string;

  /** bulk_liquid | manifold | cylinder_store | emergency_reserve */
  @Column({ type: 'varchar', length: 24 })
  type!: string;

  @Column({ type: 'varchar', length: 16 })
  gasCode!: string;

  @Column({ type: 'int', nullable: true })
  supplierId!: number | null;

  // bulk liquid
  @Column({ type: 'double', nullable: true })
  capacityKg!: number | null;

  @Column({ type: 'double', nullable: true })
  evaporationPercentPerDay!: number | null;

  @Column({ type: 'double', nullable: true })
  vaporiserM3H!: number | null;

  /** Continuous-duty (and cold-weather) derating of the vaporiser, 0–1. */
  @Column({ type: 'double', nullable: true })
  vaporiserDerating!: number | null;

  @Column({ type: 'double', nullable: true })
  minLevelAlarmPercent!: number | null;

  @Column({ type: 'double', nullable: true })
  reservePercent!: number | null;

  /** Tank calibration table: JSON [{reading, kg}], reading in the unit of `calibrationUnit`. */
  @Column({ type: 'longtext', nullable: true })
  calibrationJson!: string | null;

  @Column({ type: 'varchar', length: 24, nullable: true })
  calibrationUnit!: string | null;

  // cylinders (manifold, store, reserve)
  @Column({ type: 'int', nullable: true })
  cylinderTypeId!: number | null;

  @Column({ type: 'int', nullable: true })
  cylindersPerBank!: number | null;

  @Column({ type: 'double', nullable: true })
  regulatorLMin!: number | null;

  @Column({ type: 'double', nullable: true })
  changeoverGaugeBar!: number | null;

  /** Bulk liquid: working pressure of the tank, bar(g); null = the default 7 bar g (liquid-oxygen.ts). */
  @Column({ type: 'double', nullable: true })
  operatingPressureBar!: number | null;

  /** Store or plant-room temperature, °C (gauge readings are corrected with it). */
  @Column({ type: 'double', nullable: true })
  temperatureC!: number | null;

  /** Emergency reserve: JSON list of source ids it backs up. */
  @Column({ type: 'varchar', length: 500, nullable: true })
  backsUpJson!: string | null;

  // reorder rule
  /** none | days | percent | amount (kg for bulk, cylinders otherwise) */
  @Column({ type: 'varchar', length: 10, default: 'none' })
  reorderMode!: string;

  @Column({ type: 'double', nullable: true })
  reorderLevel!: number | null;

  /** Order-up-to: kg for bulk, cylinders otherwise. */
  @Column({ type: 'double', nullable: true })
  orderUpTo!: number | null;

  /** Overrides the supplier's lead time when set. */
  @Column({ type: 'int', nullable: true })
  leadTimeHours!: number | null;

  /** model | measured | scaled */
  @Column({ type: 'varchar', length: 10, default: 'model' })
  forecastBasis!: string;

  /** Accepted correction factor for the modelled demand (1 = none). */
  @Column({ type: 'double', default: 1 })
  modelCorrectionFactor!: number;

  @Column({ type: 'varchar', length: 1000, default: '' })
  notes!: string;

  @Column({ type: 'boolean', default: true })
  active!: boolean;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt!: Date;

  @UpdateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)', onUpdate: 'CURRENT_TIMESTAMP(3)' })
  updatedAt!: Date;
}

/** A reading of a source's contents, with its time, who took it and how. */
@Entity('source_reading')
export class SourceReading {
  @PrimaryGeneratedColumn({ type: 'bigint' })
  id!: string;

  @Column({ type: 'int' })
  sourceId!: number;

  @Column({ type: 'datetime', precision: 3 })
  takenAt!: Date;

  /** level_percent | kg | litres_liquid | calibration | bank_gauges | store_count */
  @Column({ type: 'varchar', length: 20 })
  kind!: string;

  @Column({ type: 'double', nullable: true })
  value!: number | null;

  /** Manifold: {duty_bar, standby_bar, spare_full}; store: {full, in_use_gauge_bar: [], empty}. */
  @Column({ type: 'longtext', nullable: true })
  detailJson!: string | null;

  /** Contents this reading means, in the source's unit (kg bulk; L of free gas otherwise), computed on write. */
  @Column({ type: 'double' })
  contents!: number;

  /** manual | telemetry | delivery_note | import */
  @Column({ type: 'varchar', length: 16 })
  method!: string;

  @Column({ type: 'int', nullable: true })
  takenByUserId!: number | null;

  @Column({ type: 'varchar', length: 500, default: '' })
  note!: string;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt!: Date;
}

/** Which source feeds which ward for a gas: primary, secondary or reserve. */
@Entity('ward_feed')
export class WardFeed {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  wardId!: number;

  @Column({ type: 'int' })
  sourceId!: number;

  @Column({ type: 'varchar', length: 16 })
  gasCode!: string;

  /** primary | secondary | reserve */
  @Column({ type: 'varchar', length: 10 })
  role!: string;
}

/** One line of a ward's demand model: patients × device flow, by local hour and weekday. */
@Entity('therapy_line')
export class TherapyLineRow {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  wardId!: number;

  @Column({ type: 'varchar', length: 16 })
  gasCode!: string;

  /** A device code (nasal_cannula, …), 'theatre' or 'custom' (fixed flow). */
  @Column({ type: 'varchar', length: 24 })
  device!: string;

  @Column({ type: 'double' })
  patients!: number;

  /** Per-patient flow, L/min; null = the organisation's device default. */
  @Column({ type: 'double', nullable: true })
  flowLMin!: number | null;

  @Column({ type: 'varchar', length: 120, nullable: true })
  hoursJson!: string | null;

  @Column({ type: 'varchar', length: 40, nullable: true })
  weekdaysJson!: string | null;

  @Column({ type: 'varchar', length: 120, default: '' })
  label!: string;
}

/** An organisation's own flow for a device (overrides the documented default). */
@Entity('device_flow')
export class DeviceFlow {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  organisationId!: number;

  @Column({ type: 'varchar', length: 24 })
  device!: string;

  @Column({ type: 'double' })
  flowLMin!: number;
}

/** A named what-if over the baseline of a site, from a local date (never overwrites the baseline). */
@Entity('scenario')
export class Scenario {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  siteId!: number;

  @Column({ type: 'varchar', length: 120 })
  name!: string;

  @Column({ type: 'double', default: 1 })
  multiplier!: number;

  /** Extra patients at `extraFlowLMin` each (e.g. high-flow beds), on `wardId` if set. */
  @Column({ type: 'double', default: 0 })
  extraPatients!: number;

  @Column({ type: 'double', default: 0 })
  extraFlowLMin!: number;

  @Column({ type: 'int', nullable: true })
  wardId!: number | null;

  /** open | close: a ward opened (its lines start) or closed (its lines stop) from the date. */
  @Column({ type: 'varchar', length: 8, nullable: true })
  wardChange!: string | null;

  @Column({ type: 'varchar', length: 16 })
  fromLocal!: string;

  @Column({ type: 'varchar', length: 16, nullable: true })
  untilLocal!: string | null;

  @Column({ type: 'varchar', length: 500, default: '' })
  note!: string;
}

/** A delivery expected at a source (by hand, or from a purchase order). */
@Entity('scheduled_delivery')
export class ScheduledDelivery {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  sourceId!: number;

  @Column({ type: 'datetime', precision: 3 })
  dueAt!: Date;

  @Column({ type: 'double', nullable: true })
  kg!: number | null;

  @Column({ type: 'int', nullable: true })
  cylinders!: number | null;

  /** scheduled | delivered | cancelled */
  @Column({ type: 'varchar', length: 12, default: 'scheduled' })
  status!: string;

  @Column({ type: 'varchar', length: 120, default: '' })
  reference!: string;
}
