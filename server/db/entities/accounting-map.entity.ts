import { Column, Entity, JoinColumn, OneToOne, PrimaryColumn, type Relation } from 'typeorm';
import { UpdatedAtColumn } from './columns';
import { Organization } from './organization.entity';

/**
 * The accounts a manufacturer books its credit memos to, mapped once by an accountant or administrator and used
 * by the journal export (shared/credits/journal.ts). One row per organisation.
 */
@Entity({ name: 'accounting_maps' })
export class AccountingMap {
  @PrimaryColumn({ type: 'uuid', name: 'organization_id' })
  organizationId: string;

  @OneToOne(() => Organization, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'organization_id' })
  organization: Relation<Organization>;

  @Column({ type: 'varchar', length: 20, name: 'debit_account_code' })
  debitAccountCode: string;

  @Column({ type: 'varchar', length: 100, name: 'debit_account_name' })
  debitAccountName: string;

  @Column({ type: 'varchar', length: 20, name: 'credit_account_code' })
  creditAccountCode: string;

  @Column({ type: 'varchar', length: 100, name: 'credit_account_name' })
  creditAccountName: string;

  @Column({ type: 'varchar', length: 10, name: 'journal_code' })
  journalCode: string;

  @Column({ type: 'uuid', name: 'updated_by_id', nullable: true })
  updatedById: string | null;

  @UpdatedAtColumn()
  updatedAt: Date;
}
