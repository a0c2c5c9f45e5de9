import { Column, CreateDateColumn, Entity, PrimaryColumn, PrimaryGeneratedColumn } from 'typeorm';

@Entity('app_user')
export class User {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  organisationId!: number;

  @Column({ type: 'varchar', length: 190, unique: true })
  email!: string;

  @Column({ type: 'varchar', length: 190 })
  name!: string;

  @Column({ type: 'varchar', length: 100 })
  passwordHash!: string;

  @Column({ type: 'boolean', default: true })
  active!: boolean;

  @Column({ type: 'int', default: 0 })
  failedLogins!: number;

  @Column({ type: 'datetime', precision: 3, nullable: true })
  lockedUntil!: Date | null;

  /** Temporary locks since the last successful sign-in (each lasts twice the one before, capped). */
  @Column({ type: 'int', default: 0 })
  lockCount!: number;

  @Column({ type: 'datetime', precision: 3, nullable: true })
  passwordChangedAt!: Date | null;

  /** Stored in each signed-in session; a new password bumps it, which ends the user's other sessions. */
  @Column({ type: 'int', default: 0 })
  sessionGeneration!: number;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt!: Date;
}

@Entity('user_role')
export class UserRole {
  @PrimaryColumn({ type: 'int' })
  userId!: number;

  @PrimaryColumn({ type: 'varchar', length: 32 })
  role!: string;
}

@Entity('user_site')
export class UserSite {
  @PrimaryColumn({ type: 'int' })
  userId!: number;

  @PrimaryColumn({ type: 'int' })
  siteId!: number;
}
