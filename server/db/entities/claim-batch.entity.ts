import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';
import { CreatedAtColumn } from './columns';

// A spreadsheet of failed units that became drafts together, to be reviewed and filed together.
@Entity({ name: 'claim_batches' })
@Index('ix_claim_batches_contractor_created', ['contractorId', 'createdAt'])
export class ClaimBatch {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'uuid', name: 'contractor_id' })
  contractorId: string;

  @Column({ type: 'varchar', length: 200, nullable: true })
  filename: string | null;

  @Column({ type: 'int', name: 'row_count' })
  rowCount: number;

  @Column({ type: 'uuid', name: 'created_by_id', nullable: true })
  createdById: string | null;

  @CreatedAtColumn()
  createdAt: Date;
}
