import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import { CreatedAtColumn } from './columns';
import type { DenialReason, Exclusion } from '../../../shared/schemas/catalogue';
import { WarrantyPolicy } from './warranty-policy.entity';

// One set of terms, in force from effectiveFrom. Never updated: the database refuses UPDATE and DELETE
// (see the CatalogueGuards migration); an edit is a new row with the next version number.
@Entity({ name: 'warranty_policy_versions' })
@Index('uq_policy_versions_number', ['policyId', 'versionNumber'], { unique: true })
@Index('ix_policy_versions_effective', ['policyId', 'effectiveFrom'])
export class WarrantyPolicyVersion {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'uuid', name: 'policy_id' })
  policyId: string;

  @ManyToOne(() => WarrantyPolicy, (p) => p.versions, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'policy_id' })
  policy: Relation<WarrantyPolicy>;

  @Column({ type: 'int', name: 'version_number' })
  versionNumber: number;

  @Column({ type: 'date', name: 'effective_from' })
  effectiveFrom: string;

  @Column({ type: 'int', name: 'term_months' })
  termMonths: number;

  @Column({ type: 'int', name: 'full_coverage_months' })
  fullCoverageMonths: number;

  @Column({ type: 'int', name: 'filing_window_days' })
  filingWindowDays: number;

  @Column({ type: 'decimal', precision: 5, scale: 2, name: 'dark_led_failure_percent' })
  darkLedFailurePercent: string;

  @Column({ type: 'decimal', precision: 12, scale: 2, name: 'unit_credit' })
  unitCredit: string;

  @Column({ type: 'char', length: 3 })
  currency: string;

  @Column({ type: 'decimal', precision: 12, scale: 2, name: 'labour_allowance' })
  labourAllowance: string;

  @Column({ type: 'int', name: 'required_photos' })
  requiredPhotos: number;

  @Column({ type: 'boolean', name: 'proof_of_purchase_required' })
  proofOfPurchaseRequired: boolean;

  @Column({ type: 'json' })
  exclusions: Exclusion[];

  @Column({ type: 'json', name: 'denial_reasons' })
  denialReasons: DenialReason[];

  @Column({ type: 'varchar', length: 500, name: 'change_note', nullable: true })
  changeNote: string | null;

  @Column({ type: 'uuid', name: 'created_by_id', nullable: true })
  createdById: string | null;

  @CreatedAtColumn()
  createdAt: Date;
}
