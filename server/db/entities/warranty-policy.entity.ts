import {
  Column,
  Entity,
  Index,
  JoinColumn,
  ManyToOne,
  OneToMany,
  PrimaryGeneratedColumn,
  VersionColumn,
  type Relation,
} from 'typeorm';
import { CreatedAtColumn, UpdatedAtColumn } from './columns';
import { Organization } from './organization.entity';
import { PolicyModel } from './policy-model.entity';
import { WarrantyPolicyVersion } from './warranty-policy-version.entity';

// A named warranty programme. Its terms live in versions (immutable); the policy row only carries the name,
// the models it covers and the number of its latest version.
@Entity({ name: 'warranty_policies' })
@Index('uq_warranty_policies_mfr_name', ['manufacturerId', 'name'], { unique: true })
@Index('ix_warranty_policies_name', ['name'])
@Index('ix_warranty_policies_updated', ['updatedAt'])
@Index('ix_warranty_policies_created', ['createdAt'])
export class WarrantyPolicy {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'uuid', name: 'manufacturer_id' })
  manufacturerId: string;

  @ManyToOne(() => Organization, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'manufacturer_id' })
  manufacturer: Relation<Organization>;

  @Column({ type: 'varchar', length: 160 })
  name: string;

  @Column({ type: 'int', name: 'latest_version_number' })
  latestVersionNumber: number;

  @OneToMany(() => WarrantyPolicyVersion, (v) => v.policy)
  versions: Relation<WarrantyPolicyVersion[]>;

  @OneToMany(() => PolicyModel, (pm) => pm.policy)
  models: Relation<PolicyModel[]>;

  @CreatedAtColumn()
  createdAt: Date;

  @UpdatedAtColumn()
  updatedAt: Date;

  @VersionColumn({ type: 'int', name: 'version' })
  version: number;
}
