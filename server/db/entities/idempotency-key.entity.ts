import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

// One row per (user, route, key) whose request succeeded. The row is inserted first in the action's transaction,
// so concurrent requests with one key wait on the unique index and then replay the stored answer.
@Entity({ name: 'idempotency_keys' })
@Index('uq_idempotency_keys', ['userId', 'route', 'key'], { unique: true })
@Index('ix_idempotency_keys_created', ['createdAt'])
export class IdempotencyKey {
  @PrimaryGeneratedColumn({ type: 'bigint', unsigned: true })
  id: string;

  @Column({ type: 'varchar', length: 255, name: 'idem_key' })
  key: string;

  @Column({ type: 'uuid', name: 'user_id' })
  userId: string;

  /** The route's pattern, e.g. "POST /claims/:id/credits"; the concrete path is part of the hash. */
  @Column({ type: 'varchar', length: 120 })
  route: string;

  /** sha256 of method, path and canonical body. */
  @Column({ type: 'char', length: 64, name: 'request_hash' })
  requestHash: string;

  @Column({ type: 'enum', enum: ['pending', 'done'], default: 'pending' })
  status: 'pending' | 'done';

  @Column({ type: 'smallint', unsigned: true, name: 'response_status', nullable: true })
  responseStatus: number | null;

  @Column({ type: 'json', name: 'response_body', nullable: true })
  responseBody: unknown;

  @Column({ type: 'datetime', precision: 3, name: 'created_at' })
  createdAt: Date;
}
