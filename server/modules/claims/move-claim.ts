import type { EntityManager, QueryDeepPartialEntity } from 'typeorm';
import type { Stage } from '../../../shared/claims/stages';
import { WAITING_ON_BY_STAGE } from '../../../shared/claims/workflow';
import type { WaitingOn } from '../../../shared/schemas/claims';
import { Claim } from '../../db/entities/claim.entity';
import { clock } from '../../lib/clock';
import { conflict } from '../../lib/errors';

export const CLAIM_CHANGED_MESSAGE =
  'Someone else moved this claim just now. Reload it to see what changed, then try again.';

/** What a move reads of the claim as its caller loaded it. */
export type MovingClaim = Pick<Claim, 'id' | 'stage' | 'version' | 'stageChangedAt' | 'assignedReviewerId'>;

/** The claim's stage columns after the move. */
export type Moved = {
  stage: Stage;
  version: number;
  waitingOn: WaitingOn | null;
  stageChangedAt: Date;
  assignedReviewerId: string | null;
};

/**
 * The one way to move a claim: a conditional UPDATE on the stage and version the caller loaded, so two people
 * acting at once get one success and one 409 `claim.changed` (0 rows). It bumps the version, stamps the stage
 * change (not when the stage stays), sets whom the claim waits on (the stage's default, shared/claims/workflow.ts,
 * unless given) and writes the move's own columns (`set`), all in the caller's transaction.
 */
export async function moveClaim(
  m: EntityManager,
  claim: MovingClaim,
  to: Stage,
  opts: {
    waitingOn?: WaitingOn | null;
    assignedReviewerId?: string | null;
    /** The move's own columns (filing's number and evaluation, say). */
    set?: QueryDeepPartialEntity<Claim>;
    now?: Date;
    /** The 409's message, where the move has a better word for it. */
    changedMessage?: string;
  } = {},
): Promise<Moved> {
  const now = opts.now ?? clock.now();
  const moved: Moved = {
    stage: to,
    version: claim.version + 1,
    stageChangedAt: to === claim.stage ? claim.stageChangedAt : now,
    waitingOn: opts.waitingOn !== undefined ? opts.waitingOn : WAITING_ON_BY_STAGE[to],
    assignedReviewerId:
      opts.assignedReviewerId !== undefined ? opts.assignedReviewerId : claim.assignedReviewerId,
  };
  const result = await m
    .createQueryBuilder()
    .update(Claim)
    .set({
      ...opts.set,
      stage: moved.stage,
      stageChangedAt: moved.stageChangedAt,
      waitingOn: moved.waitingOn,
      assignedReviewerId: moved.assignedReviewerId,
      updatedAt: now,
      version: () => 'version + 1',
    })
    .where('id = :id AND stage = :stage AND version = :version', {
      id: claim.id,
      stage: claim.stage,
      version: claim.version,
    })
    .execute();
  if (result.affected !== 1) throw conflict('claim.changed', opts.changedMessage ?? CLAIM_CHANGED_MESSAGE);
  return moved;
}
