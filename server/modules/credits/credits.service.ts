import { calendarDayIn } from '../../../shared/dates';
import { Decision } from '../../db/entities/decision.entity';
import crypto from 'node:crypto';
import type { EntityManager } from 'typeorm';
import type { AbilityUser } from '../../../shared/abilities';
import { canPerform, REFUSAL_STATUS } from '../../../shared/claims/stages';
import { negate, normalizeAmount, toDecimal } from '../../../shared/credits/money';
import type { IssueCreditInput } from '../../../shared/schemas/credits';
import type { AppDataSource } from '../../db/data-source';
import { Claim } from '../../db/entities/claim.entity';
import { CreditApproval } from '../../db/entities/credit-approval.entity';
import { CreditMemo } from '../../db/entities/credit-memo.entity';
import { LedgerEntry } from '../../db/entities/ledger-entry.entity';
import { Organization } from '../../db/entities/organization.entity';
import { ProductModel } from '../../db/entities/product-model.entity';
import { recordAudit, type Actor } from '../../lib/audit';
import { clock } from '../../lib/clock';
import { AppError, AuditedRefusal, conflict } from '../../lib/errors';
import { retryOnDeadlock, runIdempotent, type IdempotentAnswer } from '../../lib/idempotency';
import { enqueueEmail } from '../../lib/outbox';
import { claimRef, enqueueWebhookEvent } from '../../lib/webhooks';
import { crashPoint } from '../../lib/crash-point';
import { renderCreditMemo, type CreditMemoData } from '../../lib/pdf/credit-memo';
import { paperFor } from '../../lib/pdf/document';
import { sha256Hex } from '../../lib/pdf/hash';
import type { Storage } from '../../lib/storage';
import { putForTransaction } from '../../lib/transaction-objects';
import { nextMemoNumber } from './memo-numbers';
import { presentMemoSummary } from './credits.presenter';
import { moveClaim } from '../claims/move-claim';
import { recipientsOf } from '../claims/recipients';

export const ISSUE_ROUTE = 'POST /claims/:id/credits';
export const VOID_ROUTE = 'POST /credits/:id/void';

/**
 * The amount a credit memo settles. Until the review branch's decisions table lands, the approved amount is
 * the claim's expected credit (set by the engine at filing, confirmed at approval); this is the one place to
 * switch to the decision's amount.
 */
export function approvedAmountOf(claim: Pick<Claim, 'expectedCredit' | 'currency'>) {
  if (claim.expectedCredit === null || claim.currency === null) return null;
  const amount = toDecimal(claim.expectedCredit);
  if (amount.lte(0)) return null;
  return { amount: normalizeAmount(amount), currency: claim.currency };
}

type Parties = { manufacturer: Organization; contractor: Organization; product: ProductModel };

async function partiesOf(m: EntityManager, claim: Claim): Promise<Parties> {
  const [manufacturer, contractor, product] = await Promise.all([
    m.findOneByOrFail(Organization, { id: claim.manufacturerId }),
    m.findOneByOrFail(Organization, { id: claim.contractorId }),
    m.findOneByOrFail(ProductModel, { id: claim.productModelId }),
  ]);
  return { manufacturer, contractor, product };
}

function memoData(
  p: Parties,
  claim: Claim,
  memo: { number: string; date: Date; amount: string; currency: string },
  reversal?: CreditMemoData['reversal'],
): CreditMemoData {
  const units = claim.units && claim.units > 0 ? claim.units : 1;
  return {
    memoNumber: memo.number,
    // The memo is dated the day it is where the contractor who receives it is.
    memoDate: calendarDayIn(memo.date, p.contractor.timeZone),
    manufacturer: { name: p.manufacturer.name },
    contractor: { name: p.contractor.name },
    claimNumber: claim.number ?? claim.id,
    currency: memo.currency,
    lines: [
      {
        description:
          `${p.product.name} (${p.product.modelNumber}), warranty claim ${claim.number ?? ''}`.trim(),
        units,
        unitCredit: toDecimal(memo.amount).div(units).toFixed(2),
        coveragePercent: 100,
        amount: memo.amount,
      },
    ],
    reversal,
    paper: paperFor({ currency: memo.currency }),
    locale: p.contractor.locale,
  };
}

function refuse(code: keyof typeof REFUSAL_STATUS, message: string): never {
  throw new AppError(REFUSAL_STATUS[code], code, message);
}

/**
 * Four eyes on large credits. Above the manufacturer's creditSecondApprovalAbove the first accountant's request
 * records their approval and answers 202 (stored with the Idempotency-Key like any answer, so a retry replays it);
 * the memo is issued when a different accountant asks for the same amount. The same accountant asking again is
 * refused (409, audited). Returns the 202 answer, or who approved first when this request completes the pair.
 */
async function secondApproval(
  m: EntityManager,
  claim: Claim,
  user: AbilityUser,
  approved: { amount: string; currency: string },
  actor: Actor,
  now: Date,
): Promise<{ answer?: { status: number; body: unknown }; firstApproverId?: string }> {
  const org = await m.findOne(Organization, {
    where: { id: claim.manufacturerId },
    select: { id: true, creditSecondApprovalAbove: true },
  });
  const above = org?.creditSecondApprovalAbove;
  if (above === null || above === undefined || !toDecimal(approved.amount).gt(toDecimal(above))) return {};
  const first = await m.findOneBy(CreditApproval, { claimId: claim.id });
  const sameRequest =
    first && first.currency === approved.currency && toDecimal(first.amount).eq(toDecimal(approved.amount));
  if (sameRequest && first.approvedById !== user.id) return { firstApproverId: first.approvedById };
  if (sameRequest) {
    throw new AuditedRefusal(
      409,
      'credit.second_approval_required',
      'You approved this credit already; a second accountant must approve it before the memo is issued.',
      { action: 'credit.refused', entityType: 'Claim', entityId: claim.id },
    );
  }
  await m.upsert(
    CreditApproval,
    {
      claimId: claim.id,
      approvedById: user.id,
      amount: approved.amount,
      currency: approved.currency,
      approvedAt: now,
    },
    ['claimId'],
  );
  await recordAudit(m, actor, {
    action: 'credit.first_approval',
    entityType: 'Claim',
    entityId: claim.id,
    after: {
      amount: approved.amount,
      currency: approved.currency,
      threshold: normalizeAmount(toDecimal(above)),
    },
  });
  return {
    answer: {
      status: 202,
      body: {
        creditApproval: {
          claimId: claim.id,
          status: 'awaiting_second_approval',
          amount: approved.amount,
          currency: approved.currency,
          approvedBy: { id: user.id },
          approvedAt: now.toISOString(),
        },
      },
    },
  };
}

const lockClaim = (m: EntityManager, id: string) =>
  m.createQueryBuilder(Claim, 'c').setLock('pessimistic_write').where('c.id = :id', { id }).getOne();

export function createCreditsService(ds: AppDataSource, storage: Storage, links: (p: string) => string) {
  async function storePdf(m: EntityManager, manufacturerId: string, memoId: string, pdf: Buffer) {
    const key = `credit-memos/${manufacturerId}/${memoId}.pdf`;
    // Written before the commit, never a memo without its PDF; a rollback (a refusal, a deadlock retried) deletes
    // it again, and a crash leaves it to the storage sweep.
    await putForTransaction(m, storage, key, pdf, 'application/pdf');
    return { key, sha256: sha256Hex(pdf) };
  }

  return {
    /**
     * Issues the credit memo for an approved claim, idempotently: in one transaction the key's row, the memo
     * (numbered), its ledger entry, the claim's move to credited, the audit rows and the e-mail with the PDF.
     */
    issue(
      claimId: string,
      user: AbilityUser & { email?: string },
      actor: Actor,
      input: IssueCreditInput,
      idem: { key: string; path: string; body: unknown },
    ): Promise<IdempotentAnswer> {
      return runIdempotent(
        ds,
        {
          key: idem.key,
          userId: user.id,
          route: ISSUE_ROUTE,
          method: 'POST',
          path: idem.path,
          body: idem.body,
        },
        async (m) => {
          // The row lock serialises every request for this claim; the unique index on credited_claim_id would
          // refuse a second standing credit even if it did not.
          const claim = await lockClaim(m, claimId);
          if (!claim)
            throw new AppError(404, 'not_found', 'That claim does not exist or is not shared with you.');
          if (claim.stage === 'credited') {
            const standing = await m.findOne(CreditMemo, { where: { creditedClaimId: claim.id } });
            throw conflict(
              'credit.already_issued',
              `Claim ${claim.number ?? claim.id} is already credited${standing ? ` by memo ${standing.number}` : ''}.`,
            );
          }
          const allowed = canPerform(claim, user, 'credit', {});
          if (!allowed.ok) refuse(allowed.code, allowed.message);
          // The reviewer's decision fixes the amount; claims approved before decisions were recorded fall back to
          // the engine's expected credit.
          const decision = await m.findOneBy(Decision, { currentClaimId: claim.id });
          // Four eyes: whoever approved the claim does not also pay it.
          if (decision && decision.decidedById === user.id) {
            throw new AuditedRefusal(
              403,
              'credit.own_approval',
              'You approved this claim, so a colleague must issue its credit.',
              { action: 'credit.refused', entityType: 'Claim', entityId: claim.id },
            );
          }
          const approved =
            decision?.amount && decision.currency && toDecimal(decision.amount).gt(0)
              ? { amount: normalizeAmount(toDecimal(decision.amount)), currency: decision.currency }
              : approvedAmountOf(claim);
          if (!approved) throw conflict('credit.no_amount', 'This claim has no approved amount to credit.');

          const now = clock.now();
          const second = await secondApproval(m, claim, user, approved, actor, now);
          if (second.answer) return second.answer;

          const parties = await partiesOf(m, claim);
          const memoId = crypto.randomUUID();
          const number = await nextMemoNumber(m, parties.manufacturer, now.getUTCFullYear());
          await crashPoint('credit.issue.after_number', m);
          const pdf = await renderCreditMemo(memoData(parties, claim, { number, date: now, ...approved }));
          const stored = await storePdf(m, claim.manufacturerId, memoId, pdf);
          await crashPoint('credit.issue.after_pdf', m);

          await m.insert(CreditMemo, {
            id: memoId,
            number,
            kind: 'credit',
            manufacturerId: claim.manufacturerId,
            contractorId: claim.contractorId,
            claimId: claim.id,
            creditedClaimId: claim.id,
            reversesMemoId: null,
            amount: approved.amount,
            currency: approved.currency,
            reason: null,
            pdfStorageKey: stored.key,
            pdfSha256: stored.sha256,
            issuedById: user.id,
            issuedAt: now,
          });
          await crashPoint('credit.issue.after_memo', m);
          await m.insert(LedgerEntry, {
            contractorId: claim.contractorId,
            manufacturerId: claim.manufacturerId,
            currency: approved.currency,
            amount: approved.amount,
            memoId,
            createdAt: now,
          });
          await crashPoint('credit.issue.after_ledger', m);
          await moveClaim(m, claim, 'credited', {
            now,
            changedMessage: 'The claim changed while the credit was issued. Try again.',
          });
          await crashPoint('credit.issue.after_move', m);

          await recordAudit(m, actor, {
            action: 'claim.credited',
            entityType: 'Claim',
            entityId: claim.id,
            before: { stage: 'approved' },
            after: {
              stage: 'credited',
              memoId,
              memoNumber: number,
              amount: approved.amount,
              currency: approved.currency,
            },
          });
          if (second.firstApproverId) {
            await recordAudit(m, actor, {
              action: 'credit.second_approval',
              entityType: 'Claim',
              entityId: claim.id,
              after: {
                firstApproverId: second.firstApproverId,
                amount: approved.amount,
                currency: approved.currency,
              },
            });
          }
          await recordAudit(m, actor, {
            action: 'credit_memo.issued',
            entityType: 'CreditMemo',
            entityId: memoId,
            after: {
              number,
              claimId: claim.id,
              contractorId: claim.contractorId,
              amount: approved.amount,
              currency: approved.currency,
              pdfSha256: stored.sha256,
              ...(input.note ? { note: input.note } : {}),
            },
          });
          await crashPoint('credit.issue.after_audit', m);
          await enqueueWebhookEvent(m, {
            event: 'claim.credited',
            organizationIds: [claim.contractorId, claim.manufacturerId],
            data: {
              claim: claimRef(claim, 'credited', parties),
              creditMemo: { id: memoId, number, amount: approved.amount, currency: approved.currency },
            },
          });
          const to = (await recipientsOf(m, claim, 'contractor_accounts')).map((r) => r.email);
          if (to.length) {
            await enqueueEmail(m, {
              to,
              template: 'credit-memo',
              view: {
                memoNumber: number,
                manufacturer: parties.manufacturer.name,
                contractor: parties.contractor.name,
                claimNumber: claim.number ?? '',
                amount: approved.amount,
                currency: approved.currency,
                sha256: stored.sha256,
                link: links('/credits'),
              },
              attachments: [
                { filename: `${number}.pdf`, contentType: 'application/pdf', storageKey: stored.key },
              ],
            });
          }
          await crashPoint('credit.issue.before_commit', m);
          return {
            status: 201,
            body: {
              creditMemo: presentMemoSummary({
                id: memoId,
                number,
                amount: approved.amount,
                currency: approved.currency,
                claimId: claim.id,
              }),
            },
          };
        },
      );
    },

    /**
     * Voids a standing credit with a reversal memo: its negative ledger entry, the original's claim freed, the
     * claim back to approved. The original memo and its entry stay as they were.
     */
    async voidMemo(memoId: string, user: AbilityUser, actor: Actor, reason: string) {
      return retryOnDeadlock(() =>
        ds.transaction(async (m) => {
          const original = await m.findOne(CreditMemo, { where: { id: memoId } });
          if (!original)
            throw new AppError(
              404,
              'not_found',
              'That credit memo does not exist or is not shared with you.',
            );
          const claim = await lockClaim(m, original.claimId);
          const memo = await m
            .createQueryBuilder(CreditMemo, 'cm')
            .setLock('pessimistic_write')
            .where('cm.id = :id', { id: memoId })
            .getOneOrFail();
          if (memo.kind !== 'credit')
            throw conflict('credit.not_a_credit', 'A reversal cannot itself be voided.');
          if (memo.creditedClaimId === null) {
            const rev = await m.findOne(CreditMemo, { where: { reversesMemoId: memo.id } });
            throw conflict(
              'credit.already_voided',
              `Memo ${memo.number} is already voided${rev ? ` by ${rev.number}` : ''}.`,
            );
          }
          if (!claim) throw new Error('memo without claim');
          const allowed = canPerform(claim, user, 'void_credit', { reason });
          if (!allowed.ok) refuse(allowed.code, allowed.message);

          const parties = await partiesOf(m, claim);
          const now = clock.now();
          const reversalId = crypto.randomUUID();
          const number = await nextMemoNumber(m, parties.manufacturer, now.getUTCFullYear());
          const pdf = await renderCreditMemo(
            memoData(
              parties,
              claim,
              { number, date: now, amount: memo.amount, currency: memo.currency },
              {
                originalMemoNumber: memo.number,
                originalDate: calendarDayIn(memo.issuedAt, parties.contractor.timeZone),
                reason,
              },
            ),
          );
          const stored = await storePdf(m, claim.manufacturerId, reversalId, pdf);
          await m.insert(CreditMemo, {
            id: reversalId,
            number,
            kind: 'reversal',
            manufacturerId: memo.manufacturerId,
            contractorId: memo.contractorId,
            claimId: memo.claimId,
            creditedClaimId: null,
            reversesMemoId: memo.id,
            amount: memo.amount,
            currency: memo.currency,
            reason,
            pdfStorageKey: stored.key,
            pdfSha256: stored.sha256,
            issuedById: user.id,
            issuedAt: now,
          });
          await m.insert(LedgerEntry, {
            contractorId: memo.contractorId,
            manufacturerId: memo.manufacturerId,
            currency: memo.currency,
            amount: negate(memo.amount),
            memoId: reversalId,
            createdAt: now,
          });
          await m.update(CreditMemo, { id: memo.id }, { creditedClaimId: null });
          // Back to approved, waiting again on the manufacturer's accountants for a credit.
          await moveClaim(m, claim, 'approved', {
            now,
            changedMessage: 'The claim changed while the credit was voided. Try again.',
          });
          await recordAudit(m, actor, {
            action: 'claim.credit_voided',
            entityType: 'Claim',
            entityId: claim.id,
            before: { stage: 'credited', memoNumber: memo.number },
            after: { stage: 'approved', reversalNumber: number, reason },
          });
          await recordAudit(m, actor, {
            action: 'credit_memo.voided',
            entityType: 'CreditMemo',
            entityId: memo.id,
            before: { standing: true },
            after: { standing: false, reversalId, reversalNumber: number, reason, pdfSha256: stored.sha256 },
          });
          await enqueueWebhookEvent(m, {
            event: 'credit_memo.voided',
            organizationIds: [claim.contractorId, claim.manufacturerId],
            data: {
              claim: claimRef(claim, 'approved', parties),
              creditMemo: { id: memo.id, number: memo.number, amount: memo.amount, currency: memo.currency },
              reversal: { id: reversalId, number },
              reason,
            },
          });
          const to = (await recipientsOf(m, claim, 'contractor_accounts')).map((r) => r.email);
          if (to.length) {
            await enqueueEmail(m, {
              to,
              template: 'credit-memo-reversal',
              view: {
                memoNumber: number,
                originalNumber: memo.number,
                manufacturer: parties.manufacturer.name,
                claimNumber: claim.number ?? '',
                amount: memo.amount,
                currency: memo.currency,
                reason,
                sha256: stored.sha256,
                link: links('/credits'),
              },
              attachments: [
                { filename: `${number}.pdf`, contentType: 'application/pdf', storageKey: stored.key },
              ],
            });
          }
          return presentMemoSummary({
            id: reversalId,
            number,
            amount: memo.amount,
            currency: memo.currency,
            claimId: memo.claimId,
          });
        }),
      );
    },
  };
}
