import { Column, Entity, PrimaryColumn } from 'typeorm';

/** A ward granted to a ward lead: the wards they see and report for (user_site still grants the site). */
@Entity('user_ward')
export class UserWard {
  @PrimaryColumn({ type: 'int' })
  userId!: number;

  @PrimaryColumn({ type: 'int' })
  wardId!: number;

  @Column({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  grantedAt!: Date;
}
