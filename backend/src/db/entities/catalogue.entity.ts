import { Column, CreateDateColumn, Entity, PrimaryColumn, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';

/** A medical gas of the catalogue (global, seeded by migration). Colours as hex lists per convention. */
@Entity('gas')
export class Gas {
  @PrimaryColumn({ type: 'varchar', length: 16 })
  code!: string;

  @Column({ type: 'varchar', length: 100 })
  name!: string;

  /** 'compressed' | 'liquefied' */
  @Column({ type: 'varchar', length: 16 })
  state!: string;

  @Column({ type: 'varchar', length: 100 })
  iso32Colours!: string;

  @Column({ type: 'varchar', length: 100 })
  cgaColours!: string;

  @Column({ type: 'int', default: 0 })
  sortOrder!: number;
}

/** A cylinder type, named by water capacity and fill pressure (never a supplier's size code). */
@Entity('cylinder_type')
export class CylinderType {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  organisationId!: number;

  @Column({ type: 'varchar', length: 16 })
  gasCode!: string;

  @Column({ type: 'double' })
  waterCapacityL!: number;

  /** Nominal fill pressure, bar gauge at 15 °C (for liquefied gases: the filling ratio decides, this is the vapour pressure shown). */
  @Column({ type: 'double' })
  fillPressureBar!: number;

  /** Tare (empty weight), kg: required for liquefied gases, which are counted by weight. */
  @Column({ type: 'double', nullable: true })
  tareKg!: number | null;

  /** Maximum filling ratio, kg of gas per litre of water capacity (liquefied gases). */
  @Column({ type: 'double', nullable: true })
  maxFillingRatioKgPerL!: number | null;

  /** Gauge pressure a cylinder is changed at, bar(g); null = the default 10 % of the fill pressure. */
  @Column({ type: 'double', nullable: true })
  residualGaugeBar!: number | null;

  @Column({ type: 'varchar', length: 60, default: '' })
  material!: string;

  @Column({ type: 'varchar', length: 300, default: '' })
  valveNotes!: string;

  @Column({ type: 'boolean', default: true })
  active!: boolean;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt!: Date;

  @UpdateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)', onUpdate: 'CURRENT_TIMESTAMP(3)' })
  updatedAt!: Date;
}

@Entity('supplier')
export class Supplier {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  organisationId!: number;

  @Column({ type: 'varchar', length: 190 })
  name!: string;

  @Column({ type: 'varchar', length: 190 })
  orderEmail!: string;

  @Column({ type: 'varchar', length: 40, default: '' })
  phone!: string;

  @Column({ type: 'int' })
  leadTimeHours!: number;

  /** Cylinder rental per cylinder per day, in minor units of `currency`. */
  @Column({ type: 'int', default: 0 })
  rentalMinorPerCylinderDay!: number;

  /** Smallest bulk liquid delivery the supplier makes, kg (0 = none). */
  @Column({ type: 'double', default: 0 })
  minBulkDropKg!: number;

  @Column({ type: 'char', length: 3 })
  currency!: string;

  @Column({ type: 'boolean', default: true })
  active!: boolean;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt!: Date;

  @UpdateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)', onUpdate: 'CURRENT_TIMESTAMP(3)' })
  updatedAt!: Date;
}

/** A line of a supplier's price list: per cylinder of a type, or per kg of a (bulk) gas. Money in minor units. */
@Entity('supplier_price')
export class SupplierPrice {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  supplierId!: number;

  @Column({ type: 'int', nullable: true })
  cylinderTypeId!: number | null;

  @Column({ type: 'varchar', length: 16, nullable: true })
  gasCode!: string | null;

  /** 'cylinder' | 'kg' */
  @Column({ type: 'varchar', length: 10 })
  unit!: string;

  @Column({ type: 'int' })
  priceMinor!: number;
}
