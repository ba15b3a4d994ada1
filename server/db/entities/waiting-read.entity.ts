import { Column, Entity, JoinColumn, ManyToOne, PrimaryColumn, type Relation } from 'typeorm';
import { User } from './user.entity';

// Which "waits on me" items a person has seen: one row per person and item key (shared/schemas/waiting.ts).
@Entity({ name: 'waiting_reads' })
export class WaitingRead {
  @PrimaryColumn({ type: 'uuid', name: 'user_id' })
  userId: string;

  @ManyToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'user_id' })
  user: Relation<User>;

  @PrimaryColumn({ type: 'varchar', length: 120, name: 'item_key' })
  itemKey: string;

  @Column({ type: 'datetime', precision: 3, name: 'read_at' })
  readAt: Date;
}
