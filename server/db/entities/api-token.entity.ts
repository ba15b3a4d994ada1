import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import type { Role } from '../../../shared/roles';
import { CreatedAtColumn } from './columns';
import { Organization } from './organization.entity';
import { User } from './user.entity';

// An organisation's API token. The secret is shown once; only its SHA-256 is kept (a random 32-byte secret needs
// no slow hash). The token's id travels in the token itself, so the server finds the row by primary key.
@Entity({ name: 'api_tokens' })
@Index('ix_api_tokens_org', ['organizationId', 'createdAt'])
export class ApiToken {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'uuid', name: 'organization_id' })
  organizationId: string;

  @ManyToOne(() => Organization, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'organization_id' })
  organization: Relation<Organization>;

  @Column({ type: 'varchar', length: 100 })
  name: string;

  /** The roles the token acts with: a subset of those its organisation's kind allows. */
  @Column({ type: 'simple-array', name: 'roles' })
  roles: Role[];

  @Column({ type: 'char', length: 64, name: 'secret_hash' })
  secretHash: string;

  /** The token's first characters, to tell tokens apart in the list (never enough to use). */
  @Column({ type: 'varchar', length: 16, name: 'hint' })
  hint: string;

  /** The administrator who made it: the token acts on their behalf in "created by" fields. */
  @Column({ type: 'uuid', name: 'created_by_id' })
  createdById: string;

  @ManyToOne(() => User, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'created_by_id' })
  createdBy: Relation<User>;

  @CreatedAtColumn()
  createdAt: Date;

  @Column({ type: 'datetime', precision: 3, name: 'expires_at' })
  expiresAt: Date;

  @Column({ type: 'datetime', precision: 3, name: 'last_used_at', nullable: true })
  lastUsedAt: Date | null;

  @Column({ type: 'datetime', precision: 3, name: 'revoked_at', nullable: true })
  revokedAt: Date | null;

  @Column({ type: 'uuid', name: 'revoked_by_id', nullable: true })
  revokedById: string | null;
}
