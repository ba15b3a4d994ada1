import crypto from 'node:crypto';
import type { EntityManager } from 'typeorm';
import type { Address, DenialCode } from '../../../shared/claims/actions.schema';
import {
  addDays,
  INFO_RESPONSE_DAYS,
  newReturnNumber,
  RETURN_SHIP_DAYS,
} from '../../../shared/claims/workflow';
import { needsReason } from '../../../shared/claims/stages';
import { formatCents, parseCents } from '../../../shared/engine/money';
import type { Storage } from '../../lib/storage';
import {
  createDeterminationLetter,
  createPackingSlip,
  loadParties,
  type LetterDecision,
} from '../../modules/claim-actions/claim-documents';
import { BenchTest } from '../entities/bench-test.entity';
import { ClaimMessage } from '../entities/claim-message.entity';
import type { Claim } from '../entities/claim.entity';
import { Decision } from '../entities/decision.entity';
import { ReturnAuthorization } from '../entities/return-authorization.entity';
import type { User } from '../entities/user.entity';

// The review workflow's own rows for the claims demo's claims, so that each stage reads as if the reviewers had
// worked it: decided claims carry their decision in force and its determination letter (rendered and stored by
// the workflow's document code, so it downloads like a real one), claims waiting on information carry the
// reviewer's question, returns carry their authorisation and packing slip, and some received units a bench
// test. Credit memos are not made here: demo-credits issues them through the credits service. Fixed seed.

function prng(seed: number) {
  let s = seed >>> 0;
  return () => {
    s = (s * 1664525 + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

const QUESTIONS = [
  'Could you send a close photo of the driver label and one of the dark section with the lens off?',
  'Please confirm the supply voltage at the fixture whip with the fixture switched on, and attach a photo of the meter.',
  'Which dimmer or control is on this circuit, if any? A photo of the wall control or panel schedule would help.',
];

const DENIAL_NOTES: Record<string, string> = {
  ingress: 'The photos show water inside the housing; the policy does not cover failures caused by ingress.',
  physical_damage: 'The housing shows impact damage consistent with handling after installation.',
  not_a_qualifying_failure: 'The readings and photos do not show a failure the policy covers.',
};

const RETURN_ADDRESS: Record<string, Address> = {
  'Aldercrest Lighting': {
    name: 'Aldercrest Lighting Returns',
    line1: '400 Foundry Road',
    city: 'Tacoma',
    region: 'WA',
    postalCode: '98421',
    country: 'US',
  },
  'Veltra Luminaires': {
    name: 'Veltra Luminaires Test Lab',
    line1: '18 Quarry Lane',
    city: 'Spokane',
    region: 'WA',
    postalCode: '99202',
    country: 'US',
  },
};

const day = (d: Date) => d.toISOString().slice(0, 10);

function denialOf(claim: Claim): DenialCode {
  if (claim.observations?.waterIngress) return 'ingress';
  if (claim.observations?.physicalDamage) return 'physical_damage';
  return 'not_a_qualifying_failure';
}

/** Adds the workflow rows for the claims demo's claims (see above); `claims` as seedDemoClaims returns them. */
export async function seedDemoWorkflow(
  m: EntityManager,
  storage: Storage,
  claims: Claim[],
  users: Map<string, User>,
) {
  const rand = prng(4242);
  const person = (orgId: string, role: string) =>
    [...users.values()].find((u) => u.organizationId === orgId && u.roles.includes(role as never));
  let benchTurn = 0;
  for (const claim of claims) {
    if (!claim.filedAt) continue;
    const reviewer = person(claim.manufacturerId, 'reviewer');
    const installer = person(claim.contractorId, 'installer');
    if (!reviewer || !installer) continue;
    const at = claim.stageChangedAt;
    const evaluation = claim.evaluation ?? null;

    if (claim.stage === 'approved' || claim.stage === 'denied' || claim.stage === 'closed') {
      const approve = claim.stage === 'approved';
      const parties = await loadParties(m, claim);
      // Decided a day after review started; a closed claim was denied before it was closed.
      const decidedAt = claim.stage === 'closed' ? new Date(at.getTime() - 2 * 86_400_000) : at;
      let letter: LetterDecision;
      let row: Partial<Decision>;
      if (approve) {
        const amount = formatCents(parseCents(claim.expectedCredit ?? '0.00'));
        const currency = claim.currency ?? 'USD';
        const overrideReason = needsReason(evaluation?.verdict ?? null, 'approve')
          ? 'Goodwill for a long-standing account: the failure pattern matches a known driver issue.'
          : undefined;
        letter = { outcome: 'approved', resolution: 'credit', amount, currency, overrideReason };
        row = {
          outcome: 'approved',
          resolution: 'credit',
          amount,
          currency,
          approvedUnits: null,
          reasonCodes: [],
          note: null,
          overrideReason: overrideReason ?? null,
        };
      } else {
        const code = denialOf(claim);
        const overrideReason = needsReason(evaluation?.verdict ?? null, 'deny')
          ? 'The installer’s photos contradict the readings entered; the failure is not one the policy covers.'
          : undefined;
        letter = { outcome: 'denied', reasonCodes: [code], note: DENIAL_NOTES[code], overrideReason };
        row = {
          outcome: 'denied',
          resolution: null,
          amount: null,
          currency: null,
          approvedUnits: null,
          reasonCodes: [code],
          note: DENIAL_NOTES[code],
          overrideReason: overrideReason ?? null,
        };
      }
      const doc = await createDeterminationLetter(
        m,
        storage,
        claim,
        parties,
        evaluation,
        letter,
        reviewer.name,
        decidedAt,
      );
      await m.insert(Decision, {
        id: crypto.randomUUID(),
        claimId: claim.id,
        currentClaimId: claim.id,
        ...row,
        engineAmount: evaluation?.computed.credit ?? null,
        againstEngine: row.overrideReason !== null,
        decidedById: reviewer.id,
        decidedAt,
        supersededAt: null,
        letterId: doc.id,
      });
    } else if (claim.stage === 'needs_info') {
      await m.insert(ClaimMessage, {
        id: crypto.randomUUID(),
        claimId: claim.id,
        kind: 'info_request',
        authorOrgId: claim.manufacturerId,
        authorId: reviewer.id,
        body: QUESTIONS[Math.floor(rand() * QUESTIONS.length)],
        dueOn: addDays(day(at), INFO_RESPONSE_DAYS),
        answeredAt: null,
        createdAt: at,
      });
    } else if (claim.stage === 'return_requested' || claim.stage === 'unit_received') {
      const parties = await loadParties(m, claim);
      const requestedAt = claim.stage === 'unit_received' ? new Date(at.getTime() - 2 * 86_400_000) : at;
      const received = claim.stage === 'unit_received';
      const ra = m.create(ReturnAuthorization, {
        id: crypto.randomUUID(),
        number: newReturnNumber(requestedAt, (n) => Math.floor(rand() * n)),
        claimId: claim.id,
        shipTo: RETURN_ADDRESS[parties.manufacturer.name] ?? RETURN_ADDRESS['Aldercrest Lighting'],
        instructions: 'Ship the whole fixture with its driver; keep the failed board attached.',
        shipBy: addDays(day(requestedAt), RETURN_SHIP_DAYS),
        carrier: received ? 'Cascade Freight' : null,
        trackingNumber: received ? `CF${Math.floor(100000000 + rand() * 899999999)}` : null,
        shippedOn: received ? day(new Date(requestedAt.getTime() + 86_400_000)) : null,
        receivedOn: received ? day(at) : null,
        receivedCondition: received ? 'as_described' : null,
        receivedNote: null,
        requestedById: reviewer.id,
        createdAt: requestedAt,
      });
      const slip = await createPackingSlip(m, storage, claim, parties, ra, requestedAt);
      ra.packingSlipId = slip.id;
      await m.insert(ReturnAuthorization, ra);
      // Every other received unit has been on the bench already: the failure confirmed on the field readings.
      if (received && evaluation && benchTurn++ % 2 === 0) {
        await m.insert(BenchTest, {
          id: crypto.randomUUID(),
          claimId: claim.id,
          returnAuthorizationId: ra.id,
          testedOn: day(at),
          result: 'failure_confirmed',
          readings: claim.measurements as BenchTest['readings'],
          evaluation,
          engineVersion: evaluation.engineVersion,
          note: 'Reproduced on the bench at rated input; the readings match the installer’s.',
          testedById: reviewer.id,
          testedAt: at,
        });
      }
    }
  }
}
