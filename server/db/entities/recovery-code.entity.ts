import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';
import { CreatedAtColumn } from './columns';

// A second factor's one-time recovery codes, stored as SHA-256 hashes (each is 50 random bits, so a slow hash
// buys nothing a guess limit does not); used_at set when one is spent.
@Entity({ name: 'recovery_codes' })
@Index('uq_recovery_codes_user_hash', ['userId', 'codeHash'], { unique: true })
export class RecoveryCode {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'uuid', name: 'user_id' })
  userId: string;

  @Column({ type: 'char', length: 64, name: 'code_hash' })
  codeHash: string;

  @Column({ type: 'datetime', precision: 3, name: 'used_at', nullable: true })
  usedAt: Date | null;

  @CreatedAtColumn()
  createdAt: Date;
}
