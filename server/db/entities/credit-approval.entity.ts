import { Column, Entity, PrimaryColumn } from 'typeorm';

// The first accountant's approval of a credit above the manufacturer's second-approval amount
// (organizations.credit_second_approval_above): the memo is issued only when a different accountant approves the
// same amount. One row per claim; a new amount (a reopened decision) starts it over.
@Entity({ name: 'credit_approvals' })
export class CreditApproval {
  @PrimaryColumn({ type: 'uuid', name: 'claim_id' })
  claimId: string;

  @Column({ type: 'uuid', name: 'approved_by_id' })
  approvedById: string;

  @Column({ type: 'decimal', precision: 12, scale: 2 })
  amount: string;

  @Column({ type: 'char', length: 3 })
  currency: string;

  @Column({ type: 'datetime', precision: 3, name: 'approved_at' })
  approvedAt: Date;
}
