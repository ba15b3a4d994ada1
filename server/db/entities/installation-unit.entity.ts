import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import { Installation } from './installation.entity';
import { ProductModel } from './product-model.entity';

// One serial number or date code of an installation. The unique index makes the database itself refuse a
// serial already registered for the same model (a model belongs to one manufacturer, so this is unique per
// manufacturer and model).
@Entity({ name: 'installation_units' })
@Index('uq_installation_units_model_serial', ['productModelId', 'serial'], { unique: true })
@Index('ix_installation_units_installation', ['installationId'])
@Index('ix_installation_units_mfr_serial', ['manufacturerId', 'serial'])
export class InstallationUnit {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'uuid', name: 'manufacturer_id' })
  manufacturerId: string;

  @Column({ type: 'uuid', name: 'product_model_id' })
  productModelId: string;

  @ManyToOne(() => ProductModel, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'product_model_id' })
  productModel: Relation<ProductModel>;

  @Column({ type: 'uuid', name: 'installation_id' })
  installationId: string;

  @ManyToOne(() => Installation, (i) => i.units, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'installation_id' })
  installation: Relation<Installation>;

  @Column({ type: 'varchar', length: 64 })
  serial: string;
}
