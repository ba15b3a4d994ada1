import {
  Column,
  DeleteDateColumn,
  Entity,
  Index,
  JoinColumn,
  ManyToOne,
  PrimaryGeneratedColumn,
  type Relation,
} from 'typeorm';
import { CreatedAtColumn } from './columns';
import {
  ATTACHMENT_KINDS,
  ATTACHMENT_PURPOSES,
  type AttachmentKind,
  type AttachmentPurpose,
} from '../../../shared/schemas/attachments';
import { Organization } from './organization.entity';
import { User } from './user.entity';

// A stored file and what is known about it. The owner is polymorphic (a claim, later perhaps an installation):
// the owner's module authorises access after loading the owner, so there is no foreign key to it here.
@Entity({ name: 'attachments' })
@Index('ix_attachments_owner', ['ownerType', 'ownerId'])
// The storage sweep asks which keys a row names (server/lib/storage-sweep.ts).
@Index('ix_attachments_thumbnail_key', ['thumbnailKey'])
export class Attachment {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'varchar', length: 32, name: 'owner_type' })
  ownerType: string;

  /** Null while a draft is being assembled and its owner does not exist yet. */
  @Column({ type: 'uuid', name: 'owner_id', nullable: true })
  ownerId: string | null;

  /** The uploader's organisation. */
  @Column({ type: 'uuid', name: 'organization_id' })
  organizationId: string;

  @ManyToOne(() => Organization, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'organization_id' })
  organization: Relation<Organization>;

  @Column({ type: 'uuid', name: 'uploaded_by_id' })
  uploadedById: string;

  @ManyToOne(() => User, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'uploaded_by_id' })
  uploadedBy: Relation<User>;

  @Column({ type: 'enum', enum: ATTACHMENT_KINDS })
  kind: AttachmentKind;

  @Column({ type: 'enum', enum: ATTACHMENT_PURPOSES, default: 'other' })
  purpose: AttachmentPurpose;

  /** Decided from the bytes, never from the name or the browser. */
  @Column({ type: 'varchar', length: 64, name: 'content_type' })
  contentType: string;

  @Column({ type: 'int', unsigned: true, name: 'byte_size' })
  byteSize: number;

  /** Of the stored bytes (after re-encoding, for images). */
  @Column({ type: 'char', length: 64 })
  sha256: string;

  @Index('uq_attachments_storage_key', { unique: true })
  @Column({ type: 'varchar', length: 160, name: 'storage_key' })
  storageKey: string;

  @Column({ type: 'varchar', length: 160, name: 'thumbnail_key', nullable: true })
  thumbnailKey: string | null;

  /** The sender's file name, cleaned for display; never used as a path. */
  @Column({ type: 'varchar', length: 160, name: 'original_name' })
  originalName: string;

  @Column({ type: 'int', unsigned: true, nullable: true })
  width: number | null;

  @Column({ type: 'int', unsigned: true, nullable: true })
  height: number | null;

  /** From the photo's EXIF DateTimeOriginal, kept as data after the EXIF itself is stripped. */
  @Column({ type: 'datetime', precision: 3, name: 'captured_at', nullable: true })
  capturedAt: Date | null;

  @CreatedAtColumn()
  createdAt: Date;

  @DeleteDateColumn({ type: 'datetime', precision: 3, name: 'deleted_at', nullable: true })
  deletedAt: Date | null;
}
