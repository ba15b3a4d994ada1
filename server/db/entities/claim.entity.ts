import {
  Column,
  Entity,
  Index,
  JoinColumn,
  ManyToOne,
  PrimaryGeneratedColumn,
  VersionColumn,
  type Relation,
} from 'typeorm';
import { CreatedAtColumn, UpdatedAtColumn } from './columns';
import type { Evaluation, Verdict } from '../../../shared/engine';
import {
  CLAIM_STAGES,
  type ClaimMeasurements,
  type ClaimObservations,
  type ClaimStage,
  type Symptom,
  type WaitingOn,
} from '../../../shared/schemas/claims';
import { Installation } from './installation.entity';
import { Organization } from './organization.entity';
import { ProductModel } from './product-model.entity';
import { WarrantyPolicyVersion } from './warranty-policy-version.entity';

// A warranty claim from a draft to its end. contractorId and manufacturerId are both on the row so that each
// side's queue is one indexed filter; the stored evaluation is the engine's record at filing, with its version.
@Entity({ name: 'claims' })
@Index('uq_claims_number', ['number'], { unique: true })
@Index('ix_claims_mfr_stage_filed', ['manufacturerId', 'stage', 'filedAt'])
@Index('ix_claims_contractor_stage_filed', ['contractorId', 'stage', 'filedAt'])
@Index('ix_claims_contractor_updated', ['contractorId', 'updatedAt'])
@Index('ix_claims_mfr_filed', ['manufacturerId', 'filedAt'])
@Index('ix_claims_installation', ['installationId'])
@Index('ix_claims_batch', ['batchId'])
@Index('ix_claims_reviewer', ['assignedReviewerId', 'stage'])
// The reviewer's queue: every filter and sort leads with the manufacturer (review module).
@Index('ix_claims_mfr_stage_changed', ['manufacturerId', 'stageChangedAt'])
@Index('ix_claims_mfr_waiting', ['manufacturerId', 'waitingOn', 'stageChangedAt'])
@Index('ix_claims_mfr_verdict', ['manufacturerId', 'verdict', 'stageChangedAt'])
@Index('ix_claims_mfr_product', ['manufacturerId', 'productModelId', 'stageChangedAt'])
@Index('ix_claims_mfr_contractor', ['manufacturerId', 'contractorId', 'stageChangedAt'])
@Index('ix_claims_mfr_credit', ['manufacturerId', 'expectedCredit'])
@Index('ix_claims_mfr_number', ['manufacturerId', 'number'])
// The queue's count: open stages and a verdict, from the index alone.
@Index('ix_claims_mfr_stage_verdict', ['manufacturerId', 'stage', 'verdict'])
// The free-text search (server/lib/claim-search.ts) over the column below.
@Index('ft_claims_search', ['searchText'], { fulltext: true })
export class Claim {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  /** Our own number, given at filing; null while a draft. */
  @Column({ type: 'varchar', length: 20, nullable: true })
  number: string | null;

  @Column({ type: 'uuid', name: 'contractor_id' })
  contractorId: string;

  @ManyToOne(() => Organization, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'contractor_id' })
  contractor: Relation<Organization>;

  @Column({ type: 'uuid', name: 'manufacturer_id' })
  manufacturerId: string;

  @ManyToOne(() => Organization, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'manufacturer_id' })
  manufacturer: Relation<Organization>;

  @Column({ type: 'uuid', name: 'installation_id' })
  installationId: string;

  @ManyToOne(() => Installation, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'installation_id' })
  installation: Relation<Installation>;

  @Column({ type: 'uuid', name: 'product_model_id' })
  productModelId: string;

  @ManyToOne(() => ProductModel, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'product_model_id' })
  productModel: Relation<ProductModel>;

  /** The installation's policy version in force, copied when the draft is made. */
  @Column({ type: 'uuid', name: 'policy_version_id', nullable: true })
  policyVersionId: string | null;

  @ManyToOne(() => WarrantyPolicyVersion, { onDelete: 'RESTRICT', nullable: true })
  @JoinColumn({ name: 'policy_version_id' })
  policyVersion: Relation<WarrantyPolicyVersion> | null;

  @Column({ type: 'enum', enum: CLAIM_STAGES, default: 'draft' })
  stage: ClaimStage;

  @Column({ type: 'datetime', precision: 3, name: 'stage_changed_at' })
  stageChangedAt: Date;

  @Column({ type: 'enum', enum: ['manufacturer', 'contractor'], name: 'waiting_on', nullable: true })
  waitingOn: WaitingOn | null;

  @Column({ type: 'int', nullable: true })
  units: number | null;

  @Column({ type: 'json' })
  serials: string[];

  @Column({ type: 'date', name: 'failed_on', nullable: true })
  failedOn: string | null;

  @Column({ type: 'json' })
  symptoms: Symptom[];

  @Column({ type: 'json' })
  measurements: ClaimMeasurements;

  @Column({ type: 'json' })
  observations: ClaimObservations;

  @Column({ type: 'text' })
  narrative: string;

  /**
   * Number, serials, site, contractor, product and narrative as one text, for the FULLTEXT index. Kept by triggers
   * (migration ClaimSearch); the application never writes or reads it as a field.
   */
  @Column({ type: 'text', name: 'search_text', nullable: true, select: false, insert: false, update: false })
  searchText?: string | null;

  @Column({ type: 'json', nullable: true })
  evaluation: Evaluation | null;

  @Column({ type: 'varchar', length: 20, name: 'engine_version', nullable: true })
  engineVersion: string | null;

  @Column({ type: 'datetime', precision: 3, name: 'evaluated_at', nullable: true })
  evaluatedAt: Date | null;

  /** The evaluation's verdict, denormalised for filters. */
  @Column({ type: 'enum', enum: ['covered', 'excluded', 'review'], nullable: true })
  verdict: Verdict | null;

  @Column({ type: 'decimal', precision: 12, scale: 2, name: 'expected_credit', nullable: true })
  expectedCredit: string | null;

  @Column({ type: 'char', length: 3, nullable: true })
  currency: string | null;

  @Column({ type: 'datetime', precision: 3, name: 'filed_at', nullable: true })
  filedAt: Date | null;

  @Column({ type: 'uuid', name: 'filed_by_id', nullable: true })
  filedById: string | null;

  @Column({ type: 'uuid', name: 'batch_id', nullable: true })
  batchId: string | null;

  @Column({ type: 'uuid', name: 'assigned_reviewer_id', nullable: true })
  assignedReviewerId: string | null;

  @Column({ type: 'uuid', name: 'created_by_id', nullable: true })
  createdById: string | null;

  @CreatedAtColumn()
  createdAt: Date;

  @UpdatedAtColumn()
  updatedAt: Date;

  @VersionColumn({ type: 'int', name: 'version' })
  version: number;
}
