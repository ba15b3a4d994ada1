import crypto from 'node:crypto';
import { DENIAL_CODE_LABELS, RESOLUTION_LABELS } from '../../../../shared/claims/actions.schema';
import { needsReason, type ActionPayload } from '../../../../shared/claims/stages';
import { formatCents, parseCents } from '../../../../shared/engine/money';
import { Decision } from '../../../db/entities/decision.entity';
import type { OutboxAttachment } from '../../../db/entities/outbox-message.entity';
import { crashPoint } from '../../../lib/crash-point';
import { AppError } from '../../../lib/errors';
import { moveClaim } from '../../claims/move-claim';
import { createDeterminationLetter, type LetterDecision } from '../claim-documents';
import type { MoveHandler } from './types';

/**
 * Approving or denying: the move, the determination letter (stored PDF), the decision row, and the letter by
 * e-mail to the contractor (an approval also tells the manufacturer's accountants).
 */
const decide =
  (name: 'approve' | 'deny'): MoveHandler<'approve' | 'deny'> =>
  async ({ m, claim, user, now, evaluation, parties, storage, tell, payload: given }) => {
    const payload = given as Record<string, unknown>;
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
    const moved = await moveClaim(m, claim, name === 'approve' ? 'approved' : 'denied');
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
      await tell('contractor', {
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
      await tell('contractor', {
        headline: `${parties.manufacturer.name} ${letterDecision.outcome === 'partly_approved' ? 'partly approved' : 'approved'} the claim`,
        intro: 'The determination letter is attached.',
        details,
        nextStep:
          letterDecision.resolution === 'repair_allowance'
            ? 'A field-repair allowance: field modifications can void the fixture’s listing; follow local codes and use licensed, qualified electricians. The credit memo follows from the manufacturer’s accounts team.'
            : 'The credit memo follows from the manufacturer’s accounts team.',
        attachments: [letterFile],
      });
      await tell(
        'manufacturer',
        {
          headline: 'Approved and ready for a credit memo',
          details: [...details, { label: 'Contractor', value: parties.contractor.name }],
          nextStep: 'Issue the credit memo in Lumenproof.',
        },
        'accountants',
      );
    }
    await crashPoint('claim.move.after_outbox', m);
    return {
      moved,
      after: {
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
  };

export const approve: MoveHandler<'approve'> = decide('approve');
export const deny: MoveHandler<'deny'> = decide('deny');
