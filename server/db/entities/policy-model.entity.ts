import { Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, type Relation } from 'typeorm';
import { ProductModel } from './product-model.entity';
import { WarrantyPolicy } from './warranty-policy.entity';

// Which models a policy covers. A model is covered by one policy at most (the unique index), so "the
// version in force" for an installation is never ambiguous.
@Entity({ name: 'policy_models' })
@Index('uq_policy_models_model', ['productModelId'], { unique: true })
export class PolicyModel {
  @PrimaryColumn({ type: 'uuid', name: 'policy_id' })
  policyId: string;

  @PrimaryColumn({ type: 'uuid', name: 'product_model_id' })
  productModelId: string;

  @ManyToOne(() => WarrantyPolicy, (p) => p.models, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'policy_id' })
  policy: Relation<WarrantyPolicy>;

  @ManyToOne(() => ProductModel, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'product_model_id' })
  productModel: Relation<ProductModel>;
}
