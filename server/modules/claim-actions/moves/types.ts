import type { EntityManager } from 'typeorm';
import type { ActionPayload, ClaimActionName, Stage } from '../../../../shared/claims/stages';
import type { Evaluation } from '../../../../shared/engine/schema';
import type { WaitingOn } from '../../../../shared/schemas/claims';
import type { SessionUser } from '../../../auth/passport';
import type { Claim } from '../../../db/entities/claim.entity';
import type { Storage } from '../../../lib/storage';
import type { Moved } from '../../claims/move-claim';
import type { Audience } from '../../claims/recipients';
import type { ClaimParties } from '../claim-documents';
import type { ClaimUpdateView } from '../notify';

/** Moves with their own routes: filing runs the engine (claims), credits belong to finance. */
export type MoveElsewhere = 'file' | 'credit' | 'void_credit';

/** The stage machine's moves performed by POST /api/claims/:id/actions/:action, one handler each. */
export type HandledMove = Exclude<ClaimActionName, MoveElsewhere>;

/** What the pipeline (claim-actions.service.ts) hands a move, inside its transaction. */
export type MoveContext<K extends HandledMove> = {
  m: EntityManager;
  /** The claim as loaded and checked; the handler moves it with moveClaim (server/modules/claims/move-claim.ts). */
  claim: Claim;
  user: SessionUser;
  /** The move's instant, and its calendar day (UTC). */
  now: Date;
  today: string;
  parties: ClaimParties;
  /** The payload as the stage machine's schema parsed it. */
  payload: ActionPayload<K>;
  /** The stage the stage machine chose (the payload may choose among several). */
  to: Stage;
  /** The engine's latest word on the claim (the newest bench test's, else filing's). */
  evaluation: Evaluation | null;
  storage: Storage;
  /**
   * E-mails one side of the claim (the claim-update template). The audience defaults to the side's people on
   * the claim: the contractor's filer (else its installers and administrators), the manufacturer's reviewer.
   */
  tell: (side: WaitingOn, view: ClaimUpdateView, audience?: Audience) => Promise<void>;
};

/** The move's result: the claim's new stage columns and what the audit row records of the move. */
export type MoveOutcome = { moved: Moved; after: Record<string, unknown> };

export type MoveHandler<K extends HandledMove> = (c: MoveContext<K>) => Promise<MoveOutcome>;
