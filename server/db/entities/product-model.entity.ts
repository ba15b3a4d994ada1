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
import type { Dimming, ProductFamily, RatedLocation } from '../../../shared/schemas/catalogue';
import { Organization } from './organization.entity';

// A manufacturer's catalogue entry and every rating the evaluation engine needs (ENGINE.md, `product`).
// Measured ratings are doubles (the engine works in JS numbers); counts are integers.
@Entity({ name: 'product_models' })
@Index('uq_product_models_mfr_number', ['manufacturerId', 'modelNumber'], { unique: true })
@Index('ix_product_models_mfr_family', ['manufacturerId', 'family'])
@Index('ix_product_models_family', ['family'])
@Index('ix_product_models_location', ['location'])
@Index('ix_product_models_dimming', ['dimming'])
@Index('ix_product_models_number', ['modelNumber'])
@Index('ix_product_models_name', ['name'])
@Index('ix_product_models_watts', ['ratedInputWatts'])
@Index('ix_product_models_lumens', ['ratedLumens'])
@Index('ix_product_models_created', ['createdAt'])
export class ProductModel {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'uuid', name: 'manufacturer_id' })
  manufacturerId: string;

  @ManyToOne(() => Organization, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'manufacturer_id' })
  manufacturer: Relation<Organization>;

  @Column({ type: 'varchar', length: 64, name: 'model_number' })
  modelNumber: string;

  @Column({ type: 'varchar', length: 160 })
  name: string;

  @Column({
    type: 'enum',
    enum: ['high_bay', 'wall_pack', 'troffer', 'corn_lamp', 'flood', 'strip', 'other'],
  })
  family: ProductFamily;

  @Column({ type: 'double', name: 'rated_input_watts' })
  ratedInputWatts: number;

  @Column({ type: 'double', name: 'input_volts_min' })
  inputVoltsMin: number;

  @Column({ type: 'double', name: 'input_volts_max' })
  inputVoltsMax: number;

  @Column({ type: 'int', name: 'rated_lumens' })
  ratedLumens: number;

  @Column({ type: 'int', name: 'led_strings' })
  ledStrings: number;

  @Column({ type: 'int', name: 'leds_per_string' })
  ledsPerString: number;

  @Column({ type: 'double', name: 'led_forward_volts' })
  ledForwardVolts: number;

  @Column({ type: 'double', name: 'driver_output_amps' })
  driverOutputAmps: number;

  @Column({ type: 'double', name: 'driver_max_output_volts', nullable: true })
  driverMaxOutputVolts: number | null;

  @Column({ type: 'enum', enum: ['dry', 'damp', 'wet'] })
  location: RatedLocation;

  @Column({ type: 'boolean', name: 'enclosed_rated' })
  enclosedRated: boolean;

  @Column({ type: 'enum', enum: ['none', 'phase', '0-10v', 'phase_or_0-10v'] })
  dimming: Dimming;

  @Column({ type: 'double', name: 'ambient_max_c' })
  ambientMaxC: number;

  @Column({ type: 'int', name: 'rated_life_hours' })
  ratedLifeHours: number;

  @Column({ type: 'boolean', name: 'active_cooling' })
  activeCooling: boolean;

  @CreatedAtColumn()
  createdAt: Date;

  @UpdatedAtColumn()
  updatedAt: Date;

  @VersionColumn({ type: 'int', name: 'version' })
  version: number;
}
