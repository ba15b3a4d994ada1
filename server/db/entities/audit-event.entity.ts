import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

// Append-only: the database refuses UPDATE and DELETE on this table (see the audit triggers migration).
@Entity({ name: 'audit_events' })
@Index('ix_audit_entity', ['entityType', 'entityId', 'id'])
@Index('ix_audit_org_time', ['organizationId', 'occurredAt'])
export class AuditEvent {
  @PrimaryGeneratedColumn({ type: 'bigint', unsigned: true })
  id: string;

  @Column({ type: 'datetime', precision: 3, name: 'occurred_at' })
  occurredAt: Date;

  @Column({ type: 'uuid', name: 'actor_user_id', nullable: true })
  actorUserId: string | null;

  @Column({ type: 'uuid', name: 'organization_id', nullable: true })
  organizationId: string | null;

  @Column({ type: 'varchar', length: 64 })
  action: string;

  @Column({ type: 'varchar', length: 40, name: 'entity_type' })
  entityType: string;

  @Column({ type: 'varchar', length: 64, name: 'entity_id' })
  entityId: string;

  @Column({ type: 'json', name: 'before_state', nullable: true })
  before: Record<string, unknown> | null;

  @Column({ type: 'json', name: 'after_state', nullable: true })
  after: Record<string, unknown> | null;

  @Column({ type: 'varchar', length: 64, name: 'request_id', nullable: true })
  requestId: string | null;
}
