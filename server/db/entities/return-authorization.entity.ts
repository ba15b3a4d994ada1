import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import { CreatedAtColumn } from './columns';
import type { Address } from '../../../shared/claims/actions.schema';
import { Claim } from './claim.entity';

// The manufacturer's request for a failed unit: our own number (RA-…), the address to ship to, the
// installer's shipment and the manufacturer's receipt. One claim may have several over its life.
@Entity({ name: 'return_authorizations' })
@Index('uq_return_authorizations_number', ['number'], { unique: true })
@Index('ix_return_authorizations_claim', ['claimId', 'createdAt'])
export class ReturnAuthorization {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'varchar', length: 20 })
  number: string;

  @Column({ type: 'uuid', name: 'claim_id' })
  claimId: string;

  @ManyToOne(() => Claim, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'claim_id' })
  claim: Relation<Claim>;

  @Column({ type: 'json', name: 'ship_to' })
  shipTo: Address;

  @Column({ type: 'text', nullable: true })
  instructions: string | null;

  @Column({ type: 'date', name: 'ship_by' })
  shipBy: string;

  @Column({ type: 'varchar', length: 80, nullable: true })
  carrier: string | null;

  @Column({ type: 'varchar', length: 64, name: 'tracking_number', nullable: true })
  trackingNumber: string | null;

  @Column({ type: 'date', name: 'shipped_on', nullable: true })
  shippedOn: string | null;

  @Column({ type: 'date', name: 'received_on', nullable: true })
  receivedOn: string | null;

  @Column({ type: 'varchar', length: 32, name: 'received_condition', nullable: true })
  receivedCondition: string | null;

  @Column({ type: 'text', name: 'received_note', nullable: true })
  receivedNote: string | null;

  @Column({ type: 'uuid', name: 'packing_slip_id', nullable: true })
  packingSlipId: string | null;

  @Column({ type: 'uuid', name: 'requested_by_id' })
  requestedById: string;

  @CreatedAtColumn()
  createdAt: Date;
}
