import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';
import { CLAIM_STAGES, type ClaimStage } from '../../../shared/schemas/claims';

/**
 * How many claims each organisation has at each stage, kept by triggers on `claims` (migration ClaimCounts): every
 * insert, stage move and delete appends +1 and -1 rows for the claim's contractor and manufacturer, in the same
 * transaction as the change, so a total is exact the moment the change commits. Appending takes no lock a
 * concurrent move could wait on; server/lib/claim-counts.ts folds the rows of each organisation and stage into one
 * now and then. A list's total is then a sum over a few index entries instead of a count over thousands of claims.
 */
@Entity({ name: 'claim_counts' })
@Index('ix_claim_counts_org_stage', ['organizationId', 'stage', 'n'])
export class ClaimCount {
  @PrimaryGeneratedColumn({ type: 'bigint', unsigned: true })
  id: string;

  @Column({ type: 'uuid', name: 'organization_id' })
  organizationId: string;

  @Column({ type: 'enum', enum: CLAIM_STAGES })
  stage: ClaimStage;

  @Column({ type: 'int' })
  n: number;
}
