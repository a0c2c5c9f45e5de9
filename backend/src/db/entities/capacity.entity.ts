import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';

/**
 * An organisation's own diversity rule set: a copy of a shipped set (or of another of its sets),
 * edited. The rules are the capacity engine's JSON shape, validated on every write.
 */
@Entity('rule_set')
export class RuleSet {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  organisationId!: number;

  @Column({ type: 'varchar', length: 120 })
  name!: string;

  /** The shipped set ("default", "gb50751") or "org:<id>" it was copied from; null if written from scratch. */
  @Column({ type: 'varchar', length: 32, nullable: true })
  basedOn!: string | null;

  /** The rule set, engine shape (DiversityRuleSet). */
  @Column({ type: 'longtext' })
  json!: string;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt!: Date;

  @UpdateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)', onUpdate: 'CURRENT_TIMESTAMP(3)' })
  updatedAt!: Date;
}

/**
 * A pipeline zone of a site: the terminal units of one gas (or vacuum) in one department type,
 * downstream of one zone valve, and the supply source that feeds it.
 */
@Entity('pipeline_zone')
export class PipelineZone {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  siteId!: number;

  @Column({ type: 'varchar', length: 120 })
  name!: string;

  /** A catalogue gas code or VAC (medical vacuum). */
  @Column({ type: 'varchar', length: 16 })
  gasCode!: string;

  /** A department of the capacity engine (ward, critical_care, theatre, …). */
  @Column({ type: 'varchar', length: 32 })
  department!: string;

  @Column({ type: 'int' })
  terminalUnits!: number;

  @Column({ type: 'int', nullable: true })
  sourceId!: number | null;

  /** The organisation's rule set; null = the shipped set in `builtinRuleSet`. */
  @Column({ type: 'int', nullable: true })
  ruleSetId!: number | null;

  @Column({ type: 'varchar', length: 32, default: 'default' })
  builtinRuleSet!: string;

  /** rule_set | binomial */
  @Column({ type: 'varchar', length: 16, default: 'rule_set' })
  diversityMethod!: string;

  /** Binomial method: flow of one terminal unit, L/min free gas. */
  @Column({ type: 'double', nullable: true })
  unitFlowLMin!: number | null;

  /** Binomial method: chance that one unit is in use at a given moment, 0–1. */
  @Column({ type: 'double', nullable: true })
  useProbability!: number | null;

  /** Binomial method: wanted probability that no more units run at once, 0–1. */
  @Column({ type: 'double', nullable: true })
  confidence!: number | null;

  @Column({ type: 'varchar', length: 1000, default: '' })
  notes!: string;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt!: Date;

  @UpdateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)', onUpdate: 'CURRENT_TIMESTAMP(3)' })
  updatedAt!: Date;
}

/** A run of copper pipe in a zone, checked for pressure drop at the zone's design flow. */
@Entity('pipe_run')
export class PipeRun {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  zoneId!: number;

  @Column({ type: 'varchar', length: 120 })
  name!: string;

  @Column({ type: 'double' })
  lengthM!: number;

  /** EN 13348 tube, outside diameter × wall, e.g. "22x0.9". */
  @Column({ type: 'varchar', length: 16 })
  tube!: string;

  @Column({ type: 'double', default: 20 })
  fittingsAllowancePercent!: number;

  /** Line pressure at the start of the run, kPa gauge. */
  @Column({ type: 'double', name: 'line_pressure_kpa', default: 400 })
  linePressureKPa!: number;

  /** Allowed drop over the run, kPa; null = 5 % of the line pressure. */
  @Column({ type: 'double', name: 'allowed_drop_kpa', nullable: true })
  allowedDropKPa!: number | null;

  /** Gas temperature in the pipe, °C; null = 20 °C. */
  @Column({ type: 'double', nullable: true })
  gasTemperatureC!: number | null;

  @Column({ type: 'int', default: 0 })
  sortOrder!: number;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt!: Date;

  @UpdateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)', onUpdate: 'CURRENT_TIMESTAMP(3)' })
  updatedAt!: Date;
}

/** A biomedical engineer's sign-off of a site's capacity check, with the report as signed. */
@Entity('capacity_signoff')
export class CapacitySignoff {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  siteId!: number;

  @Column({ type: 'varchar', length: 190 })
  engineerName!: string;

  @Column({ type: 'int', nullable: true })
  userId!: number | null;

  @Column({ type: 'datetime', precision: 3 })
  signedAt!: Date;

  /** SHA-256 of the inputs the report was computed from: tells whether a later report is the same. */
  @Column({ type: 'char', length: 64 })
  inputsHash!: string;

  @Column({ type: 'varchar', length: 1000, default: '' })
  note!: string;

  /** The capacity report as signed (inputs, method, results). */
  @Column({ type: 'longtext' })
  summaryJson!: string;
}
