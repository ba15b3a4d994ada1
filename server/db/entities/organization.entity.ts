import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';
import { CreatedAtColumn } from './columns';
import type { OrganizationKind } from '../../../shared/roles';
import type { StageTargets } from '../../../shared/schemas/ageing';

@Entity({ name: 'organizations' })
export class Organization {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Index('uq_organizations_name', { unique: true })
  @Column({ type: 'varchar', length: 160 })
  name: string;

  @Column({ type: 'enum', enum: ['manufacturer', 'contractor'] })
  kind: OrganizationKind;

  /** Set by the organisation's administrators: every member needs a second factor (beyond the roles that always do). */
  @Column({ type: 'boolean', name: 'require_second_factor', default: false })
  requireSecondFactor: boolean;
  /**
   * A credit above this amount (in the claim's currency) needs a second accountant's approval; null: none does.
   * Set by the organisation's administrator.
   */
  @Column({ type: 'decimal', precision: 12, scale: 2, name: 'credit_second_approval_above', nullable: true })
  creditSecondApprovalAbove: string | null;
  /** IANA zone every time is shown in to this organisation's people (screens, PDFs, e-mails). */
  @Column({ name: 'time_zone', type: 'varchar', length: 64, default: 'UTC' })
  timeZone: string;

  /** BCP 47 locale for what the server writes to its people (PDFs, e-mails); screens use the reader's own. */
  @Column({ type: 'varchar', length: 35, default: 'en-US' })
  locale: string;

  /** Days a claim may wait in each stage before the ageing page flags it (shared/schemas/ageing.ts). */
  @Column({ name: 'stage_targets', type: 'json', nullable: true })
  stageTargets: StageTargets | null;

  @CreatedAtColumn()
  createdAt: Date;
}
