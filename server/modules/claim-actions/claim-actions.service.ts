import { formatCalendarDate } from '../../../shared/dates';
import crypto from 'node:crypto';
import { In, IsNull, type EntityManager } from 'typeorm';
import type { ActionPayload, ClaimActionName, ClaimView } from '../../../shared/claims/stages';
import { ACTIONS, canPerform, needsReason, REFUSAL_STATUS } from '../../../shared/claims/stages';
import type { Role } from '../../../shared/roles';
import { engineContextFrom, engineInputFor } from '../../../shared/claims/engine-input';
import {
  addDays,
  CONVERSATION_DRAFT,
  CONVERSATION_SENT,
  INFO_RESPONSE_DAYS,
  newReturnNumber,
  RETURN_SHIP_DAYS,
  WAITING_ON_BY_STAGE,
} from '../../../shared/claims/workflow';
import {
  DENIAL_CODE_LABELS,
  RESOLUTION_LABELS,
  type BenchResult,
} from '../../../shared/claims/actions.schema';
import { safeEvaluateClaim } from '../../../shared/engine';
import type { Evaluation } from '../../../shared/engine/schema';
import { formatCents, parseCents } from '../../../shared/engine/money';
import type { WaitingOn } from '../../../shared/schemas/claims';
import type { SessionUser } from '../../auth/passport';
import type { AppContext } from '../../context';
import { Attachment } from '../../db/entities/attachment.entity';
import { BenchTest } from '../../db/entities/bench-test.entity';
import { ClaimMessage } from '../../db/entities/claim-message.entity';
import { Claim } from '../../db/entities/claim.entity';
import { Decision } from '../../db/entities/decision.entity';
import { ReturnAuthorization } from '../../db/entities/return-authorization.entity';
import { User } from '../../db/entities/user.entity';
import { WarrantyPolicyVersion } from '../../db/entities/warranty-policy-version.entity';
import { recordAudit, type Actor } from '../../lib/audit';
import { clock } from '../../lib/clock';
import { crashPoint } from '../../lib/crash-point';
import { AppError, conflict } from '../../lib/errors';
import type { OutboxAttachment } from '../../db/entities/outbox-message.entity';
import { enqueueEmail } from '../../lib/outbox';
import { claimRef, enqueueWebhookEvent } from '../../lib/webhooks';
import type { WebhookEvent } from '../../../shared/schemas/webhooks';
import type { Storage } from '../../lib/storage';
import { toAbilityUser } from '../../middleware/auth';
import {
  createDeterminationLetter,
  createPackingSlip,
  loadParties,
  type ClaimParties,
  type LetterDecision,
} from './claim-documents';

// The moves of the stage machine, performed: one conditional UPDATE on the claim's stage and version (two
// reviewers acting at once get one success and one 409), then the move's own rows, its audit row and its
// e-mail, all in one transaction. The stage machine in shared/ decides what is allowed; nothing here widens it.

// The moves an organisation's webhooks can hear of, and the fields of the move's audit row each event carries
// (never a note, a message or a person: the other side sees organisations only).
const WEBHOOK_OF_MOVE: Partial<Record<ClaimActionName, { event: WebhookEvent; fields: string[] }>> = {
  request_info: { event: 'claim.information_requested', fields: ['dueOn'] },
  request_return: { event: 'claim.return_authorised', fields: ['returnNumber'] },
  approve: { event: 'claim.decided', fields: ['outcome', 'resolution', 'amount', 'reasonCodes'] },
  deny: { event: 'claim.decided', fields: ['outcome', 'resolution', 'amount', 'reasonCodes'] },
};

/** Moves that have their own routes elsewhere: filing runs the engine (claims), credits belong to finance. */
export const MOVES_ELSEWHERE: Partial<Record<ClaimActionName, string>> = {
  file: 'POST /api/claims/:id/file',
  credit: 'POST /api/claims/:id/credits',
  void_credit: 'POST /api/credits/:id/void',
};

export const CLAIM_CHANGED_MESSAGE =
  'Someone else moved this claim just now. Reload it to see what changed, then try again.';

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

type Recipient = { email: string; name: string };

async function usersWith(
  m: EntityManager,
  orgId: string,
  roles: Role[],
  only?: string | null,
): Promise<Recipient[]> {
  if (only) {
    const u = await m.findOne(User, { where: { id: only, organizationId: orgId, status: 'active' } });
    if (u) return [{ email: u.email, name: u.name }];
  }
  const all = await m.find(User, {
    where: { organizationId: orgId, status: 'active' },
    order: { createdAt: 'ASC' },
  });
  return all
    .filter((u) => u.roles.some((r) => roles.includes(r)))
    .map((u) => ({ email: u.email, name: u.name }));
}

export function createClaimActionsService(ctx: AppContext & { storage: Storage }) {
  const { ds, storage } = ctx;

  const linkFor = (claim: Claim, side: WaitingOn) =>
    ctx.publicUrl(side === 'manufacturer' ? `/review/${claim.id}` : `/claims/${claim.id}/workflow`);

  async function notify(
    m: EntityManager,
    claim: Claim,
    parties: ClaimParties,
    side: WaitingOn,
    to: Recipient[],
    view: {
      headline: string;
      intro?: string;
      quote?: string;
      /** A detail with `date` is a calendar date, written for the recipient's organisation (shared/dates.ts). */
      details?: ({ label: string; value: string } | { label: string; date: string })[];
      nextStep?: string;
      attachments?: OutboxAttachment[];
    },
  ) {
    if (to.length === 0) return;
    const recipientOrg = side === 'manufacturer' ? parties.manufacturer : parties.contractor;
    const details = view.details?.map((d) =>
      'date' in d ? { label: d.label, value: formatCalendarDate(d.date, recipientOrg, 'long') } : d,
    );
    await enqueueEmail(m, {
      to: to.map((r) => r.email),
      template: 'claim-update',
      view: {
        claimNumber: claim.number ?? 'draft',
        productText: `${parties.product.modelNumber} ${parties.product.name}`,
        siteName: parties.installation.siteName,
        details: [],
        attachmentNote: view.attachments?.length
          ? `Attached: ${view.attachments.map((a) => a.filename).join(', ')}. The same file is on the claim in Lumenproof.`
          : undefined,
        link: linkFor(claim, side),
        ...view,
        ...(details ? { details } : {}),
      },
      attachments: view.attachments,
    });
  }

  async function contractorPeople(m: EntityManager, claim: Claim) {
    return usersWith(m, claim.contractorId, ['installer', 'administrator'], claim.filedById);
  }
  async function reviewers(m: EntityManager, claim: Claim) {
    return usersWith(m, claim.manufacturerId, ['reviewer'], claim.assignedReviewerId);
  }

  /** The conditional move itself: 0 rows means someone else moved the claim since we loaded it. */
  async function moveRow(
    m: EntityManager,
    claim: Claim,
    to: Claim['stage'],
    extra: { waitingOn?: WaitingOn | null; assignedReviewerId?: string | null } = {},
  ) {
    const now = clock.now();
    const stageChangedAt = to === claim.stage ? claim.stageChangedAt : now;
    const waitingOn = extra.waitingOn !== undefined ? extra.waitingOn : WAITING_ON_BY_STAGE[to];
    const assignee =
      extra.assignedReviewerId !== undefined ? extra.assignedReviewerId : claim.assignedReviewerId;
    const result: { affectedRows?: number } = await m.query(
      'UPDATE claims SET stage = ?, version = version + 1, stage_changed_at = ?, waiting_on = ?, assigned_reviewer_id = ?, updated_at = ? ' +
        'WHERE id = ? AND stage = ? AND version = ?',
      [to, stageChangedAt, waitingOn, assignee, now, claim.id, claim.stage, claim.version],
    );
    if (!result.affectedRows) throw conflict('claim.changed', CLAIM_CHANGED_MESSAGE);
    return { stage: to, version: claim.version + 1, waitingOn, stageChangedAt, assignedReviewerId: assignee };
  }

  async function assertReviewer(m: EntityManager, claim: Claim, userId: string, path: string) {
    const u = await m.findOne(User, {
      where: { id: userId, organizationId: claim.manufacturerId, status: 'active' },
    });
    if (!u || !u.roles.includes('reviewer')) {
      throw new AppError(400, 'validation.failed', 'The request body has invalid fields.', [
        { path, message: 'Choose an active reviewer of the manufacturer.' },
      ]);
    }
    return u;
  }

  async function benchEvaluation(
    m: EntityManager,
    claim: Claim,
    readings: ActionPayload<'record_bench_test'>['readings'],
  ) {
    const parties = await loadParties(m, claim);
    const version = claim.policyVersionId
      ? await m.findOneBy(WarrantyPolicyVersion, { id: claim.policyVersionId })
      : null;
    const p = parties.product;
    const i = parties.installation;
    const engineCtx = engineContextFrom(
      {
        ratedInputWatts: p.ratedInputWatts,
        inputVoltsMin: p.inputVoltsMin,
        inputVoltsMax: p.inputVoltsMax,
        ledStrings: p.ledStrings,
        ledsPerString: p.ledsPerString,
        ledForwardVolts: p.ledForwardVolts,
        driverOutputAmps: p.driverOutputAmps,
        driverMaxOutputVolts: p.driverMaxOutputVolts,
        location: p.location,
        enclosedRated: p.enclosedRated,
        dimming: p.dimming,
        ambientMaxC: p.ambientMaxC,
        ratedLifeHours: p.ratedLifeHours,
      },
      version,
      i,
    );
    const files = await m.find(Attachment, { where: { ownerType: 'claim', ownerId: claim.id } });
    const input = engineInputFor(
      engineCtx,
      {
        serials: claim.serials,
        units: claim.units ?? undefined,
        failedOn: claim.failedOn,
        symptoms: claim.symptoms,
        // Replaced by the bench readings below.
        measurements: undefined,
        observations: claim.observations,
        narrative: claim.narrative,
      },
      {
        photos: files.filter((f) => f.kind === 'photo').length,
        proofOfPurchase: files.some((f) => f.purpose === 'proof_of_purchase'),
      },
      claim.filedAt ? claim.filedAt.toISOString().slice(0, 10) : clock.today(),
    ) as { claim: { measurements: unknown } };
    // The bench readings replace the field readings; everything else is judged as at filing.
    input.claim.measurements = readings;
    const result = safeEvaluateClaim(input);
    if (!result.ok) {
      throw new AppError(
        422,
        'claim.bench_unevaluable',
        'The engine could not evaluate these bench readings.',
        result.issues,
      );
    }
    return result.evaluation;
  }

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
    const def = ACTIONS[name];
    const payload = verdict.payload as Record<string, unknown>;

    return ds.transaction(async (m) => {
      const claim = loaded;
      const now = clock.now();
      const parties = await loadParties(m, claim);
      const before = { stage: claim.stage, version: claim.version, waitingOn: claim.waitingOn };
      let after: Record<string, unknown> = {};
      let moved: Awaited<ReturnType<typeof moveRow>>;

      switch (name) {
        case 'start_review': {
          const p = payload as ActionPayload<'start_review'>;
          const assignee = p.assigneeId ?? user.id;
          if (p.assigneeId) await assertReviewer(m, claim, p.assigneeId, 'assigneeId');
          moved = await moveRow(m, claim, 'in_review', { assignedReviewerId: assignee });
          after = { assigneeId: assignee };
          break;
        }
        case 'request_info': {
          const p = payload as ActionPayload<'request_info'>;
          moved = await moveRow(m, claim, 'needs_info');
          const msg = m.create(ClaimMessage, {
            id: crypto.randomUUID(),
            claimId: claim.id,
            kind: 'info_request',
            authorOrgId: user.organizationId,
            authorId: user.id,
            body: p.message,
            dueOn: addDays(clock.today(), INFO_RESPONSE_DAYS),
            answeredAt: null,
          });
          await m.insert(ClaimMessage, msg);
          after = { messageId: msg.id, dueOn: msg.dueOn };
          await notify(m, claim, parties, 'contractor', await contractorPeople(m, claim), {
            headline: `${parties.manufacturer.name} needs more information`,
            intro: `The reviewer asks:`,
            quote: p.message,
            details: [{ label: 'Please answer by', date: msg.dueOn! }],
            nextStep:
              'Answer on the claim, with photos or documents if they help. The claim returns to review when you do.',
          });
          break;
        }
        case 'answer_info': {
          const p = payload as ActionPayload<'answer_info'>;
          moved = await moveRow(m, claim, 'in_review');
          const open = await m.findOne(ClaimMessage, {
            where: { claimId: claim.id, kind: 'info_request', answeredAt: IsNull() },
            order: { createdAt: 'DESC' },
          });
          if (open) await m.update(ClaimMessage, { id: open.id }, { answeredAt: now });
          const msg = m.create(ClaimMessage, {
            id: crypto.randomUUID(),
            claimId: claim.id,
            kind: 'info_answer',
            authorOrgId: user.organizationId,
            authorId: user.id,
            body: p.message,
            dueOn: null,
            answeredAt: null,
          });
          await m.insert(ClaimMessage, msg);
          const ids = [...new Set(p.attachmentIds ?? [])];
          if (ids.length) {
            // Only the sender's own files, uploaded for this claim's thread and not yet sent with an answer.
            const files = await m.find(Attachment, {
              where: {
                id: In(ids),
                ownerType: CONVERSATION_DRAFT,
                ownerId: claim.id,
                organizationId: user.organizationId,
              },
            });
            if (files.length !== ids.length) {
              throw new AppError(400, 'validation.failed', 'The request body has invalid fields.', [
                {
                  path: 'attachmentIds',
                  message: 'Attach only files you uploaded to this claim’s conversation.',
                },
              ]);
            }
            await m.update(Attachment, { id: In(ids) }, { ownerType: CONVERSATION_SENT, ownerId: msg.id });
          }
          after = { messageId: msg.id, attachments: ids.length, answers: open?.id ?? null };
          await notify(m, claim, parties, 'manufacturer', await reviewers(m, claim), {
            headline: `${parties.contractor.name} answered your question`,
            quote: p.message,
            details: ids.length ? [{ label: 'Files attached', value: String(ids.length) }] : [],
            nextStep: 'The claim is back in review.',
          });
          break;
        }
        case 'request_return': {
          const p = payload as ActionPayload<'request_return'>;
          moved = await moveRow(m, claim, 'return_requested');
          let number = newReturnNumber(now, (n) => crypto.randomInt(n));
          while (await m.exists(ReturnAuthorization, { where: { number } })) {
            number = newReturnNumber(now, (n) => crypto.randomInt(n));
          }
          const ra = m.create(ReturnAuthorization, {
            id: crypto.randomUUID(),
            number,
            claimId: claim.id,
            shipTo: p.shipTo,
            instructions: p.instructions ?? null,
            shipBy: addDays(clock.today(), RETURN_SHIP_DAYS),
            requestedById: user.id,
          });
          const slip = await createPackingSlip(m, storage, claim, parties, ra, now);
          ra.packingSlipId = slip.id;
          await m.insert(ReturnAuthorization, ra);
          after = { returnNumber: number, packingSlipSha256: slip.sha256 };
          await notify(m, claim, parties, 'contractor', await contractorPeople(m, claim), {
            headline: `${parties.manufacturer.name} asks for the unit back`,
            intro: `Return authorisation ${number}: print the packing slip, put it in the box, and ship the unit to the address below.`,
            quote: p.instructions,
            details: [
              { label: 'Return number', value: number },
              {
                label: 'Ship to',
                value: [
                  p.shipTo.name,
                  p.shipTo.line1,
                  p.shipTo.city,
                  p.shipTo.postalCode,
                  p.shipTo.country,
                ].join(', '),
              },
              { label: 'Ship by', date: ra.shipBy },
            ],
            nextStep: 'Record the carrier and tracking number on the claim once the box is on its way.',
            attachments: [
              { filename: slip.filename, contentType: 'application/pdf', storageKey: slip.storageKey },
            ],
          });
          break;
        }
        case 'record_shipment': {
          const p = payload as ActionPayload<'record_shipment'>;
          const ra = await m.findOne(ReturnAuthorization, {
            where: { claimId: claim.id, receivedOn: IsNull() },
            order: { createdAt: 'DESC' },
          });
          if (!ra)
            throw conflict(
              'claim.invalid_transition',
              'There is no open return authorisation on this claim.',
            );
          moved = await moveRow(m, claim, 'return_requested', { waitingOn: 'manufacturer' });
          await m.update(
            ReturnAuthorization,
            { id: ra.id },
            { carrier: p.carrier, trackingNumber: p.trackingNumber, shippedOn: p.shippedOn },
          );
          after = {
            returnNumber: ra.number,
            carrier: p.carrier,
            trackingNumber: p.trackingNumber,
            shippedOn: p.shippedOn,
          };
          await notify(m, claim, parties, 'manufacturer', await reviewers(m, claim), {
            headline: `The unit is on its way (${ra.number})`,
            details: [
              { label: 'Carrier', value: p.carrier },
              { label: 'Tracking number', value: p.trackingNumber },
              { label: 'Shipped', date: p.shippedOn },
            ],
            nextStep: 'Mark the unit received when it arrives.',
          });
          break;
        }
        case 'receive_unit': {
          const p = payload as ActionPayload<'receive_unit'>;
          const ra = await m.findOne(ReturnAuthorization, {
            where: { claimId: claim.id, receivedOn: IsNull() },
            order: { createdAt: 'DESC' },
          });
          if (!ra)
            throw conflict(
              'claim.invalid_transition',
              'There is no open return authorisation on this claim.',
            );
          moved = await moveRow(m, claim, 'unit_received');
          await m.update(
            ReturnAuthorization,
            { id: ra.id },
            { receivedOn: p.receivedOn, receivedCondition: p.condition, receivedNote: p.note ?? null },
          );
          after = { returnNumber: ra.number, receivedOn: p.receivedOn, condition: p.condition };
          await notify(m, claim, parties, 'contractor', await contractorPeople(m, claim), {
            headline: `${parties.manufacturer.name} received the returned unit`,
            details: [
              { label: 'Return number', value: ra.number },
              { label: 'Received', date: p.receivedOn },
            ],
            nextStep: 'The manufacturer tests the unit and then decides. Nothing is needed from you now.',
          });
          break;
        }
        case 'record_bench_test': {
          const p = payload as ActionPayload<'record_bench_test'>;
          const evaluationNow = await benchEvaluation(m, claim, p.readings);
          moved = await moveRow(m, claim, verdict.to);
          const ra = await m.findOne(ReturnAuthorization, {
            where: { claimId: claim.id },
            order: { createdAt: 'DESC' },
          });
          const test = m.create(BenchTest, {
            id: crypto.randomUUID(),
            claimId: claim.id,
            returnAuthorizationId: ra?.id ?? null,
            testedOn: p.testedOn,
            result: p.result,
            readings: p.readings,
            evaluation: evaluationNow,
            engineVersion: evaluationNow.engineVersion,
            note: p.note ?? null,
            testedById: user.id,
          });
          await m.insert(BenchTest, test);
          after = {
            benchTestId: test.id,
            result: p.result,
            verdict: evaluationNow.verdict,
            filingVerdict: claim.verdict,
          };
          break;
        }
        case 'approve':
        case 'deny': {
          const decision = await decide(m, claim, user, name, payload, evaluation, parties);
          moved = decision.moved;
          after = decision.audit;
          break;
        }
        case 'reopen': {
          const p = payload as ActionPayload<'reopen'>;
          moved = await moveRow(m, claim, 'in_review');
          await m.update(Decision, { currentClaimId: claim.id }, { currentClaimId: null, supersededAt: now });
          after = { reason: p.reason };
          await notify(m, claim, parties, 'contractor', await contractorPeople(m, claim), {
            headline: `${parties.manufacturer.name} reopened its decision`,
            quote: p.reason,
            nextStep: 'The claim is back in review; a new decision and letter will follow.',
          });
          break;
        }
        case 'close': {
          const p = payload as ActionPayload<'close'>;
          moved = await moveRow(m, claim, 'closed');
          after = { note: p.note ?? null };
          break;
        }
        case 'withdraw': {
          const p = payload as ActionPayload<'withdraw'>;
          moved = await moveRow(m, claim, 'withdrawn');
          after = { reason: p.reason ?? null };
          // A draft was never shown to the manufacturer: nobody there to tell.
          if (claim.stage !== 'draft') {
            await notify(m, claim, parties, 'manufacturer', await reviewers(m, claim), {
              headline: `${parties.contractor.name} withdrew the claim`,
              quote: p.reason,
              nextStep: 'Nothing: the claim is closed.',
            });
          }
          break;
        }
        default:
          throw new AppError(409, 'claim.move_elsewhere', 'This move has its own route.');
      }
      await crashPoint('claim.move.after_update', m);

      await recordAudit(m, actor, {
        action: def.audit,
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

  async function decide(
    m: EntityManager,
    claim: Claim,
    user: SessionUser,
    name: 'approve' | 'deny',
    payload: Record<string, unknown>,
    evaluation: Evaluation | null,
    parties: ClaimParties,
  ) {
    const now = clock.now();
    const againstEngine = needsReason(evaluation?.verdict ?? null, name);
    let letterDecision: LetterDecision;
    let row: Partial<Decision>;
    if (name === 'approve') {
      const p = payload as ActionPayload<'approve'>;
      const units = claim.units ?? (claim.serials.length || 1);
      if (p.approvedUnits !== undefined && p.approvedUnits > units) {
        throw new AppError(400, 'claim.invalid_payload', 'Some of the details need another look.', [
          {
            path: 'approvedUnits',
            message: `The claim names ${units} units; at most ${units} can be approved.`,
          },
        ]);
      }
      const partly = p.approvedUnits !== undefined && p.approvedUnits < units;
      const currency = evaluation?.computed.currency ?? claim.currency ?? 'USD';
      const amount = formatCents(parseCents(p.amount));
      letterDecision = {
        outcome: partly ? 'partly_approved' : 'approved',
        resolution: p.resolution,
        amount,
        currency,
        approvedUnits: p.approvedUnits,
        note: p.note,
        overrideReason: p.overrideReason,
      };
      row = {
        outcome: letterDecision.outcome,
        resolution: p.resolution,
        amount,
        currency,
        approvedUnits: p.approvedUnits ?? null,
        reasonCodes: [],
        note: p.note ?? null,
      };
    } else {
      const p = payload as ActionPayload<'deny'>;
      letterDecision = {
        outcome: 'denied',
        reasonCodes: p.reasonCodes,
        note: p.note,
        overrideReason: p.overrideReason,
      };
      row = {
        outcome: 'denied',
        resolution: null,
        amount: null,
        currency: null,
        approvedUnits: null,
        reasonCodes: p.reasonCodes,
        note: p.note,
      };
    }
    const moved = await moveRow(m, claim, name === 'approve' ? 'approved' : 'denied');
    const letter = await createDeterminationLetter(
      m,
      storage,
      claim,
      parties,
      evaluation,
      letterDecision,
      user.name,
      now,
    );
    const decision = m.create(Decision, {
      id: crypto.randomUUID(),
      claimId: claim.id,
      currentClaimId: claim.id,
      ...row,
      engineAmount: evaluation?.computed.credit ?? null,
      overrideReason: (payload.overrideReason as string | undefined) ?? null,
      againstEngine,
      decidedById: user.id,
      decidedAt: now,
      supersededAt: null,
      letterId: letter.id,
    });
    await m.insert(Decision, decision);
    await crashPoint('claim.move.after_decision', m);

    const letterFile: OutboxAttachment = {
      filename: letter.filename,
      contentType: 'application/pdf',
      storageKey: letter.storageKey,
    };
    if (letterDecision.outcome === 'denied') {
      await notify(m, claim, parties, 'contractor', await contractorPeople(m, claim), {
        headline: `${parties.manufacturer.name} denied the claim`,
        intro: 'The determination letter, attached, gives the reasons and the screening behind them.',
        details: letterDecision.reasonCodes.map((c) => ({ label: 'Reason', value: DENIAL_CODE_LABELS[c] })),
        quote: letterDecision.note,
        nextStep: 'If you have new evidence, reply on the claim: the reviewer can reopen the decision.',
        attachments: [letterFile],
      });
    } else {
      const details = [
        { label: 'Resolution', value: RESOLUTION_LABELS[letterDecision.resolution] },
        { label: 'Amount', value: `${letterDecision.amount} ${letterDecision.currency}` },
      ];
      await notify(m, claim, parties, 'contractor', await contractorPeople(m, claim), {
        headline: `${parties.manufacturer.name} ${letterDecision.outcome === 'partly_approved' ? 'partly approved' : 'approved'} the claim`,
        intro: 'The determination letter is attached.',
        details,
        nextStep:
          letterDecision.resolution === 'repair_allowance'
            ? 'A field-repair allowance: field modifications can void the fixture’s listing; follow local codes and use licensed, qualified electricians. The credit memo follows from the manufacturer’s accounts team.'
            : 'The credit memo follows from the manufacturer’s accounts team.',
        attachments: [letterFile],
      });
      await notify(
        m,
        claim,
        parties,
        'manufacturer',
        await usersWith(m, claim.manufacturerId, ['accountant']),
        {
          headline: 'Approved and ready for a credit memo',
          details: [...details, { label: 'Contractor', value: parties.contractor.name }],
          nextStep: 'Issue the credit memo in Lumenproof.',
        },
      );
    }
    await crashPoint('claim.move.after_outbox', m);
    return {
      moved,
      audit: {
        decisionId: decision.id,
        outcome: decision.outcome,
        resolution: decision.resolution,
        amount: decision.amount,
        engineAmount: decision.engineAmount,
        reasonCodes: decision.reasonCodes,
        againstEngine,
        overrideReason: decision.overrideReason,
        letterSha256: letter.sha256,
      },
    };
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
        await notify(
          m,
          claim,
          parties,
          'manufacturer',
          await usersWith(m, claim.manufacturerId, ['reviewer'], assigneeId),
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
