import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';

/** A hospital or clinic. Times are stored in UTC; `timeZone` (IANA) says how to show and bucket them. */
@Entity('site')
export class Site {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  organisationId!: number;

  @Column({ type: 'varchar', length: 190 })
  name!: string;

  @Column({ type: 'varchar', length: 20 })
  kind!: string;

  @Column({ type: 'varchar', length: 500, default: '' })
  address!: string;

  @Column({ type: 'varchar', length: 64 })
  timeZone!: string;

  /** Reference conditions for stated free-gas volumes: '15C' | '21C' | '0C'. */
  @Column({ type: 'varchar', length: 8 })
  referenceCode!: string;

  /** 'metric' (bar, L, °C) or 'us' (psi, ft³, °F). */
  @Column({ type: 'varchar', length: 8 })
  unitSystem!: string;

  @Column({ type: 'double' })
  altitudeM!: number;

  /** Local atmospheric pressure, bar absolute (from altitude unless entered). */
  @Column({ type: 'double' })
  atmosphericBar!: number;

  @Column({ type: 'char', length: 3 })
  currency!: string;

  /** 'ISO32' or 'CGA_C9'. */
  @Column({ type: 'varchar', length: 10 })
  cylinderColours!: string;

  @Column({ type: 'double' })
  storeTemperatureC!: number;

  @Column({ type: 'int', default: 0 })
  beds!: number;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt!: Date;

  @UpdateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)', onUpdate: 'CURRENT_TIMESTAMP(3)' })
  updatedAt!: Date;
}
