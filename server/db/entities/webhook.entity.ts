import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import type { WebhookEvent } from '../../../shared/schemas/webhooks';
import { CreatedAtColumn } from './columns';
import { Organization } from './organization.entity';

// An organisation's registered receiver of events. The signing secret is needed in the clear to sign each
// delivery (HMAC), so it is stored as it is and shown to the administrator only once, when made.
@Entity({ name: 'webhook_endpoints' })
@Index('ix_webhook_endpoints_org', ['organizationId', 'createdAt'])
export class WebhookEndpoint {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'uuid', name: 'organization_id' })
  organizationId: string;

  @ManyToOne(() => Organization, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'organization_id' })
  organization: Relation<Organization>;

  @Column({ type: 'varchar', length: 2048 })
  url: string;

  @Column({ type: 'simple-array' })
  events: WebhookEvent[];

  @Column({ type: 'varchar', length: 80, name: 'signing_secret' })
  signingSecret: string;

  @Column({ type: 'uuid', name: 'created_by_id' })
  createdById: string;

  @CreatedAtColumn()
  createdAt: Date;

  /** Removed endpoints keep their delivery log; nothing new is sent to them. */
  @Column({ type: 'datetime', precision: 3, name: 'disabled_at', nullable: true })
  disabledAt: Date | null;
}

// One delivery of one event to one endpoint, written in the transaction of the change (the outbox pattern);
// the webhook worker sends it with retries and backoff. "Send again" adds a new row with the same event id.
@Entity({ name: 'webhook_deliveries' })
@Index('ix_webhook_deliveries_due', ['status', 'nextAttemptAt'])
@Index('ix_webhook_deliveries_endpoint', ['endpointId', 'id'])
export class WebhookDelivery {
  @PrimaryGeneratedColumn({ type: 'bigint', unsigned: true })
  id: string;

  @Column({ type: 'uuid', name: 'endpoint_id' })
  endpointId: string;

  @ManyToOne(() => WebhookEndpoint, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'endpoint_id' })
  endpoint: Relation<WebhookEndpoint>;

  @Column({ type: 'uuid', name: 'event_id' })
  eventId: string;

  @Column({ type: 'varchar', length: 64 })
  event: string;

  /** The exact JSON body sent (signed as it is). */
  @Column({ type: 'mediumtext' })
  body: string;

  @CreatedAtColumn()
  createdAt: Date;

  @Column({ type: 'enum', enum: ['pending', 'delivered', 'failed'], default: 'pending' })
  status: 'pending' | 'delivered' | 'failed';

  @Column({ type: 'int', default: 0 })
  attempts: number;

  @Column({ type: 'datetime', precision: 3, name: 'next_attempt_at' })
  nextAttemptAt: Date;

  @Column({ type: 'int', name: 'last_status_code', nullable: true })
  lastStatusCode: number | null;

  @Column({ type: 'varchar', length: 500, name: 'last_error', nullable: true })
  lastError: string | null;

  @Column({ type: 'datetime', precision: 3, name: 'last_attempt_at', nullable: true })
  lastAttemptAt: Date | null;

  @Column({ type: 'datetime', precision: 3, name: 'delivered_at', nullable: true })
  deliveredAt: Date | null;
}
