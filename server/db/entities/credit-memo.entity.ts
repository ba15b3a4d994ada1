import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import type { MemoKind } from '../../../shared/schemas/credits';
import { Claim } from './claim.entity';
import { Organization } from './organization.entity';
import { User } from './user.entity';

// A credit memo, or the reversal that voids one. Memos are documents: the database refuses to edit or delete
// them (see the CreditsGuards migration), with one exception: voiding frees `credited_claim_id`, the column
// whose UNIQUE index lets a claim hold at most one standing credit (NULL for reversals and voided credits;
// MariaDB's unique indexes allow many NULLs).
@Entity({ name: 'credit_memos' })
@Index('uq_credit_memos_number', ['number'], { unique: true })
@Index('uq_credit_memos_credited_claim', ['creditedClaimId'], { unique: true })
@Index('uq_credit_memos_reverses', ['reversesMemoId'], { unique: true })
@Index('ix_credit_memos_mfr_issued', ['manufacturerId', 'issuedAt'])
@Index('ix_credit_memos_contractor_issued', ['contractorId', 'issuedAt'])
@Index('ix_credit_memos_claim', ['claimId'])
// The storage sweep asks which keys a row names (server/lib/storage-sweep.ts).
@Index('ix_credit_memos_pdf_storage_key', ['pdfStorageKey'])
export class CreditMemo {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  /** Our own format, CM-ALD-2026-000042: the manufacturer's code, the year, a sequence per both. */
  @Column({ type: 'varchar', length: 32 })
  number: string;

  @Column({ type: 'enum', enum: ['credit', 'reversal'] })
  kind: MemoKind;

  @Column({ type: 'uuid', name: 'manufacturer_id' })
  manufacturerId: string;

  @ManyToOne(() => Organization, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'manufacturer_id' })
  manufacturer: Relation<Organization>;

  @Column({ type: 'uuid', name: 'contractor_id' })
  contractorId: string;

  @ManyToOne(() => Organization, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'contractor_id' })
  contractor: Relation<Organization>;

  @Column({ type: 'uuid', name: 'claim_id' })
  claimId: string;

  @ManyToOne(() => Claim, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'claim_id' })
  claim: Relation<Claim>;

  /** The claim while this credit stands; NULL for reversals and for voided credits. */
  @Column({ type: 'uuid', name: 'credited_claim_id', nullable: true })
  creditedClaimId: string | null;

  @Column({ type: 'uuid', name: 'reverses_memo_id', nullable: true })
  reversesMemoId: string | null;

  @ManyToOne(() => CreditMemo, { onDelete: 'RESTRICT', nullable: true })
  @JoinColumn({ name: 'reverses_memo_id' })
  reversesMemo: Relation<CreditMemo> | null;

  /** Always positive: the memo's face value. The ledger entry carries the sign. */
  @Column({ type: 'decimal', precision: 14, scale: 2 })
  amount: string;

  @Column({ type: 'char', length: 3 })
  currency: string;

  /** Why a reversal voids its memo. */
  @Column({ type: 'text', nullable: true })
  reason: string | null;

  @Column({ type: 'varchar', length: 160, name: 'pdf_storage_key' })
  pdfStorageKey: string;

  @Column({ type: 'char', length: 64, name: 'pdf_sha256' })
  pdfSha256: string;

  @Column({ type: 'uuid', name: 'issued_by_id' })
  issuedById: string;

  @ManyToOne(() => User, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'issued_by_id' })
  issuedBy: Relation<User>;

  @Column({ type: 'datetime', precision: 3, name: 'issued_at' })
  issuedAt: Date;
}
