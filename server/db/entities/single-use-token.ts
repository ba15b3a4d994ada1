import { Column, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import { CreatedAtColumn } from './columns';
import { User } from './user.entity';

/**
 * The columns of a link sent by e-mail that works once and for a while (an invitation, a password reset). Only
 * the SHA-256 of the token is stored (token_hash, hex); the token itself travels in the e-mail. Each table
 * declares its own unique index on token_hash, named after the table.
 */
export abstract class SingleUseToken {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'uuid', name: 'user_id' })
  userId: string;

  @ManyToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'user_id' })
  user: Relation<User>;

  @Column({ type: 'char', length: 64, name: 'token_hash' })
  tokenHash: string;

  @Column({ type: 'datetime', precision: 3, name: 'expires_at' })
  expiresAt: Date;

  /** Set when the link is used: it works once. */
  @Column({ type: 'datetime', precision: 3, name: 'used_at', nullable: true })
  usedAt: Date | null;

  @CreatedAtColumn()
  createdAt: Date;
}
