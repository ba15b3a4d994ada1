import { subject } from '@casl/ability';
import { describe, expect, it } from 'vitest';

import { defineAbilityFor, type AbilityUser } from '../../../shared/abilities';
import {
  ACTION_NAMES,
  ACTIONS,
  availableActions,
  canPerform,
  FINAL_STAGES,
  needsReason,
  overrideReasonsFor,
  STAGE_LABELS,
  STAGES,
  targetsOf,
  type ClaimActor,
  type ClaimView,
  type Stage,
} from '../../../shared/claims/stages';

// The whole transition matrix, written out here independently of the implementation: every allowed move as
// "action  from -> to  who", where who is c:<role> (the claim's contracting company), m:<role> (the claim's
// manufacturer) or system. Everything not listed is refused.
const ALLOWED = `
  file               draft            -> filed             c:installer c:administrator
  withdraw           draft            -> withdrawn         c:installer c:administrator
  withdraw           filed            -> withdrawn         c:installer c:administrator
  withdraw           needs_info       -> withdrawn         c:installer c:administrator
  start_review       filed            -> in_review         m:reviewer
  request_info       in_review        -> needs_info        m:reviewer
  answer_info        needs_info       -> in_review         c:installer c:administrator
  request_return     in_review        -> return_requested  m:reviewer
  record_shipment    return_requested -> return_requested  c:installer c:administrator
  receive_unit       return_requested -> unit_received     m:reviewer
  record_bench_test  unit_received    -> unit_received     m:reviewer
  approve            in_review        -> approved          m:reviewer
  approve            unit_received    -> approved          m:reviewer
  deny               in_review        -> denied            m:reviewer
  deny               unit_received    -> denied            m:reviewer
  reopen             approved         -> in_review         m:reviewer
  reopen             denied           -> in_review         m:reviewer
  credit             approved         -> credited          m:accountant
  void_credit        credited         -> approved          m:accountant
  close              denied           -> closed            m:reviewer system
  close              credited         -> closed            m:reviewer system
`;

type Row = { action: string; from: string; to: string; who: string[] };
const ROWS: Row[] = ALLOWED.trim()
  .split('\n')
  .map((line) => {
    const [action, from, , to, ...who] = line.trim().split(/\s+/);
    return { action, from, to, who };
  });

const OWN_CONTRACTOR = 'org-harbor';
const OWN_MANUFACTURER = 'org-alder';
const claimAt = (stage: Stage, evaluation?: ClaimView['evaluation']): ClaimView => ({
  stage,
  contractorId: OWN_CONTRACTOR,
  manufacturerId: OWN_MANUFACTURER,
  evaluation,
});

type Persona = { key: string; actor: ClaimActor };
const user = (kind: 'contractor' | 'manufacturer', role: string, own: boolean): Persona => {
  const orgId = own ? (kind === 'contractor' ? OWN_CONTRACTOR : OWN_MANUFACTURER) : `org-other-${kind}`;
  const key = `${kind === 'contractor' ? 'c' : 'm'}:${role}`;
  return {
    key: own ? key : `foreign ${key}`,
    actor: {
      id: `u-${key}-${own}`,
      roles: [role as never],
      organization: { id: orgId, kind },
    } as AbilityUser,
  };
};
const PERSONAS: Persona[] = [
  ...[true, false].flatMap((own) => [
    user('contractor', 'installer', own),
    user('contractor', 'administrator', own),
    user('manufacturer', 'reviewer', own),
    user('manufacturer', 'accountant', own),
    user('manufacturer', 'administrator', own),
  ]),
  { key: 'system', actor: 'system' },
];

/** Who performs an action at some stage, from the table alone. */
const performers = (action: string) => new Set(ROWS.filter((r) => r.action === action).flatMap((r) => r.who));

describe('the transition matrix', () => {
  it('lists every action and every stage the brief names', () => {
    expect([...STAGES]).toEqual([
      'draft',
      'filed',
      'in_review',
      'needs_info',
      'return_requested',
      'unit_received',
      'approved',
      'denied',
      'credited',
      'closed',
      'withdrawn',
    ]);
    expect(new Set(ACTION_NAMES)).toEqual(new Set(ROWS.map((r) => r.action)));
    for (const s of STAGES) expect(STAGE_LABELS[s]).toMatch(/\S/);
    expect(STAGE_LABELS.needs_info).toBe('Waiting on installer');
  });

  for (const action of ACTION_NAMES) {
    describe(action, () => {
      for (const stage of STAGES) {
        it(`from ${stage}`, () => {
          const claim = claimAt(stage);
          const mismatches: string[] = [];
          for (const p of PERSONAS) {
            const row = ROWS.find((r) => r.action === action && r.from === stage && r.who.includes(p.key));
            const answer = canPerform(claim, p.actor, action);
            if (row) {
              if (!answer.ok || answer.to !== row.to)
                mismatches.push(`${p.key}: expected -> ${row.to}, got ${JSON.stringify(answer)}`);
              continue;
            }
            const code = performers(action).has(p.key) ? 'claim.invalid_transition' : 'claim.not_allowed';
            if (answer.ok || answer.code !== code)
              mismatches.push(`${p.key}: expected ${code}, got ${JSON.stringify(answer)}`);
          }
          expect(mismatches).toEqual([]);
        });
      }
    });
  }

  it('a user with two roles may do what either role may', () => {
    const both: AbilityUser = {
      id: 'u-both',
      roles: ['reviewer', 'accountant'],
      organization: { id: OWN_MANUFACTURER, kind: 'manufacturer' },
    };
    expect(availableActions(claimAt('approved'), both)).toEqual(['reopen', 'credit']);
    expect(availableActions(claimAt('credited'), both)).toEqual(['void_credit', 'close']);
  });

  it('availableActions answers the allowed rows of the table', () => {
    for (const stage of STAGES) {
      for (const p of PERSONAS) {
        const expected = ROWS.filter((r) => r.from === stage && r.who.includes(p.key)).map((r) => r.action);
        expect(availableActions(claimAt(stage), p.actor).sort(), `${p.key} at ${stage}`).toEqual(
          expected.sort(),
        );
      }
    }
  });

  it('nothing leaves a final stage, and every stage is reachable from a draft', () => {
    for (const s of FINAL_STAGES)
      expect(ACTION_NAMES.filter((a) => (ACTIONS[a].from as readonly Stage[]).includes(s))).toEqual([]);
    const seen = new Set<Stage>(['draft']);
    for (let grew = true; grew;) {
      grew = false;
      for (const a of ACTION_NAMES) {
        if (!(ACTIONS[a].from as readonly Stage[]).some((s) => seen.has(s))) continue;
        for (const t of targetsOf(a)) if (!seen.has(t)) grew = seen.add(t) !== null;
      }
    }
    expect([...seen].sort()).toEqual([...STAGES].sort());
  });

  it('a bench test sends the claim back to review when asked', () => {
    const bench = { testedOn: '2025-03-04', result: 'no_fault_found', readings: { inputWatts: 150 } };
    const reviewer = PERSONAS.find((p) => p.key === 'm:reviewer')!.actor;
    expect(canPerform(claimAt('unit_received'), reviewer, 'record_bench_test', bench)).toMatchObject({
      ok: true,
      to: 'unit_received',
    });
    expect(
      canPerform(claimAt('unit_received'), reviewer, 'record_bench_test', { ...bench, next: 'review' }),
    ).toMatchObject({ ok: true, to: 'in_review' });
    expect(targetsOf('record_bench_test')).toEqual(['unit_received', 'in_review']);
  });
});

describe('refusals', () => {
  const accountant = PERSONAS.find((p) => p.key === 'm:accountant')!.actor;
  const installer = PERSONAS.find((p) => p.key === 'c:installer')!.actor;
  const foreignReviewer = PERSONAS.find((p) => p.key === 'foreign m:reviewer')!.actor;

  it('say plainly what is wrong', () => {
    expect(canPerform(claimAt('denied'), accountant, 'credit')).toEqual({
      ok: false,
      code: 'claim.invalid_transition',
      message: 'A denied claim cannot be credited.',
    });
    expect(canPerform(claimAt('in_review'), installer, 'approve')).toEqual({
      ok: false,
      code: 'claim.not_allowed',
      message: 'Only a reviewer of the manufacturer on the claim can approve a claim.',
    });
    expect(canPerform(claimAt('draft'), installer, 'credit')).toMatchObject({ code: 'claim.not_allowed' });
    expect(canPerform(claimAt('in_review'), foreignReviewer, 'approve')).toEqual({
      ok: false,
      code: 'claim.not_allowed',
      message: 'This claim is not shared with your organisation.',
    });
    expect(canPerform(claimAt('in_review'), installer, 'teleport')).toMatchObject({
      code: 'claim.unknown_action',
    });
  });

  it('a wrong stage is not revealed to someone who may not act on the claim at all', () => {
    expect(canPerform(claimAt('closed'), foreignReviewer, 'approve')).toMatchObject({
      code: 'claim.not_allowed',
    });
  });
});

describe('payloads', () => {
  const reviewer = PERSONAS.find((p) => p.key === 'm:reviewer')!.actor;
  const installer = PERSONAS.find((p) => p.key === 'c:installer')!.actor;
  const accountant = PERSONAS.find((p) => p.key === 'm:accountant')!.actor;
  const covered = claimAt('in_review', {
    verdict: 'covered',
    computed: { credit: '96.00', currency: 'USD' },
  });
  const excluded = claimAt('in_review', {
    verdict: 'excluded',
    computed: { credit: '96.00', currency: 'USD' },
  });
  const review = claimAt('in_review', { verdict: 'review', computed: { credit: '96.00' } });

  const fields = (answer: ReturnType<typeof canPerform>) =>
    answer.ok ? [] : (answer.details ?? []).map((d) => d.path);

  it('asking the installer needs a message; answering needs one too', () => {
    expect(fields(canPerform(covered, reviewer, 'request_info', {}))).toEqual(['message']);
    expect(fields(canPerform(covered, reviewer, 'request_info', { message: '   ' }))).toEqual(['message']);
    expect(
      canPerform(covered, reviewer, 'request_info', { message: 'Photo of the nameplate, please.' }),
    ).toMatchObject({
      ok: true,
      to: 'needs_info',
    });
    const waiting = claimAt('needs_info');
    expect(canPerform(waiting, installer, 'answer_info', {})).toMatchObject({
      code: 'claim.invalid_payload',
    });
    expect(
      canPerform(waiting, installer, 'answer_info', { message: 'Attached.', attachmentIds: ['a1'] }),
    ).toMatchObject({
      ok: true,
    });
  });

  it('unknown keys are refused', () => {
    expect(
      fields(canPerform(covered, reviewer, 'request_info', { message: 'x', stage: 'approved' })),
    ).toEqual(['']);
  });

  it('approving at the engine credit of a covered claim needs no reason', () => {
    const answer = canPerform(covered, reviewer, 'approve', { resolution: 'credit', amount: '96.00' });
    expect(answer).toMatchObject({ ok: true, to: 'approved' });
    expect(canPerform(covered, reviewer, 'approve', { resolution: 'credit', amount: '96' }).ok).toBe(true);
  });

  it('the amount must be a decimal string', () => {
    for (const amount of [96, '96.001', '-5.00', '1e3', '', '0.00', '96,00']) {
      const answer = canPerform(covered, reviewer, 'approve', { resolution: 'credit', amount });
      expect(fields(answer), String(amount)).toEqual(['amount']);
    }
  });

  it('a resolution must be one of replace, credit or repair allowance', () => {
    expect(
      fields(canPerform(covered, reviewer, 'approve', { resolution: 'refund', amount: '96.00' })),
    ).toEqual(['resolution']);
  });

  it('approving a different amount, or against an exclusion, needs a reason', () => {
    const partial = canPerform(covered, reviewer, 'approve', { resolution: 'credit', amount: '48.00' });
    expect(partial).toMatchObject({ ok: false, code: 'claim.invalid_payload' });
    expect(!partial.ok && partial.details?.[0].message).toContain("engine's credit of 96.00 USD");
    expect(
      canPerform(covered, reviewer, 'approve', {
        resolution: 'credit',
        amount: '48.00',
        overrideReason: 'Two of four units failed.',
      }).ok,
    ).toBe(true);
    expect(
      fields(canPerform(excluded, reviewer, 'approve', { resolution: 'replace', amount: '96.00' })),
    ).toEqual(['overrideReason']);
    expect(
      canPerform(review, reviewer, 'approve', { resolution: 'repair_allowance', amount: '96.00' }).ok,
    ).toBe(true);
  });

  it('denying needs reason codes and a note, and a reason against a covered verdict', () => {
    expect(fields(canPerform(excluded, reviewer, 'deny', {})).sort()).toEqual(['note', 'reasonCodes']);
    expect(fields(canPerform(excluded, reviewer, 'deny', { reasonCodes: [], note: 'x' }))).toEqual([
      'reasonCodes',
    ]);
    expect(fields(canPerform(excluded, reviewer, 'deny', { reasonCodes: ['made_up'], note: 'x' }))).toEqual([
      'reasonCodes.0',
    ]);
    const deny = { reasonCodes: ['wrong_location'], note: 'Damp-rated fixture installed outdoors.' };
    expect(canPerform(excluded, reviewer, 'deny', deny)).toMatchObject({ ok: true, to: 'denied' });
    expect(canPerform(review, reviewer, 'deny', deny).ok).toBe(true);
    expect(fields(canPerform(covered, reviewer, 'deny', deny))).toEqual(['overrideReason']);
    expect(
      canPerform(covered, reviewer, 'deny', { ...deny, overrideReason: 'Bench shows water ingress.' }).ok,
    ).toBe(true);
  });

  it('a decision with no evaluation on record needs a reason', () => {
    const bare = claimAt('in_review');
    expect(fields(canPerform(bare, reviewer, 'approve', { resolution: 'credit', amount: '10.00' }))).toEqual([
      'overrideReason',
    ]);
  });

  it('the rest: ship-to, carrier and tracking, bench readings, void reason', () => {
    expect(fields(canPerform(covered, reviewer, 'request_return', {}))).toEqual(['shipTo']);
    const shipTo = {
      name: 'Returns desk',
      line1: '1 Dock Rd',
      city: 'Springfield',
      postalCode: '01101',
      country: 'US',
    };
    expect(canPerform(covered, reviewer, 'request_return', { shipTo }).ok).toBe(true);
    const waiting = claimAt('return_requested');
    expect(
      fields(
        canPerform(waiting, installer, 'record_shipment', { carrier: 'Parcel Co', shippedOn: '2025-03-01' }),
      ),
    ).toEqual(['trackingNumber']);
    const received = claimAt('unit_received');
    expect(
      fields(
        canPerform(received, reviewer, 'record_bench_test', {
          testedOn: '2025-03-04',
          result: 'failure_confirmed',
          readings: {},
        }),
      ),
    ).toEqual(['readings']);
    expect(fields(canPerform(claimAt('credited'), accountant, 'void_credit', {}))).toEqual(['reason']);
  });
});

describe('needsReason', () => {
  it('is true only when deciding against the verdict, or with none', () => {
    expect(needsReason('covered', 'approve')).toBe(false);
    expect(needsReason('review', 'approve')).toBe(false);
    expect(needsReason('excluded', 'approve')).toBe(true);
    expect(needsReason('covered', 'deny')).toBe(true);
    expect(needsReason('review', 'deny')).toBe(false);
    expect(needsReason('excluded', 'deny')).toBe(false);
    expect(needsReason(undefined, 'deny')).toBe(true);
  });

  it('overrideReasonsFor names each cause', () => {
    const claim = claimAt('in_review', {
      verdict: 'excluded',
      computed: { credit: '96.00', currency: 'USD' },
    });
    expect(overrideReasonsFor(claim, { action: 'approve', amount: '50.00' })).toEqual([
      'The engine found this claim likely excluded.',
      "The amount differs from the engine's credit of 96.00 USD.",
    ]);
    expect(overrideReasonsFor(claim, { action: 'deny' })).toEqual([]);
  });

  it('the bench outranks the screening: approving after no fault found, denying a confirmed failure', () => {
    const covered = { verdict: 'covered' as const, computed: { credit: '96.00', currency: 'USD' } };
    const nff = { ...claimAt('unit_received', covered), benchResult: 'no_fault_found' as const };
    expect(overrideReasonsFor(nff, { action: 'approve', amount: '96.00' })).toEqual([
      'The bench test found: no fault found.',
    ]);
    const refused = canPerform(nff, user('manufacturer', 'reviewer', true).actor, 'approve', {
      resolution: 'credit',
      amount: '96.00',
    });
    expect(refused).toMatchObject({ ok: false, code: 'claim.invalid_payload' });
    const excluded = { verdict: 'excluded' as const, computed: { credit: '0.00', currency: 'USD' } };
    const confirmed = { ...claimAt('unit_received', excluded), benchResult: 'failure_confirmed' as const };
    expect(overrideReasonsFor(confirmed, { action: 'deny' })).toEqual([
      'The bench test confirmed the failure.',
    ]);
    expect(overrideReasonsFor(confirmed, { action: 'approve' })).toEqual([
      'The engine found this claim likely excluded.',
    ]);
  });
});

describe('the CASL abilities agree', () => {
  // For every persona, action and stage: the stage rules refuse as not_allowed exactly when the ability
  // (scoped to the claim's organisations) does not grant the action's CASL action.
  it('on who may act', () => {
    const mismatches: string[] = [];
    for (const p of PERSONAS) {
      if (p.actor === 'system') continue;
      const ability = defineAbilityFor(p.actor);
      for (const action of ACTION_NAMES) {
        for (const stage of STAGES) {
          const claim = claimAt(stage);
          const casl = ability.can(
            ACTIONS[action].ability,
            subject('Claim', { ...claim } as Record<string, unknown>),
          );
          const answer = canPerform(claim, p.actor, action);
          const allowedWho = answer.ok || answer.code !== 'claim.not_allowed';
          if (casl !== allowedWho)
            mismatches.push(`${p.key} ${action} at ${stage}: CASL ${casl}, stages ${allowedWho}`);
        }
      }
    }
    expect(mismatches).toEqual([]);
  });
});
