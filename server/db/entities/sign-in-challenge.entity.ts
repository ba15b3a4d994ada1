import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';
import { CreatedAtColumn } from './columns';

// A sign-in whose password was right and which waits for its second factor. The wrong codes are counted here,
// atomically (UPDATE ... WHERE attempts < limit), so parallel guesses on one pending sign-in cannot exceed it.
@Entity({ name: 'sign_in_challenges' })
@Index('ix_sign_in_challenges_user', ['userId'])
export class SignInChallenge {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'uuid', name: 'user_id' })
  userId: string;

  @Column({ type: 'int', unsigned: true, default: 0 })
  attempts: number;

  @Column({ type: 'datetime', precision: 3, name: 'expires_at' })
  expiresAt: Date;

  @CreatedAtColumn()
  createdAt: Date;
}
