import { Column, Entity, PrimaryGeneratedColumn } from 'typeorm';

/** A message received by the local mail service (development and tests). */
@Entity('mail_message')
export class MailMessage {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  receivedAt!: Date;

  @Column({ type: 'varchar', length: 500 })
  mailFrom!: string;

  @Column({ type: 'varchar', length: 2000 })
  mailTo!: string;

  @Column({ type: 'varchar', length: 500 })
  subject!: string;

  @Column({ type: 'longtext' })
  textBody!: string;

  @Column({ type: 'longtext', nullable: true })
  htmlBody!: string | null;

  @Column({ type: 'varchar', length: 300, nullable: true })
  messageId!: string | null;

  @Column({ type: 'int' })
  sizeBytes!: number;
}

@Entity('mail_attachment')
export class MailAttachment {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  mailMessageId!: number;

  @Column({ type: 'varchar', length: 300 })
  filename!: string;

  @Column({ type: 'varchar', length: 120 })
  contentType!: string;

  @Column({ type: 'int' })
  sizeBytes!: number;

  @Column({ type: 'longblob' })
  content!: Buffer;
}
