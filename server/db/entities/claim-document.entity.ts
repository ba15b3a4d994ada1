import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import { CreatedAtColumn } from './columns';
import { Claim } from './claim.entity';

export const CLAIM_DOCUMENT_KINDS = ['letter', 'packing_slip'] as const;
export type ClaimDocumentKind = (typeof CLAIM_DOCUMENT_KINDS)[number];

// A PDF generated once for a claim and kept: every later download streams these very bytes.
@Entity({ name: 'claim_documents' })
@Index('ix_claim_documents_claim', ['claimId', 'createdAt'])
@Index('uq_claim_documents_storage_key', ['storageKey'], { unique: true })
export class ClaimDocument {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'uuid', name: 'claim_id' })
  claimId: string;

  @ManyToOne(() => Claim, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'claim_id' })
  claim: Relation<Claim>;

  @Column({ type: 'enum', enum: CLAIM_DOCUMENT_KINDS })
  kind: ClaimDocumentKind;

  /** The download's file name, e.g. "LP-2612-7K4-QXM-determination.pdf". */
  @Column({ type: 'varchar', length: 120 })
  filename: string;

  @Column({ type: 'varchar', length: 160, name: 'storage_key' })
  storageKey: string;

  @Column({ type: 'char', length: 64 })
  sha256: string;

  @Column({ type: 'int', unsigned: true, name: 'byte_size' })
  byteSize: number;

  @CreatedAtColumn()
  createdAt: Date;
}
