import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import { CreatedAtColumn } from './columns';
import { Claim } from './claim.entity';

export const CLAIM_MESSAGE_KINDS = ['info_request', 'info_answer', 'note'] as const;
export type ClaimMessageKind = (typeof CLAIM_MESSAGE_KINDS)[number];

// The thread between the two parties of a claim: the manufacturer's questions and the installer's answers.
// Files of an answer are attachments whose owner is the message (owner_type 'claim_message').
@Entity({ name: 'claim_messages' })
@Index('ix_claim_messages_claim', ['claimId', 'createdAt'])
export class ClaimMessage {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'uuid', name: 'claim_id' })
  claimId: string;

  @ManyToOne(() => Claim, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'claim_id' })
  claim: Relation<Claim>;

  @Column({ type: 'enum', enum: CLAIM_MESSAGE_KINDS })
  kind: ClaimMessageKind;

  @Column({ type: 'uuid', name: 'author_org_id' })
  authorOrgId: string;

  @Column({ type: 'uuid', name: 'author_id', nullable: true })
  authorId: string | null;

  @Column({ type: 'text' })
  body: string;

  /** For a request: the date the answer is due. */
  @Column({ type: 'date', name: 'due_on', nullable: true })
  dueOn: string | null;

  /** For a request: when it was answered (by the next answer in the thread). */
  @Column({ type: 'datetime', precision: 3, name: 'answered_at', nullable: true })
  answeredAt: Date | null;

  @CreatedAtColumn()
  createdAt: Date;
}
