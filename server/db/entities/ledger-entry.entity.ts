import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import { CreditMemo } from './credit-memo.entity';

// The contractor's account with a manufacturer, one row per memo. Append-only: the database refuses UPDATE and
// DELETE (triggers); a mistake is corrected by a reversal memo and its negative entry. A balance is the sum.
@Entity({ name: 'ledger_entries' })
@Index('uq_ledger_entries_memo', ['memoId'], { unique: true })
@Index('ix_ledger_account', ['contractorId', 'manufacturerId', 'currency'])
@Index('ix_ledger_mfr_created', ['manufacturerId', 'createdAt'])
export class LedgerEntry {
  @PrimaryGeneratedColumn({ type: 'bigint', unsigned: true })
  id: string;

  @Column({ type: 'uuid', name: 'contractor_id' })
  contractorId: string;

  @Column({ type: 'uuid', name: 'manufacturer_id' })
  manufacturerId: string;

  @Column({ type: 'char', length: 3 })
  currency: string;

  /** Signed: a credit adds to what the manufacturer owes the contractor, a reversal takes it back. */
  @Column({ type: 'decimal', precision: 14, scale: 2 })
  amount: string;

  @Column({ type: 'uuid', name: 'memo_id' })
  memoId: string;

  @ManyToOne(() => CreditMemo, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'memo_id' })
  memo: Relation<CreditMemo>;

  @Column({ type: 'datetime', precision: 3, name: 'created_at' })
  createdAt: Date;
}
