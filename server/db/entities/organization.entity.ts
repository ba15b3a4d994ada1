import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';
import { CreatedAtColumn } from './columns';
import type { OrganizationKind } from '../../../shared/roles';

@Entity({ name: 'organizations' })
export class Organization {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Index('uq_organizations_name', { unique: true })
  @Column({ type: 'varchar', length: 160 })
  name: string;

  @Column({ type: 'enum', enum: ['manufacturer', 'contractor'] })
  kind: OrganizationKind;

  @CreatedAtColumn()
  createdAt: Date;
}
