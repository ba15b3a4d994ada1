import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import { CreatedAtColumn } from './columns';
import { User } from './user.entity';

// A "forgot password" link. Only the SHA-256 of the token is stored; the token itself travels in the e-mail.
// It works once (used_at) and for PASSWORD_RESET_TTL_MS (server/modules/passwords/passwords.service.ts).
@Entity({ name: 'password_resets' })
export class PasswordReset {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'uuid', name: 'user_id' })
  userId: string;

  @ManyToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'user_id' })
  user: Relation<User>;

  @Index('uq_password_resets_token_hash', { unique: true })
  @Column({ type: 'char', length: 64, name: 'token_hash' })
  tokenHash: string;

  @Column({ type: 'datetime', precision: 3, name: 'expires_at' })
  expiresAt: Date;

  @Column({ type: 'datetime', precision: 3, name: 'used_at', nullable: true })
  usedAt: Date | null;

  @CreatedAtColumn()
  createdAt: Date;
}
