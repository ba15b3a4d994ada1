import { Column, Entity, JoinColumn, OneToOne, PrimaryColumn, type Relation } from 'typeorm';
import type { WaitingMailMode } from '../../../shared/schemas/waiting';
import { User } from './user.entity';

// A person's choice of "waits on me" e-mail and when it last went; no row means the default (a daily summary).
@Entity({ name: 'waiting_mail_settings' })
export class WaitingMailSetting {
  @PrimaryColumn({ type: 'uuid', name: 'user_id' })
  userId: string;

  @OneToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'user_id' })
  user: Relation<User>;

  @Column({ type: 'enum', enum: ['immediate', 'daily', 'none'], default: 'daily' })
  mode: WaitingMailMode;

  @Column({ type: 'datetime', precision: 3, name: 'last_sent_at', nullable: true })
  lastSentAt: Date | null;
}
