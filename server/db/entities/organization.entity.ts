import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';
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

  @CreateDateColumn({ type: 'datetime', precision: 3, name: 'created_at' })
  createdAt: Date;
}
