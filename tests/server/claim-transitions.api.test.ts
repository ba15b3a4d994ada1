import type supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  ACTION_NAMES,
  ACTIONS,
  canPerform,
  REFUSAL_STATUS,
  STAGES,
  type ClaimActionName,
  type Stage,
} from '../../shared/claims/stages';
import type { Role } from '../../shared/roles';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { Claim } from '../../server/db/entities/claim.entity';
import type { Organization } from '../../server/db/entities/organization.entity';
import type { User } from '../../server/db/entities/user.entity';
import { MOVES_ELSEWHERE } from '../../server/modules/claim-actions/claim-actions.service';
import { createOrganization, createUser, signIn } from '../support/factories';
import {
  createClaimAt,
  createReviewWorld,
  outboxCount,
  snapshotClaim,
  type ReviewWorld,
} from '../support/review-factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// The whole transition matrix through the HTTP API against the real database: every stage x every action x
// every role, on the claim's own organisations and on foreign ones. The stage machine in shared/ is the oracle
// (its own test writes the matrix out by hand); here each answer must match it, an allowed move must land on
// the machine's stage with one audit row, and a refused one must change nothing at all.

const PAYLOADS: Record<ClaimActionName, Record<string, unknown>> = {
  file: {},
  start_review: {},
  request_info: { message: 'Please send a photo of the nameplate.' },
  answer_info: { message: 'Photo attached; the label reads TP-24.' },
  request_return: {
    shipTo: {
      name: 'Returns bench',
      line1: '1 Dock Road',
      city: 'Porttown',
      postalCode: '10001',
      country: 'US',
    },
  },
  record_shipment: { carrier: 'Parcel Co', trackingNumber: 'PC-1234-5678', shippedOn: '2025-06-05' },
  receive_unit: { receivedOn: '2025-06-09', condition: 'as_described' },
  record_bench_test: {
    testedOn: '2025-06-10',
    result: 'failure_confirmed',
    readings: { supplyVolts: 277, inputWatts: 20 },
  },
  approve: {
    resolution: 'credit',
    amount: '96.00',
    overrideReason: 'Matrix test: a reason is always given.',
  },
  deny: {
    reasonCodes: ['physical_damage'],
    note: 'Cracked lens on arrival.',
    overrideReason: 'Matrix test.',
  },
  reopen: { reason: 'New evidence arrived.' },
  credit: {},
  void_credit: { reason: 'Issued twice.' },
  close: {},
  withdraw: { reason: 'Found a loose connection.' },
};

type ActorKey =
  | 'c:installer'
  | 'c:administrator'
  | 'm:reviewer'
  | 'm:accountant'
  | 'm:administrator'
  | 'x:installer'
  | 'x:reviewer';
const ACTORS: { key: ActorKey; side: 'c' | 'm' | 'xc' | 'xm'; role: Role }[] = [
  { key: 'c:installer', side: 'c', role: 'installer' },
  { key: 'c:administrator', side: 'c', role: 'administrator' },
  { key: 'm:reviewer', side: 'm', role: 'reviewer' },
  { key: 'm:accountant', side: 'm', role: 'accountant' },
  { key: 'm:administrator', side: 'm', role: 'administrator' },
  { key: 'x:installer', side: 'xc', role: 'installer' },
  { key: 'x:reviewer', side: 'xm', role: 'reviewer' },
];

let t: TestContext;
let world: ReviewWorld;
const agents = new Map<ActorKey, supertest.Agent>();
const users = new Map<ActorKey, User>();
const orgs: Record<'c' | 'm' | 'xc' | 'xm', Organization> = {} as never;

beforeAll(async () => {
  t = await createTestApp();
  orgs.c = await createOrganization(t.ds, 'contractor');
  orgs.m = await createOrganization(t.ds, 'manufacturer');
  orgs.xc = await createOrganization(t.ds, 'contractor');
  orgs.xm = await createOrganization(t.ds, 'manufacturer');
  world = await createReviewWorld(t.ds, orgs.c, orgs.m);
  for (const a of ACTORS) {
    const u = await createUser(t.ds, orgs[a.side], [a.role]);
    users.set(a.key, u);
    agents.set(a.key, await signIn(t.request(), u.email));
  }
}, 120_000);

afterAll(() => closeTestApp(t));

function abilityUser(key: ActorKey) {
  const a = ACTORS.find((x) => x.key === key)!;
  const org = orgs[a.side];
  return { id: users.get(key)!.id, roles: [a.role], organization: { id: org.id, kind: org.kind } };
}

/** What the API must answer, from the machine (and the rule that an unreadable claim is a 404). */
function expected(stage: Stage, key: ActorKey, action: ClaimActionName, claim: Claim) {
  const a = ACTORS.find((x) => x.key === key)!;
  const readable = a.side === 'c' || (a.side === 'm' && stage !== 'draft');
  if (!readable) return { status: 404, code: 'not_found' } as const;
  const view = {
    stage,
    contractorId: claim.contractorId,
    manufacturerId: claim.manufacturerId,
    evaluation: claim.evaluation,
  };
  const verdict = canPerform(view, abilityUser(key), action, PAYLOADS[action]);
  if (!verdict.ok) return { status: REFUSAL_STATUS[verdict.code], code: verdict.code } as const;
  if (MOVES_ELSEWHERE[action]) return { status: 409, code: 'claim.move_elsewhere' } as const;
  return { status: 200, to: verdict.to } as const;
}

describe('the transition matrix over HTTP', () => {
  it('refuses every move the machine refuses, with its status and code, and changes nothing', async () => {
    let checked = 0;
    const allowed: { stage: Stage; key: ActorKey; action: ClaimActionName; to: Stage }[] = [];
    const outboxBefore = await outboxCount(t.ds);
    for (const stage of STAGES) {
      const claim = await createClaimAt(t.ds, world, stage, {
        filedById: users.get('c:installer')!.id,
        reviewerId: users.get('m:reviewer')!.id,
      });
      const before = await snapshotClaim(t.ds, claim.id);
      for (const { key } of ACTORS) {
        for (const action of ACTION_NAMES) {
          const want = expected(stage, key, action, claim);
          if (want.status === 200) {
            allowed.push({ stage, key, action, to: want.to as Stage });
            continue;
          }
          const res = await agents
            .get(key)!
            .post(`/api/claims/${claim.id}/actions/${action}`)
            .send(PAYLOADS[action]);
          expect({ stage, key, action, status: res.status, code: res.body.error?.code }).toEqual({
            stage,
            key,
            action,
            status: want.status,
            code: want.code,
          });
          expect(res.body.error.message).toBeTruthy();
          checked++;
        }
      }
      expect(await snapshotClaim(t.ds, claim.id), `claim at ${stage} unchanged`).toEqual(before);
    }
    expect(await outboxCount(t.ds)).toBe(outboxBefore);
    expect(checked).toBeGreaterThan(STAGES.length * ACTORS.length * ACTION_NAMES.length - 40);
    // The moves the machine allows this route to make, by the machine's own count (ALLOWED in the stage test,
    // less the four that have their own routes).
    expect(allowed.length).toBe(23);
  }, 300_000);

  it('performs every allowed move: the machine’s stage, version + 1, one audit row of the move', async () => {
    let performed = 0;
    for (const stage of STAGES) {
      for (const { key } of ACTORS) {
        for (const action of ACTION_NAMES) {
          const probe = {
            stage,
            contractorId: orgs.c.id,
            manufacturerId: orgs.m.id,
            evaluation: null,
          } as unknown as Claim;
          const want0 = expected(stage, key, action, { ...probe, evaluation: null } as Claim);
          if (want0.status !== 200) continue;
          const claim = await createClaimAt(t.ds, world, stage, {
            filedById: users.get('c:installer')!.id,
            reviewerId: users.get('m:reviewer')!.id,
          });
          const want = expected(stage, key, action, claim);
          const res = await agents
            .get(key)!
            .post(`/api/claims/${claim.id}/actions/${action}`)
            .send(PAYLOADS[action]);
          expect({
            stage,
            key,
            action,
            status: res.status,
            body: res.status === 200 ? null : res.body,
          }).toEqual({ stage, key, action, status: 200, body: null });
          const after = await t.ds.getRepository(Claim).findOneByOrFail({ id: claim.id });
          expect(want.status).toBe(200);
          expect(after.stage).toBe('to' in want ? want.to : null);
          expect(after.version).toBe(claim.version + 1);
          const audit = await t.ds
            .getRepository(AuditEvent)
            .find({ where: { entityType: 'Claim', entityId: claim.id } });
          expect(audit.map((e) => e.action)).toEqual([ACTIONS[action].audit]);
          expect(audit[0].actorUserId).toBe(users.get(key)!.id);
          performed++;
        }
      }
    }
    expect(performed).toBe(23);
  }, 300_000);

  it('answers an unknown action with 400 and a stale If-Match with 409 claim.changed, changing nothing', async () => {
    const claim = await createClaimAt(t.ds, world, 'in_review');
    const before = await snapshotClaim(t.ds, claim.id);
    const reviewer = agents.get('m:reviewer')!;
    const unknown = await reviewer.post(`/api/claims/${claim.id}/actions/teleport`).send({});
    expect([unknown.status, unknown.body.error.code]).toEqual([400, 'claim.unknown_action']);
    const stale = await reviewer
      .post(`/api/claims/${claim.id}/actions/request_info`)
      .set('If-Match', `"${claim.version - 1 || 99}"`)
      .send(PAYLOADS.request_info);
    expect([stale.status, stale.body.error.code]).toEqual([409, 'claim.changed']);
    expect(stale.body.error.message).toMatch(/Someone else moved this claim/);
    const bad = await reviewer
      .post(`/api/claims/${claim.id}/actions/request_info`)
      .send({ message: '', extra: 1 });
    expect(bad.status).toBe(400);
    expect(await snapshotClaim(t.ds, claim.id)).toEqual(before);
  });
});
