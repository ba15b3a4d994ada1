import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import { CreatedAtColumn } from './columns';
import type { DenialCode, Resolution } from '../../../shared/claims/actions.schema';
import { Claim } from './claim.entity';

export const DECISION_OUTCOMES = ['approved', 'partly_approved', 'denied'] as const;
export type DecisionOutcome = (typeof DECISION_OUTCOMES)[number];

// The reviewer's decision on a claim: one per claim (a reopened decision is superseded: its row is kept, marked
// with supersededAt, and the unique key is on the current one only through current_claim_id).
@Entity({ name: 'decisions' })
@Index('uq_decisions_current_claim', ['currentClaimId'], { unique: true })
@Index('ix_decisions_claim', ['claimId', 'decidedAt'])
export class Decision {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'uuid', name: 'claim_id' })
  claimId: string;

  @ManyToOne(() => Claim, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'claim_id' })
  claim: Relation<Claim>;

  /** The claim's id while this is its decision in force, null once superseded: MariaDB allows many NULLs. */
  @Column({ type: 'uuid', name: 'current_claim_id', nullable: true })
  currentClaimId: string | null;

  @Column({ type: 'enum', enum: DECISION_OUTCOMES })
  outcome: DecisionOutcome;

  @Column({ type: 'enum', enum: ['replace', 'credit', 'repair_allowance'], nullable: true })
  resolution: Resolution | null;

  @Column({ type: 'decimal', precision: 12, scale: 2, nullable: true })
  amount: string | null;

  @Column({ type: 'char', length: 3, nullable: true })
  currency: string | null;

  /** The engine's credit at the time, beside the decided amount. */
  @Column({ type: 'decimal', precision: 12, scale: 2, name: 'engine_amount', nullable: true })
  engineAmount: string | null;

  @Column({ type: 'int', name: 'approved_units', nullable: true })
  approvedUnits: number | null;

  @Column({ type: 'json', name: 'reason_codes' })
  reasonCodes: DenialCode[];

  @Column({ type: 'text', nullable: true })
  note: string | null;

  @Column({ type: 'text', name: 'override_reason', nullable: true })
  overrideReason: string | null;

  @Column({ type: 'boolean', name: 'against_engine' })
  againstEngine: boolean;

  @Column({ type: 'uuid', name: 'decided_by_id' })
  decidedById: string;

  @CreatedAtColumn('decided_at')
  decidedAt: Date;

  @Column({ type: 'datetime', precision: 3, name: 'superseded_at', nullable: true })
  supersededAt: Date | null;

  @Column({ type: 'uuid', name: 'letter_id', nullable: true })
  letterId: string | null;
}
