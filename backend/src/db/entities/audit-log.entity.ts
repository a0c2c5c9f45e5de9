import { Column, Entity, PrimaryGeneratedColumn } from 'typeorm';

/** Who changed what and when, with the record before and after (JSON). One row per write. */
@Entity('audit_log')
export class AuditLog {
  @PrimaryGeneratedColumn({ type: 'bigint' })
  id!: string;

  @Column({ type: 'int', nullable: true })
  organisationId!: number | null;

  @Column({ type: 'int', nullable: true })
  userId!: number | null;

  @Column({ type: 'varchar', length: 190, nullable: true })
  userEmail!: string | null;

  @Column({ type: 'varchar', length: 32 })
  action!: string;

  @Column({ type: 'varchar', length: 64 })
  entity!: string;

  @Column({ type: 'varchar', length: 64, nullable: true })
  entityId!: string | null;

  @Column({ type: 'longtext', nullable: true })
  beforeJson!: string | null;

  @Column({ type: 'longtext', nullable: true })
  afterJson!: string | null;

  @Column({ type: 'varchar', length: 64, nullable: true })
  requestId!: string | null;

  @Column({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  at!: Date;
}
