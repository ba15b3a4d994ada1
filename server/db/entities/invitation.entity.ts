import { Column, Entity, Index } from 'typeorm';
import { SingleUseToken } from './single-use-token';

// A one-time sign-up link: a single-use token, and the administrator who sent it.
@Entity({ name: 'invitations' })
@Index('uq_invitations_token_hash', ['tokenHash'], { unique: true })
export class Invitation extends SingleUseToken {
  @Column({ type: 'uuid', name: 'created_by_id' })
  createdById: string;
}
