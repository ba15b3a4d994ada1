import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import { CreatedAtColumn } from './columns';
import { User } from './user.entity';

// A one-time sign-up link. Only the SHA-256 of the token is stored; the token itself travels in the e-mail.
@Entity({ name: 'invitations' })
export class Invitation {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'uuid', name: 'user_id' })
  userId: string;

  @ManyToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'user_id' })
  user: Relation<User>;

  @Index('uq_invitations_token_hash', { unique: true })
  @Column({ type: 'char', length: 64, name: 'token_hash' })
  tokenHash: string;

  @Column({ type: 'datetime', precision: 3, name: 'expires_at' })
  expiresAt: Date;

  @Column({ type: 'datetime', precision: 3, name: 'used_at', nullable: true })
  usedAt: Date | null;

  @Column({ type: 'uuid', name: 'created_by_id' })
  createdById: string;

  @CreatedAtColumn()
  createdAt: Date;
}
