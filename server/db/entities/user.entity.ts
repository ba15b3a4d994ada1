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
import type { Role, UserStatus } from '../../../shared/roles';
import { Organization } from './organization.entity';

@Entity({ name: 'users' })
@Index('ix_users_org_name', ['organizationId', 'name'])
export class User {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'uuid', name: 'organization_id' })
  organizationId: string;

  @ManyToOne(() => Organization, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'organization_id' })
  organization: Relation<Organization>;

  @Index('uq_users_email', { unique: true })
  @Column({ type: 'varchar', length: 254 })
  email: string;

  @Column({ type: 'varchar', length: 160 })
  name: string;

  @Column({ type: 'varchar', length: 255, name: 'password_hash', nullable: true })
  passwordHash: string | null;

  @Column({ type: 'simple-array', name: 'roles' })
  roles: Role[];

  @Column({ type: 'enum', enum: ['invited', 'active', 'disabled'], default: 'active' })
  status: UserStatus;

  @Column({ type: 'datetime', precision: 3, name: 'last_sign_in_at', nullable: true })
  lastSignInAt: Date | null;

  /**
   * The TOTP secret (base32) of a confirmed second factor; null without one. A secret being enrolled lives in the
   * session until its first code confirms it.
   */
  @Column({ type: 'varchar', length: 64, name: 'totp_secret', nullable: true })
  totpSecret: string | null;

  @Column({ type: 'datetime', precision: 3, name: 'totp_confirmed_at', nullable: true })
  totpConfirmedAt: Date | null;

  /** The last TOTP time step accepted: a code of this step or an earlier one is refused (RFC 6238 section 5.2). */
  @Column({ type: 'int', unsigned: true, name: 'totp_last_step', nullable: true })
  totpLastStep: number | null;

  @CreatedAtColumn()
  createdAt: Date;

  @UpdatedAtColumn()
  updatedAt: Date;

  @VersionColumn({ type: 'int', name: 'version' })
  version: number;
}
