import { formatCalendarDate } from '../../../shared/dates';
import { type EntityManager } from 'typeorm';
import { newClaimNumber } from '../../../shared/claims/claim-number';
import type { ClaimEvidence } from '../../../shared/claims/engine-input';
import { safeEvaluateClaim, type Evaluation } from '../../../shared/engine';
import { claimFieldsSchema, filingIssues, type FilingIssue } from '../../../shared/schemas/claims';
import { canPerform, REFUSAL_STATUS, type Refusal } from '../../../shared/claims/stages';
import type { SessionUser } from '../../auth/passport';
import { toAbilityUser } from '../../middleware/auth';
import type { AppDataSource } from '../../db/data-source';
import { Attachment } from '../../db/entities/attachment.entity';
import { Claim } from '../../db/entities/claim.entity';
import { type Organization } from '../../db/entities/organization.entity';
import { recordAudit, type Actor } from '../../lib/audit';
import { clock } from '../../lib/clock';
import { crashPoint } from '../../lib/crash-point';
import { AppError, conflict } from '../../lib/errors';
import { runIdempotent } from '../../lib/idempotency';
import { enqueueEmail } from '../../lib/outbox';
import { claimRef, enqueueWebhookEvent } from '../../lib/webhooks';
import { claimFieldsOf, engineInputOfClaim } from './engine-input';
import { type ClaimReads, type LoadedClaim } from './claims-reads.service';
import { moveClaim } from './move-claim';
import { recipientsOf } from './recipients';

export const FILE_ROUTE = 'POST /claims/:id/file';

function refuse(r: Refusal): never {
  throw new AppError(REFUSAL_STATUS[r.code], r.code, r.message, r.details);
}

/** The evidence the engine counts. Attachments plug in here (photos and proof of purchase on the claim). */
export type EvidenceCounter = (m: EntityManager, claimId: string) => Promise<ClaimEvidence>;
/** Photos and proof of purchase on the claim, as the engine counts evidence (removed files do not count). */
export const claimEvidence: EvidenceCounter = async (m, claimId) => {
  const rows = await m.find(Attachment, {
    where: { ownerType: 'claim', ownerId: claimId },
    select: { id: true, kind: true, purpose: true },
  });
  return {
    photos: rows.filter((a) => a.kind === 'photo').length,
    proofOfPurchase: rows.some((a) => a.purpose === 'proof_of_purchase'),
  };
};

function isDuplicate(err: unknown, index: string) {
  const e = err as { code?: string; driverError?: { code?: string }; message?: string };
  return (
    (e.code === 'ER_DUP_ENTRY' || e.driverError?.code === 'ER_DUP_ENTRY') && String(e.message).includes(index)
  );
}

export function filingContextOf(c: LoadedClaim) {
  return {
    installDate: c.installation.installDate,
    quantity: c.installation.quantity,
    serials: c.installation.units.map((u) => u.serial),
    today: clock.today(),
    hasPolicy: c.policyVersion !== null,
    ledStrings: c.productModel.ledStrings,
    ledsPerString: c.productModel.ledsPerString,
  };
}

export function currentFilingIssues(c: LoadedClaim): FilingIssue[] {
  return filingIssues(claimFieldsOf(c), filingContextOf(c));
}

/** Filing a draft. */
export function createClaimFiling(
  ds: AppDataSource,
  reads: ClaimReads,
  opts: { publicUrl: (path: string) => string; evidence?: EvidenceCounter },
) {
  const { findById } = reads;
  const countEvidence = opts.evidence ?? claimEvidence;

  const loadWith = (m: EntityManager, id: string, lock = false) => {
    const qb = m.createQueryBuilder(Claim, 'c').where('c.id = :id', { id });
    if (lock) return qb.setLock('pessimistic_write').getOne();
    return qb.getOne();
  };

  /** Evaluates a claim now, as it stands: the same input the form's live view builds. */
  async function evaluate(m: EntityManager, c: LoadedClaim, filedOn: string) {
    const evidence = await countEvidence(m, c.id);
    const result = safeEvaluateClaim(engineInputOfClaim(c, evidence, filedOn));
    if (!result.ok) {
      throw new AppError(
        422,
        'claim.incomplete',
        'The claim cannot be evaluated yet: some fields are missing or do not fit the product.',
        result.issues.map((i) => ({ path: i.path.replace(/^claim\./, ''), message: i.message })),
      );
    }
    return result.evaluation;
  }

  /** Filing's work, inside the caller's transaction (see file below). */
  async function fileIn(
    m: EntityManager,
    claimId: string,
    user: SessionUser,
    actor: Actor,
    when: { version?: number },
  ): Promise<{ id: string; replayed: boolean }> {
    // The row lock makes a second, simultaneous request wait here and then see the claim filed.
    const locked = await loadWith(m, claimId, true);
    if (!locked) throw new AppError(404, 'not_found', 'That claim does not exist or is not shared with you.');
    const move = canPerform(locked, toAbilityUser(user), 'file');
    if (!move.ok) {
      // Already filed (and anywhere past it): the same claim again, so a retry or a double tap files once.
      if (move.code === 'claim.invalid_transition' && locked.stage !== 'withdrawn')
        return { id: claimId, replayed: true };
      refuse(move);
    }
    if (when.version !== undefined && when.version !== locked.version) {
      throw conflict(
        'claim.changed',
        'This draft was changed elsewhere since you opened it. Reload, check it and file again.',
      );
    }
    const c = (await findById(claimId, m))!;
    const stored = claimFieldsSchema.safeParse(claimFieldsOf(c));
    const issues = stored.success
      ? currentFilingIssues(c)
      : stored.error.issues.map((i) => ({ path: i.path.map(String).join('.'), message: i.message }));
    if (issues.length) {
      throw new AppError(
        422,
        'claim.incomplete',
        'The claim is not ready to file: fill in the fields listed.',
        issues,
      );
    }
    const now = clock.now();
    const evaluation: Evaluation = await evaluate(m, c, now.toISOString().slice(0, 10));
    await crashPoint('claim.file.after_evaluation', m);
    let number = '';
    for (let attempt = 0; ; attempt++) {
      number = newClaimNumber(now);
      try {
        await moveClaim(m, c, 'filed', {
          now,
          set: {
            number,
            units: c.units ?? c.serials.length,
            evaluation,
            engineVersion: evaluation.engineVersion,
            evaluatedAt: now,
            verdict: evaluation.verdict,
            expectedCredit: evaluation.computed.credit,
            currency: evaluation.computed.currency,
            filedAt: now,
            filedById: user.id,
          },
        });
        break;
      } catch (err) {
        // A number already taken (about one in 20 million a month): draw again. InnoDB undoes only the statement.
        if (attempt < 5 && isDuplicate(err, 'uq_claims_number')) continue;
        throw err;
      }
    }
    await crashPoint('claim.file.after_update', m);
    await recordAudit(m, actor, {
      action: 'claim.filed',
      entityType: 'Claim',
      entityId: claimId,
      before: { stage: 'draft' },
      after: {
        stage: 'filed',
        number,
        verdict: evaluation.verdict,
        engineVersion: evaluation.engineVersion,
        expectedCredit: evaluation.computed.credit,
      },
    });
    await crashPoint('claim.file.after_audit', m);
    await enqueueWebhookEvent(m, {
      event: 'claim.filed',
      organizationIds: [c.contractorId, c.manufacturerId],
      data: {
        claim: claimRef({ ...c, id: claimId, number }, 'filed', c),
        verdict: evaluation.verdict,
        expectedCredit: evaluation.computed.credit,
        currency: evaluation.computed.currency,
      },
    });
    const view = {
      number,
      site: c.installation.siteName,
      city: c.installation.siteCity,
      contractor: c.contractor.name,
      manufacturer: c.manufacturer.name,
      model: `${c.productModel.modelNumber} ${c.productModel.name}`,
      units: c.units ?? c.serials.length,
      serials: c.serials.join(', ') || 'not given',
      failedOn: c.failedOn,
      verdictText: { covered: 'likely covered', review: 'needs a reviewer', excluded: 'likely excluded' }[
        evaluation.verdict
      ],
      credit: `${evaluation.computed.credit} ${evaluation.computed.currency}`,
      link: opts.publicUrl(`/claims/${claimId}`),
      filerName: user.name,
    };
    const reviewers = await recipientsOf(m, c, 'intake');
    // The failure date written the way each recipient's organisation reads dates (shared/dates.ts).
    const failedFor = (org: Organization) =>
      c.failedOn ? formatCalendarDate(c.failedOn, org, 'long') : 'not given';
    if (reviewers.length)
      await enqueueEmail(m, {
        to: reviewers.map((r) => r.email),
        template: 'claim-filed-manufacturer',
        view: { ...view, failedOn: failedFor(c.manufacturer) },
      });
    await enqueueEmail(m, {
      to: [user.email],
      template: 'claim-filed-confirmation',
      view: { ...view, name: user.name, failedOn: failedFor(c.contractor) },
    });
    await crashPoint('claim.file.before_commit', m);
    return { id: claimId, replayed: false };
  }

  return {
    /**
     * Files a draft: validates it whole, evaluates it with the engine (the result stored with its version), gives
     * it a number, moves it to filed, audits and queues the e-mails, all in one transaction. Filing a claim that
     * is already filed answers it as it is (replayed), so a double tap or a retry makes one claim. With an
     * Idempotency-Key the answer is also kept under the key (see server/lib/idempotency.ts): the same key
     * replays it, the same key with another body is refused.
     */
    async file(
      claimId: string,
      user: SessionUser,
      actor: Actor,
      when: { version?: number } = {},
      idem?: { key: string },
    ) {
      if (!idem) return ds.transaction((m) => fileIn(m, claimId, user, actor, when));
      const path = `/api/claims/${claimId}/file`;
      const answer = await runIdempotent(
        ds,
        { key: idem.key, userId: user.id, route: FILE_ROUTE, method: 'POST', path, body: when },
        async (m) => {
          const r = await fileIn(m, claimId, user, actor, when);
          return { status: 200, body: { claimId: r.id, replayed: r.replayed } };
        },
      );
      const stored = answer.body as { claimId: string; replayed: boolean };
      return { id: stored.claimId, replayed: answer.replayed || stored.replayed };
    },
  };
}
