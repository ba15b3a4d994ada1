import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';
import { CreatedAtColumn } from './columns';

export type OutboxAttachment = { filename: string; contentType: string; storageKey: string };

// One row per e-mail, written in the same transaction as the change it tells people about.
@Entity({ name: 'outbox_messages' })
@Index('ix_outbox_due', ['status', 'nextAttemptAt'])
export class OutboxMessage {
  @PrimaryGeneratedColumn({ type: 'bigint', unsigned: true })
  id: string;

  @CreatedAtColumn()
  createdAt: Date;

  @Column({ type: 'varchar', length: 64 })
  template: string;

  @Column({ type: 'text', name: 'to_address' })
  to: string;

  @Column({ type: 'varchar', length: 255 })
  subject: string;

  @Column({ type: 'mediumtext', name: 'text_body' })
  text: string;

  @Column({ type: 'mediumtext', name: 'html_body' })
  html: string;

  @Column({ type: 'json', nullable: true })
  attachments: OutboxAttachment[] | null;

  @Column({ type: 'enum', enum: ['pending', 'sent', 'failed'], default: 'pending' })
  status: 'pending' | 'sent' | 'failed';

  @Column({ type: 'int', default: 0 })
  attempts: number;

  @Column({ type: 'datetime', precision: 3, name: 'next_attempt_at' })
  nextAttemptAt: Date;

  @Column({ type: 'text', name: 'last_error', nullable: true })
  lastError: string | null;

  @Column({ type: 'datetime', precision: 3, name: 'sent_at', nullable: true })
  sentAt: Date | null;

  @Column({ type: 'varchar', length: 255, name: 'message_id', nullable: true })
  messageId: string | null;
}
