import type { EntityManager } from 'typeorm';
import type { BenchResult } from '../../../shared/claims/actions.schema';
import {
  ACTIONS,
  canPerform,
  REFUSAL_STATUS,
  type ClaimActionName,
  type ClaimView,
} from '../../../shared/claims/stages';
import type { Evaluation } from '../../../shared/engine/schema';
import type { WebhookEvent } from '../../../shared/schemas/webhooks';
import type { SessionUser } from '../../auth/passport';
import type { AppContext } from '../../context';
import { BenchTest } from '../../db/entities/bench-test.entity';
import { Claim } from '../../db/entities/claim.entity';
import { recordAudit, type Actor } from '../../lib/audit';
import { clock } from '../../lib/clock';
import { crashPoint } from '../../lib/crash-point';
import { AppError, conflict } from '../../lib/errors';
import type { Storage } from '../../lib/storage';
import { claimRef, enqueueWebhookEvent } from '../../lib/webhooks';
import { toAbilityUser } from '../../middleware/auth';
import { CLAIM_CHANGED_MESSAGE } from '../claims/move-claim';
import { recipientsOf } from '../claims/recipients';
import { assertReviewer } from './assert-reviewer';
import { loadParties } from './claim-documents';
import { MOVES, MOVES_ELSEWHERE as ELSEWHERE } from './moves';
import type { HandledMove, MoveContext, MoveHandler } from './moves/types';
import { notifyClaim } from './notify';

// The moves of the stage machine, performed: one pipeline here loads what every move needs, checks the stage
// machine (shared/claims/stages.ts, which decides what is allowed; nothing here widens it) and the version, then
// in one transaction runs the move's handler (moves/<move>.ts: its conditional UPDATE through moveClaim, its own
// rows and its e-mails), its audit row and its webhook event.

// The moves an organisation's webhooks can hear of, and the fields of the move's audit row each event carries
// (never a note, a message or a person: the other side sees organisations only).
const WEBHOOK_OF_MOVE: Partial<Record<ClaimActionName, { event: WebhookEvent; fields: string[] }>> = {
  request_info: { event: 'claim.information_requested', fields: ['dueOn'] },
  request_return: { event: 'claim.return_authorised', fields: ['returnNumber'] },
  approve: { event: 'claim.decided', fields: ['outcome', 'resolution', 'amount', 'reasonCodes'] },
  deny: { event: 'claim.decided', fields: ['outcome', 'resolution', 'amount', 'reasonCodes'] },
};

/** Moves that have their own routes elsewhere, by action name (moves/index.ts). */
export const MOVES_ELSEWHERE: Partial<Record<ClaimActionName, string>> = ELSEWHERE;

/**
 * The engine's latest word on a claim (the newest bench test's evaluation, else the one made at filing) and what
 * the newest bench test found.
 */
export async function latestEvaluation(
  m: EntityManager,
  claim: Claim,
): Promise<{ evaluation: Evaluation | null; benchResult: BenchResult | null }> {
  const bench = await m.findOne(BenchTest, { where: { claimId: claim.id }, order: { testedAt: 'DESC' } });
  return {
    evaluation: bench?.evaluation ?? claim.evaluation ?? null,
    benchResult: (bench?.result as BenchResult | undefined) ?? null,
  };
}

export function claimView(
  claim: Claim,
  evaluation: Evaluation | null,
  benchResult: BenchResult | null = null,
): ClaimView {
  return {
    stage: claim.stage,
    contractorId: claim.contractorId,
    manufacturerId: claim.manufacturerId,
    benchResult,
    evaluation: evaluation ? { verdict: evaluation.verdict, computed: evaluation.computed } : null,
  };
}

type MoveResult = { claim: Claim; to: string };

export function createClaimActionsService(ctx: AppContext & { storage: Storage }) {
  const { ds, storage } = ctx;

  /**
   * Performs one move. The caller has loaded the claim and checked the user may read it; this checks the stage
   * machine (with the payload), then moves.
   */
  async function perform(
    loaded: Claim,
    user: SessionUser,
    action: string,
    body: unknown,
    actor: Actor,
    expectedVersion?: number,
  ): Promise<MoveResult> {
    const { evaluation, benchResult } = await latestEvaluation(ds.manager, loaded);
    const verdict = canPerform(
      claimView(loaded, evaluation, benchResult),
      toAbilityUser(user),
      action,
      body ?? {},
    );
    if (!verdict.ok) {
      throw new AppError(REFUSAL_STATUS[verdict.code], verdict.code, verdict.message, verdict.details);
    }
    const name = action as ClaimActionName;
    const elsewhere = MOVES_ELSEWHERE[name];
    if (elsewhere) {
      throw new AppError(409, 'claim.move_elsewhere', `This move has its own route: ${elsewhere}.`);
    }
    if (expectedVersion !== undefined && expectedVersion !== loaded.version) {
      throw conflict('claim.changed', CLAIM_CHANGED_MESSAGE);
    }
    const handler = MOVES[name as HandledMove] as MoveHandler<HandledMove> | undefined;
    if (!handler) throw new AppError(409, 'claim.move_elsewhere', 'This move has its own route.');

    return ds.transaction(async (m) => {
      const claim = loaded;
      const now = clock.now();
      const parties = await loadParties(m, claim);
      const before = { stage: claim.stage, version: claim.version, waitingOn: claim.waitingOn };
      const move: MoveContext<HandledMove> = {
        m,
        claim,
        user,
        now,
        today: now.toISOString().slice(0, 10),
        parties,
        payload: verdict.payload as MoveContext<HandledMove>['payload'],
        to: verdict.to,
        evaluation,
        storage,
        tell: async (side, view, audience) =>
          notifyClaim(
            m,
            ctx.publicUrl,
            claim,
            parties,
            side,
            await recipientsOf(m, claim, audience ?? (side === 'contractor' ? 'contractor' : 'reviewer')),
            view,
          ),
      };
      const { moved, after } = await handler(move);
      await crashPoint('claim.move.after_update', m);

      await recordAudit(m, actor, {
        action: ACTIONS[name].audit,
        entityType: 'Claim',
        entityId: claim.id,
        organizationId: user.organizationId,
        before,
        after: { stage: moved.stage, version: moved.version, waitingOn: moved.waitingOn, ...after },
      });
      const hook = WEBHOOK_OF_MOVE[name];
      if (hook) {
        await enqueueWebhookEvent(m, {
          event: hook.event,
          organizationIds: [claim.contractorId, claim.manufacturerId],
          data: {
            claim: claimRef(claim, moved.stage, parties),
            ...Object.fromEntries(hook.fields.filter((f) => f in after).map((f) => [f, after[f]])),
          },
        });
      }
      await crashPoint('claim.move.before_commit', m);
      const fresh = await m.findOneByOrFail(Claim, { id: claim.id });
      return { claim: fresh, to: moved.stage };
    });
  }

  /** Takes a claim or hands it to another reviewer, or back to the queue; not a stage move, still versioned. */
  async function assign(
    claim: Claim,
    user: SessionUser,
    assigneeId: string | null,
    actor: Actor,
    expectedVersion?: number,
  ) {
    if (expectedVersion !== undefined && expectedVersion !== claim.version)
      throw conflict('claim.changed', CLAIM_CHANGED_MESSAGE);
    if (claim.stage === 'draft' || claim.stage === 'closed' || claim.stage === 'withdrawn') {
      throw conflict(
        'claim.invalid_transition',
        'Only a claim that is still open for review can be assigned.',
      );
    }
    return ds.transaction(async (m) => {
      if (assigneeId) await assertReviewer(m, claim, assigneeId, 'assigneeId');
      const result: { affectedRows?: number } = await m.query(
        'UPDATE claims SET assigned_reviewer_id = ?, version = version + 1, updated_at = ? WHERE id = ? AND version = ?',
        [assigneeId, clock.now(), claim.id, claim.version],
      );
      if (!result.affectedRows) throw conflict('claim.changed', CLAIM_CHANGED_MESSAGE);
      await recordAudit(m, actor, {
        action: 'claim.assigned',
        entityType: 'Claim',
        entityId: claim.id,
        organizationId: user.organizationId,
        before: { assigneeId: claim.assignedReviewerId },
        after: { assigneeId },
      });
      if (assigneeId && assigneeId !== user.id) {
        const parties = await loadParties(m, claim);
        await notifyClaim(
          m,
          ctx.publicUrl,
          claim,
          parties,
          'manufacturer',
          await recipientsOf(m, claim, { reviewer: assigneeId }),
          {
            headline: `${user.name} handed you a claim`,
            nextStep: 'Open it from your review desk.',
          },
        );
      }
      return m.findOneByOrFail(Claim, { id: claim.id });
    });
  }

  return { perform, assign };
}

export type ClaimActionsService = ReturnType<typeof createClaimActionsService>;
