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
import type { Dimmer, Enclosure, RatedLocation } from '../../../shared/schemas/catalogue';
import { InstallationUnit } from './installation-unit.entity';
import { Organization } from './organization.entity';
import { ProductModel } from './product-model.entity';
import { WarrantyPolicyVersion } from './warranty-policy-version.entity';

// What a contractor installed, where and how. manufacturerId is copied from the product so that the
// manufacturer's view of "installations of my products" is one indexed filter.
@Entity({ name: 'installations' })
@Index('ix_installations_contractor_date', ['contractorId', 'installDate'])
@Index('ix_installations_contractor_site', ['contractorId', 'siteName'])
@Index('ix_installations_contractor_created', ['contractorId', 'createdAt'])
@Index('ix_installations_mfr_date', ['manufacturerId', 'installDate'])
@Index('ix_installations_mfr_site', ['manufacturerId', 'siteName'])
@Index('ix_installations_mfr_created', ['manufacturerId', 'createdAt'])
@Index('ix_installations_model_date', ['productModelId', 'installDate'])
// The location filter (damp, wet, dry) with the usual sort: the page and its count read an index range.
@Index('ix_installations_mfr_location_date', ['manufacturerId', 'location', 'installDate'])
@Index('ix_installations_contractor_location_date', ['contractorId', 'location', 'installDate'])
@Index('ix_installations_location', ['location'])
@Index('ix_installations_enclosure', ['enclosure'])
@Index('ix_installations_supply', ['nominalSupplyVolts'])
@Index('ix_installations_quantity', ['quantity'])
@Index('ix_installations_city', ['siteCity'])
@Index('ix_installations_mfr_lot', ['manufacturerId', 'lot'])
export class Installation {
  @PrimaryGeneratedColumn('uuid')
  id: string;

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

  @Column({ type: 'uuid', name: 'product_model_id' })
  productModelId: string;

  @ManyToOne(() => ProductModel, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'product_model_id' })
  productModel: Relation<ProductModel>;

  /** The policy version in force on the purchase (or install) date; null when no policy covered the model then. */
  @Column({ type: 'uuid', name: 'policy_version_id', nullable: true })
  policyVersionId: string | null;

  @ManyToOne(() => WarrantyPolicyVersion, { onDelete: 'RESTRICT', nullable: true })
  @JoinColumn({ name: 'policy_version_id' })
  policyVersion: Relation<WarrantyPolicyVersion> | null;

  @Column({ type: 'varchar', length: 160, name: 'site_name' })
  siteName: string;

  @Column({ type: 'varchar', length: 200, name: 'site_address' })
  siteAddress: string;

  @Column({ type: 'varchar', length: 120, name: 'site_city' })
  siteCity: string;

  @Column({ type: 'varchar', length: 80, name: 'site_region' })
  siteRegion: string;

  @Column({ type: 'varchar', length: 20, name: 'site_postal_code' })
  sitePostalCode: string;

  @Column({ type: 'int' })
  quantity: number;

  @Column({ type: 'date', name: 'install_date' })
  installDate: string;

  @Column({ type: 'date', name: 'purchase_date', nullable: true })
  purchaseDate: string | null;

  @Column({ type: 'varchar', length: 160, nullable: true })
  distributor: string | null;

  @Column({ type: 'varchar', length: 64, name: 'invoice_number', nullable: true })
  invoiceNumber: string | null;

  @Column({ type: 'enum', enum: ['dry', 'damp', 'wet'] })
  location: RatedLocation;

  @Column({ type: 'enum', enum: ['open', 'enclosed', 'enclosed_ventilated'] })
  enclosure: Enclosure;

  @Column({ type: 'enum', enum: ['none', 'phase', '0-10v'] })
  dimmer: Dimmer;

  @Column({ type: 'smallint', name: 'nominal_supply_volts' })
  nominalSupplyVolts: number;

  @Column({ type: 'double', name: 'hours_per_day' })
  hoursPerDay: number;

  @Column({ type: 'double', name: 'ambient_c' })
  ambientC: number;

  /** The date code (manufacturing lot) on the units' labels, when the installer recorded one. */
  @Column({ type: 'varchar', length: 32, nullable: true })
  lot: string | null;

  @OneToMany(() => InstallationUnit, (u) => u.installation)
  units: Relation<InstallationUnit[]>;

  @Column({ type: 'uuid', name: 'created_by_id', nullable: true })
  createdById: string | null;

  @CreatedAtColumn()
  createdAt: Date;

  @UpdatedAtColumn()
  updatedAt: Date;

  @VersionColumn({ type: 'int', name: 'version' })
  version: number;
}
