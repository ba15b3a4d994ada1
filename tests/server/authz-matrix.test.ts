import crypto from 'node:crypto';
import fs from 'node:fs';
import type supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hashToken } from '../../server/modules/users/users.service';
import { AccountingMap } from '../../server/db/entities/accounting-map.entity';
import { Invitation } from '../../server/db/entities/invitation.entity';
import { PasswordReset } from '../../server/db/entities/password-reset.entity';
import { ApiToken } from '../../server/db/entities/api-token.entity';
import { WebhookDelivery, WebhookEndpoint } from '../../server/db/entities/webhook.entity';
import type { Organization } from '../../server/db/entities/organization.entity';
import type { ProductModel } from '../../server/db/entities/product-model.entity';
import type { User } from '../../server/db/entities/user.entity';
import type { WarrantyPolicy } from '../../server/db/entities/warranty-policy.entity';
import type { WarrantyPolicyVersion } from '../../server/db/entities/warranty-policy-version.entity';
import { listRoutes } from '../../server/lib/routes';
import { unsubscribeToken } from '../../server/modules/waiting/waiting-mail';
import {
  createPolicy,
  createProduct,
  installationPayload,
  productPayload,
  termsPayload,
} from '../support/catalogue-factories';
import { createDraft, daysAgo, goodClaimFields } from '../support/claim-factories';
import { createOrganization, createUser, signIn, TEST_PASSWORD } from '../support/factories';
import { createApprovedClaim } from '../support/credit-factories';
import { createClaimAt, createReviewWorld, type ReviewWorld } from '../support/review-factories';
import { pngImage } from '../support/upload-fixtures';
import { Claim } from '../../server/db/entities/claim.entity';
import { SavedView } from '../../server/db/entities/saved-view.entity';
import type { Stage } from '../../shared/claims/stages';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// Every route the server registers x every actor x own, foreign and missing record. The expected answers live
// in ONE table (ROUTES below): a route without an entry fails the test by name, and every mismatch is collected
// and reported together.
//
// Two worlds, each a contractor and a manufacturer tied by the contractor's installation of the manufacturer's
// product (and, as claims arrive, by claims). Actors are always from world 1; "own" records are in world 1,
// "foreign" ones in world 2, "missing" ones are random ids. Foreign must answer exactly like missing (status
// and body), except the public catalogues (products, policies), which every signed-in user may read.

const ACTORS = ['anon', 'installer', 'cAdmin', 'reviewer', 'accountant', 'mAdmin'] as const;
type Actor = (typeof ACTORS)[number];
type Member = Exclude<Actor, 'anon'>;
const KIND: Record<Member, 'contractor' | 'manufacturer'> = {
  installer: 'contractor',
  cAdmin: 'contractor',
  reviewer: 'manufacturer',
  accountant: 'manufacturer',
  mAdmin: 'manufacturer',
};
const CONTRACTORS: Member[] = ['installer', 'cAdmin'];
const MANUFACTURERS: Member[] = ['reviewer', 'accountant', 'mAdmin'];
const SIGNED_IN: Member[] = [...CONTRACTORS, ...MANUFACTURERS];

type World = {
  c: Organization;
  m: Organization;
  users: Record<Member, User>;
  /** A second member of each organisation, for the user routes. */
  colleague: { contractor: User; manufacturer: User };
  product: ProductModel;
  policy: WarrantyPolicy;
  version: WarrantyPolicyVersion;
  installationId: string;
  serial: string;
  /** The world's installer, signed in, for making records. */
  agent: supertest.Agent;
  draftId: string;
  /** A filed claim with a photo attached while it was a draft. */
  filedId: string;
  filedPhotoId: string;
  draftPhotoId: string;
  batchId: string;
  /** The review workflow's fixtures: claims written at any stage, an approval letter, a conversation file. */
  review: ReviewWorld;
  approvedId: string;
  letterDocId: string;
  answeredId: string;
  answerFileId: string;
  /** A claim waiting on the installer, with one uploaded file not yet sent. */
  pendingId: string;
  pendingFileId: string;
  /** A credit memo issued for an approved claim. */
  memoId: string;
};

type Params = Record<string, string>;
/** own: the actor's world; foreign: the other world; missing: made-up ids; crossed: own first id, foreign second. */
type Case = 'own' | 'foreign' | 'missing' | 'crossed';
type Ctx = { actor: Actor; world: World; own: World; params: Params };

type Entry = {
  /** The actors that pass authorisation on their own (or tied) record, with the status each then gets. */
  ok?: Partial<Record<Actor, number>>;
  /** What the other signed-in actors get: 403 (may read, may not act) or 404 (may not even read). */
  denied?: number | Partial<Record<Member, number>>;
  /** Foreign records: hidden (404 like missing) or public (catalogue: readable by everyone signed in). */
  foreign?: 'hidden' | 'public' | 'none';
  /**
   * Route parameters naming a record of the given world (as seen by this actor); called for every case, so a
   * route that changes or destroys its record makes a fresh one here.
   */
  target?: (w: World, actor: Actor) => Params | Promise<Params>;
  /** A valid body, so that validation never hides the authorisation answer. */
  body?: (c: Ctx) => unknown;
  query?: string | ((c: Ctx) => string);
  /** The actors refused by role are refused before any record is looked up: the same answer whatever the record. */
  roleCheckFirst?: boolean;
  /** Use a new session for every case (the route ends or replaces it). */
  freshSession?: boolean;
  /** The route ends the actor's other sessions: every shared session signs in again after each case. */
  endsOtherSessions?: boolean;
  /** Why an allowed actor still gets 409/422 here. */
  stateReason?: string;
  /** Route parameters that are not record ids (an action's name): kept as they are in every case. */
  fixed?: string[];
  /** What an own first id with the other world's second id answers, where not the usual (404 once past the check). */
  crossed?: number;
  /** Request headers beyond the session (an Idempotency-Key). */
  headers?: () => Record<string, string>;
  /** A multipart upload instead of a JSON body. */
  upload?: () => Promise<{ purpose: string; file: Buffer; filename: string }>;
  /** The body names a record (no route parameter): also send it naming the other world's record. */
  foreignBody?: boolean;
  /** The same route at the stages that matter: each variant overrides parts of the entry. */
  variants?: Record<string, Partial<Omit<Entry, 'variants'>>>;
};

// Invented demo codes.
const ACCOUNTING_MAP = {
  debitAccount: { code: '5410', name: 'Warranty credits' },
  creditAccount: { code: '2440', name: 'Contractor credits payable' },
  journalCode: 'WC',
};
const validClaim = JSON.parse(fs.readFileSync('tests/shared/engine/fixtures/valid-claim.json', 'utf8'));
const unique = () => crypto.randomBytes(4).toString('hex');
const colleagueOf = (w: World, a: Actor) =>
  a !== 'anon' && KIND[a] === 'manufacturer' ? w.colleague.manufacturer : w.colleague.contractor;
/** Another session of the actor's counterpart in that world (the installer's for anon), by its public id. */
async function otherSessionOf(w: World, a: Actor) {
  const agent = await signIn(t.request(), w.users[a === 'anon' ? 'installer' : a].email);
  const list = (await agent.get('/api/auth/sessions')).body.items as { id: string; current: boolean }[];
  return { id: list.find((s) => s.current)!.id };
}
const everyone = (status: number) =>
  Object.fromEntries(ACTORS.map((a) => [a, status])) as Record<Actor, number>;
const members = (list: Member[], status: number) =>
  Object.fromEntries(list.map((a) => [a, status])) as Partial<Record<Actor, number>>;

/** A reset link's token for a new member of no particular world. */
async function newPasswordReset() {
  const token = crypto.randomBytes(32).toString('base64url');
  const org = await createOrganization(t.ds, 'contractor');
  const user = await createUser(t.ds, org, ['installer']);
  await t.ds.getRepository(PasswordReset).insert({
    userId: user.id,
    tokenHash: hashToken(token),
    expiresAt: new Date(Date.now() + 30 * 60_000),
    usedAt: null,
  });
  return token;
}

async function newInvitation(w: World) {
  const token = crypto.randomBytes(32).toString('base64url');
  const invited = await createUser(t.ds, w.c, ['installer'], { status: 'invited' });
  await t.ds.getRepository(Invitation).insert({
    userId: invited.id,
    tokenHash: hashToken(token),
    expiresAt: new Date(Date.now() + 86_400_000),
    usedAt: null,
    createdById: w.users.cAdmin.id,
  });
  return { token };
}

async function newApiToken(w: World, a: Actor) {
  const manufacturer = a !== 'anon' && KIND[a] === 'manufacturer';
  const id = crypto.randomUUID();
  await t.ds.getRepository(ApiToken).insert({
    id,
    organizationId: manufacturer ? w.m.id : w.c.id,
    name: `Matrix ${unique()}`,
    roles: [manufacturer ? 'reviewer' : 'installer'],
    secretHash: crypto.randomBytes(32).toString('hex'),
    hint: 'lpt_matrix',
    createdById: manufacturer ? w.users.mAdmin.id : w.users.cAdmin.id,
    expiresAt: new Date(Date.now() + 86_400_000),
  });
  return { id };
}

async function newWebhook(w: World, a: Actor) {
  const manufacturer = a !== 'anon' && KIND[a] === 'manufacturer';
  const endpoint = await t.ds.getRepository(WebhookEndpoint).save(
    t.ds.getRepository(WebhookEndpoint).create({
      organizationId: manufacturer ? w.m.id : w.c.id,
      url: 'http://127.0.0.1:9/matrix',
      events: ['claim.filed'],
      signingSecret: 'lpwhsec_matrix',
      createdById: manufacturer ? w.users.mAdmin.id : w.users.cAdmin.id,
      disabledAt: null,
    }),
  );
  // Already delivered, so no worker ever picks it up.
  const delivery = await t.ds.getRepository(WebhookDelivery).save(
    t.ds.getRepository(WebhookDelivery).create({
      endpointId: endpoint.id,
      eventId: crypto.randomUUID(),
      event: 'claim.filed',
      body: '{}',
      status: 'delivered',
      attempts: 1,
      nextAttemptAt: new Date(),
    }),
  );
  return { id: endpoint.id, deliveryId: delivery.id };
}

async function newSavedView(w: World) {
  const view = await t.ds
    .getRepository(SavedView)
    .save({ userId: w.users.reviewer.id, name: `View ${unique()}`, filters: { assignee: 'me' as const } });
  return view.id;
}

async function newDraft(w: World) {
  return (await createDraft(w.agent, w.installationId, goodClaimFields(w.serial))).id;
}
async function newPhoto(w: World, claimId: string) {
  const r = await w.agent
    .post(`/api/claims/${claimId}/attachments`)
    .field('purpose', 'failure')
    .attach('file', await pngImage(64, 48), 'strings.png');
  if (r.status !== 201) throw new Error(`photo fixture: ${r.status} ${JSON.stringify(r.body)}`);
  return r.body.attachment.id as string;
}
async function fileIt(w: World, claimId: string) {
  const r = await w.agent.post(`/api/claims/${claimId}/file`).send({});
  if (r.status !== 200) throw new Error(`filing fixture: ${r.status} ${JSON.stringify(r.body)}`);
  return claimId;
}
const newFiled = async (w: World) => fileIt(w, await newDraft(w));
const BATCH_HEADER =
  'serial,units,failed_on,symptoms,supply_volts,input_watts,power_factor,driver_output_volts,driver_output_amps,water_ingress,narrative';
const batchCsv = (w: World) =>
  `${BATCH_HEADER}\n${w.serial},1,${daysAgo(9)},dark,277,,,,,no,Completely dark since Monday.`;
async function newBatch(w: World) {
  const r = await w.agent.post('/api/claims/batches').send({ csv: batchCsv(w), filename: 'matrix.csv' });
  if (r.status !== 201) throw new Error(`batch fixture: ${r.status} ${JSON.stringify(r.body)}`);
  return r.body.batchId as string;
}
const photoUpload = async () => ({
  purpose: 'failure',
  file: await pngImage(64, 48),
  filename: 'matrix.png',
});

// createClaimAt numbers every claim in June 2025 (5 random symbols): with thousands in the test database a
// number is sometimes taken; draw again.
async function claimAt(w: World, stage: Stage): Promise<string> {
  for (let attempt = 0; ; attempt++) {
    try {
      return (await createClaimAt(t.ds, w.review, stage, { reviewerId: w.users.reviewer.id })).id;
    } catch (err) {
      if (attempt > 4 || !String((err as Error).message).includes('uq_claims_number')) throw err;
    }
  }
}
const creditOf = async (id: string) =>
  (await t.ds.getRepository(Claim).findOneBy({ id }))?.expectedCredit ?? '96.00';
async function newConversationUpload(w: World, claimId: string) {
  const r = await w.agent
    .post(`/api/claims/${claimId}/conversation/uploads`)
    .field('purpose', 'nameplate')
    .attach('file', await pngImage(32, 24), 'nameplate.png');
  if (r.status !== 201) throw new Error(`conversation file fixture: ${r.status} ${JSON.stringify(r.body)}`);
  return r.body.attachment.id as string;
}

const approvedClaim = async (w: World) =>
  (await createApprovedClaim(t.ds, { manufacturer: w.m, contractor: w.c, amount: '73.41' })).id;
async function newMemo(w: World) {
  const accountant = await signIn(t.request(), w.users.accountant.email);
  const claimId = await approvedClaim(w);
  const r = await accountant
    .post(`/api/claims/${claimId}/credits`)
    .set('Idempotency-Key', crypto.randomUUID())
    .send({});
  if (r.status !== 201) throw new Error(`credit fixture: ${r.status} ${JSON.stringify(r.body)}`);
  return r.body.creditMemo.id as string;
}
// Credit memos: the two parties' to read (the contractor's accountants-to-be and the manufacturer's
// accountant); only the accountant issues, voids, lists the queue and exports.
const MEMO_READERS = members([...CONTRACTORS, 'accountant'], 200);

/** One variant per move: a fresh claim at a stage where the move is legal, and a valid body for it. */
function move(
  stage: Stage,
  ok: Partial<Record<Actor, number>>,
  body: (c: Ctx) => unknown,
  extra: Partial<Entry> = {},
): Partial<Entry> {
  return {
    ok,
    target: async (w) => ({ id: await claimAt(w, stage), action: '' }),
    body,
    ...extra,
  };
}
const REVIEWER = { reviewer: 200 };
const MOVES: Record<string, Partial<Entry>> = {
  start_review: move('filed', REVIEWER, () => ({})),
  request_info: move('in_review', REVIEWER, () => ({ message: 'Send a photo of the nameplate, please.' })),
  answer_info: move('needs_info', members(CONTRACTORS, 200), () => ({
    message: 'Photo attached on the claim.',
  })),
  request_return: move('in_review', REVIEWER, () => ({
    shipTo: {
      name: 'Returns bench',
      line1: '400 Foundry Way',
      city: 'Millbrook',
      postalCode: '45402',
      country: 'US',
    },
  })),
  record_shipment: move('return_requested', members(CONTRACTORS, 200), () => ({
    carrier: 'Parcel Co',
    trackingNumber: '1Z 999 AA1',
    shippedOn: daysAgo(1),
  })),
  receive_unit: move('return_requested', REVIEWER, () => ({
    receivedOn: daysAgo(0),
    condition: 'as_described',
  })),
  record_bench_test: move('unit_received', REVIEWER, () => ({
    testedOn: daysAgo(0),
    result: 'failure_confirmed',
    readings: {
      supplyVolts: 277,
      inputWatts: 19.8,
      driverOutputVolts: 48,
      driverOutputAmps: 0.44,
      strings: [{ volts: 48, darkLeds: 16 }],
    },
  })),
  approve: move('in_review', REVIEWER, async (c) => ({
    resolution: 'credit',
    amount: await creditOf(c.params.id),
    overrideReason: 'Checked against the photos.',
  })),
  deny: move('in_review', REVIEWER, () => ({
    reasonCodes: ['physical_damage'],
    note: 'The housing is cracked.',
    overrideReason: 'Seen on the photos.',
  })),
  reopen: move('approved', REVIEWER, () => ({ reason: 'New bench readings came in.' })),
  withdraw: move('filed', members(CONTRACTORS, 200), () => ({ reason: 'Loose connector.' })),
  // Moves with their own routes: the actor who may make them is sent there (409); anyone else is refused first.
  file: move('draft', members(CONTRACTORS, 409), () => ({}), {
    denied: members(MANUFACTURERS, 404),
    stateReason: 'filing has its own route',
  }),
  credit: move('approved', { accountant: 409 }, () => ({}), { stateReason: 'credits have their own route' }),
  void_credit: move('credited', { accountant: 409 }, () => ({ reason: 'Issued twice.' }), {
    stateReason: 'voiding has its own route',
  }),
  // Closing is mostly the server's own move (settled claims), and a reviewer's.
  close: move('denied', REVIEWER, () => ({})),
};

// Claims: the contractor's from the draft on; the manufacturer's only once filed (a draft is 404 to them).
const CLAIM_READ: Partial<Entry> = { ok: members(SIGNED_IN, 200) };
const DRAFT_READ: Partial<Entry> = { ok: members(CONTRACTORS, 200), denied: members(MANUFACTURERS, 404) };

// ---------------------------------------------------------------------------------------------------------
// The table.
const ROUTES: Record<string, Entry> = {
  'GET /api/health': { ok: everyone(200) },
  // The API's description: public, the same for everyone.
  'GET /api/openapi.json': { ok: everyone(200) },
  'POST /api/auth/login': {
    ok: everyone(200),
    freshSession: true,
    body: (c) => ({
      email: (c.actor === 'anon' ? c.own.users.installer : c.own.users[c.actor]).email,
      password: TEST_PASSWORD,
    }),
  },
  'POST /api/auth/logout': { ok: everyone(204), freshSession: true },
  'GET /api/auth/me': { ok: members(SIGNED_IN, 200) },
  // Password recovery: no sign-in (the e-mailed token is the credential); an address nobody has, so no e-mail.
  'POST /api/auth/password/forgot': {
    ok: everyone(202),
    body: () => ({ email: `nobody-${unique()}@example.test` }),
  },
  'POST /api/auth/password/reset': {
    ok: everyone(200),
    body: async () => ({ token: await newPasswordReset(), password: 'a long enough password for the test' }),
  },
  // A real change would end the actor's other sessions, the matrix's own among them.
  'POST /api/auth/password/change': {
    ok: members(SIGNED_IN, 400),
    stateReason: 'a wrong current password: the answer after authentication, changing nothing',
    body: () => ({ currentPassword: 'not the password', newPassword: 'a long enough password for the test' }),
  },

  // The second factor: one's own, so nothing is foreign. Without a sign-in waiting for a code, the second step is
  // a 401 for everyone.
  'POST /api/auth/login/second-factor': { ok: everyone(401), body: () => ({ code: '123456' }) },
  'GET /api/auth/second-factor': { ok: members(SIGNED_IN, 200) },
  'POST /api/auth/second-factor/enrollment': { ok: members(SIGNED_IN, 200), freshSession: true },
  'POST /api/auth/second-factor/enrollment/confirm': {
    ok: members(SIGNED_IN, 409),
    stateReason: 'a fresh session has no enrolment started',
    freshSession: true,
    body: () => ({ code: '123456' }),
  },
  'DELETE /api/auth/second-factor': {
    ok: members(SIGNED_IN, 409),
    stateReason: 'the matrix users have no second factor to remove',
    body: () => ({ password: TEST_PASSWORD }),
  },
  // Sessions: one's own only; another person's session is as missing as a made-up one.
  'GET /api/auth/sessions': { ok: members(SIGNED_IN, 200) },
  'POST /api/auth/sessions/sign-out-others': { ok: members(SIGNED_IN, 200), endsOtherSessions: true },
  'DELETE /api/auth/sessions/:id': {
    ok: members(SIGNED_IN, 204),
    target: (w, a) => otherSessionOf(w, a),
  },
  // The organisation's security settings: its members read them, its administrators change them. Always the
  // signed-in person's own organisation: no id, so nothing foreign to reach.
  'GET /api/organizations/current/security': { ok: members(SIGNED_IN, 200) },
  'PATCH /api/organizations/current/security': {
    ok: members(['cAdmin', 'mAdmin'], 200),
    denied: 403,
    // Never true here: every matrix user would be held at enrolment.
    body: () => ({ requireSecondFactor: false }),
  },
  'GET /api/security-events': { ok: members(['cAdmin', 'mAdmin'], 200) },

  // The one-time token is the credential: no sign-in, and nothing to be foreign to.
  'GET /api/invitations/:token': { ok: everyone(200), foreign: 'none', target: (w) => newInvitation(w) },
  'POST /api/invitations/:token/accept': {
    ok: everyone(200),
    foreign: 'none',
    target: (w) => newInvitation(w),
    body: () => ({ password: 'a long enough password for the test' }),
  },

  'GET /api/organizations/current': { ok: members(SIGNED_IN, 200) },
  // A manufacturer's administrator sets the second-approval amount; everyone else is refused by role.
  'PATCH /api/organizations/current': {
    ok: { mAdmin: 200 },
    body: () => ({ creditSecondApprovalAbove: null }),
  },
  'GET /api/users': { ok: members(['cAdmin', 'mAdmin'], 200) },
  'POST /api/users/invitations': {
    ok: members(['cAdmin', 'mAdmin'], 202),
    body: (c) => ({
      email: `invite-${unique()}@example.test`,
      name: 'Invited person',
      roles: [c.actor !== 'anon' && KIND[c.actor] === 'manufacturer' ? 'reviewer' : 'installer'],
    }),
  },
  // A colleague's profile: only the administrator may read it, so the others get 404.
  'GET /api/users/:id': {
    ok: members(['cAdmin', 'mAdmin'], 200),
    denied: 404,
    target: (w, a) => ({ id: colleagueOf(w, a).id }),
  },
  'POST /api/users/:id/second-factor/reset': {
    ok: members(['cAdmin', 'mAdmin'], 204),
    denied: 404,
    target: (w, a) => ({ id: colleagueOf(w, a).id }),
    body: () => ({}),
  },
  'PATCH /api/users/:id': {
    ok: members(['cAdmin', 'mAdmin'], 200),
    denied: 404,
    target: (w, a) => ({ id: colleagueOf(w, a).id }),
    body: () => ({ name: `Renamed ${unique()}` }),
  },

  // API tokens: the organisation's administrators only; someone else's token is not even readable (404).
  'GET /api/api-tokens': { ok: members(['cAdmin', 'mAdmin'], 200) },
  'POST /api/api-tokens': {
    ok: members(['cAdmin', 'mAdmin'], 201),
    body: (c) => ({
      name: `Matrix ${unique()}`,
      roles: [c.actor !== 'anon' && KIND[c.actor] === 'manufacturer' ? 'reviewer' : 'installer'],
      expiresInDays: 30,
    }),
  },
  'DELETE /api/api-tokens/:id': {
    ok: members(['cAdmin', 'mAdmin'], 200),
    denied: 404,
    target: (w, a) => newApiToken(w, a),
  },

  // Webhooks: the same, and a delivery under another organisation's endpoint is as missing as a made-up one.
  'GET /api/webhooks': { ok: members(['cAdmin', 'mAdmin'], 200) },
  'POST /api/webhooks': {
    ok: members(['cAdmin', 'mAdmin'], 201),
    body: () => ({ url: 'http://127.0.0.1:9/matrix', events: ['claim.filed'] }),
  },
  'DELETE /api/webhooks/:id': {
    ok: members(['cAdmin', 'mAdmin'], 200),
    denied: 404,
    target: (w, a) => newWebhook(w, a),
  },
  'GET /api/webhooks/:id/deliveries': {
    ok: members(['cAdmin', 'mAdmin'], 200),
    denied: 404,
    target: (w, a) => newWebhook(w, a),
  },
  'POST /api/webhooks/:id/test': {
    ok: members(['cAdmin', 'mAdmin'], 201),
    denied: 404,
    target: (w, a) => newWebhook(w, a),
  },
  'POST /api/webhooks/:id/deliveries/:deliveryId/resend': {
    ok: members(['cAdmin', 'mAdmin'], 201),
    denied: 404,
    target: (w, a) => newWebhook(w, a),
  },

  // Each reviewer's own saved review-desk views; anyone else's view is hidden like a missing one.
  'GET /api/saved-views': { ok: { reviewer: 200 }, denied: 403 },
  'POST /api/saved-views': {
    ok: { reviewer: 201 },
    denied: 403,
    body: () => ({ name: `View ${unique()}`, filters: { assignee: 'me', sort: 'stageChangedAt' } }),
  },
  'DELETE /api/saved-views/:id': {
    ok: { reviewer: 204 },
    denied: 404,
    target: async (w) => ({ id: await newSavedView(w) }),
  },

  // What waits on the signed-in person: their own list, no record ids.
  'GET /api/waiting': { ok: members(SIGNED_IN, 200) },
  'POST /api/waiting/read': { ok: members(SIGNED_IN, 200), body: () => ({ keys: ['memo_due:none:0'] }) },
  'GET /api/waiting/email': { ok: members(SIGNED_IN, 200) },
  'PUT /api/waiting/email': { ok: members(SIGNED_IN, 200), body: () => ({ mode: 'daily' }) },
  // The e-mail's unsubscribe link: the signed token is the credential, no sign-in; nothing to be foreign to.
  'GET /api/waiting/unsubscribe/:token': {
    ok: everyone(200),
    foreign: 'none',
    target: (w) => ({ token: unsubscribeToken(t.config.sessionSecret, w.users.installer.id) }),
  },

  'GET /api/ageing': { ok: { mAdmin: 200 }, denied: 403 },
  'GET /api/ageing/export': { ok: { mAdmin: 200 }, denied: 403 },
  'PUT /api/ageing/targets': { ok: { mAdmin: 200 }, denied: 403, body: () => ({ targets: { filed: 3 } }) },

  'POST /api/evaluations': { ok: members(SIGNED_IN, 200), body: () => validClaim },

  'GET /api/products': { ok: members(SIGNED_IN, 200) },
  'POST /api/products': { ok: { mAdmin: 201 }, body: () => productPayload() },
  'GET /api/products/import-template': { ok: { mAdmin: 200 } },
  'POST /api/products/import': { ok: { mAdmin: 200 }, query: 'dryRun=true', body: () => ({ rows: [] }) },
  'GET /api/products/:id': {
    ok: members(SIGNED_IN, 200),
    foreign: 'public',
    target: (w) => ({ id: w.product.id }),
  },
  'PATCH /api/products/:id': {
    ok: { mAdmin: 200 },
    foreign: 'public',
    target: (w) => ({ id: w.product.id }),
    body: () => ({ name: `Troffer ${unique()}` }),
  },
  'GET /api/products/:id/history': {
    ok: members(SIGNED_IN, 200),
    foreign: 'public',
    target: (w) => ({ id: w.product.id }),
  },

  'GET /api/policies': { ok: members(SIGNED_IN, 200) },
  'POST /api/policies': {
    ok: { mAdmin: 201 },
    // A model is covered by one policy at a time: each case brings an uncovered one.
    body: async (c) => ({
      name: `Policy ${unique()}`,
      productModelIds: [(await createProduct(t.ds, c.own.m)).id],
      terms: termsPayload(),
    }),
  },
  'GET /api/policies/:id': {
    ok: members(SIGNED_IN, 200),
    foreign: 'public',
    target: (w) => ({ id: w.policy.id }),
  },
  'PATCH /api/policies/:id': {
    ok: { mAdmin: 200 },
    foreign: 'public',
    target: (w) => ({ id: w.policy.id }),
    body: () => ({ name: `Policy ${unique()}` }),
  },
  'POST /api/policies/:id/versions': {
    ok: { mAdmin: 201 },
    foreign: 'public',
    target: (w) => ({ id: w.policy.id }),
    body: () => ({ ...termsPayload({ effectiveFrom: '2025-01-01' }), changeNote: 'Matrix' }),
  },
  'PATCH /api/policies/:id/versions/:versionId': {
    ok: { mAdmin: 409 },
    stateReason: 'versions are immutable: the owner gets 409 after authorisation',
    // The version is looked up under the policy before the right to change it is checked.
    crossed: 404,
    foreign: 'public',
    target: (w) => ({ id: w.policy.id, versionId: w.version.id }),
    body: () => ({ unitCredit: '1.00' }),
  },
  'GET /api/policies/:id/history': {
    ok: members(SIGNED_IN, 200),
    foreign: 'public',
    target: (w) => ({ id: w.policy.id }),
  },

  // Installations are the contractor's; the manufacturer of the installed product may read them.
  'GET /api/installations': { ok: members(SIGNED_IN, 200) },
  'POST /api/installations': {
    ok: members(CONTRACTORS, 201),
    body: (c) => installationPayload(c.own.product.id),
  },
  'GET /api/installations/import-template': { ok: members(CONTRACTORS, 200) },
  'POST /api/installations/import': {
    ok: members(CONTRACTORS, 200),
    query: 'dryRun=true',
    body: () => ({ rows: [] }),
  },
  'GET /api/installations/:id': { ok: members(SIGNED_IN, 200), target: (w) => ({ id: w.installationId }) },
  'PATCH /api/installations/:id': {
    ok: members(CONTRACTORS, 200),
    target: (w) => ({ id: w.installationId }),
    body: () => ({ siteName: `Site ${unique()}` }),
  },
  'GET /api/installations/:id/history': {
    ok: members(SIGNED_IN, 200),
    target: (w) => ({ id: w.installationId }),
  },

  // Claims. A claim ties its contractor and manufacturer; a draft is the contractor's alone.
  'GET /api/claims': { ok: members(SIGNED_IN, 200) },
  'POST /api/claims': {
    ok: members(CONTRACTORS, 201),
    // The manufacturer may read the installation (their product) but not start a claim on it.
    foreignBody: true,
    body: (c) => ({ installationId: c.world.installationId, ...goodClaimFields(c.world.serial) }),
  },
  'GET /api/claims/:id': {
    variants: {
      draft: { ...DRAFT_READ, target: (w) => ({ id: w.draftId }) },
      filed: { ...CLAIM_READ, target: (w) => ({ id: w.filedId }) },
    },
  },
  'PATCH /api/claims/:id': {
    body: () => ({ version: 1, narrative: 'Edited by the matrix.' }),
    variants: {
      draft: { ok: members(CONTRACTORS, 200), denied: 404, target: async (w) => ({ id: await newDraft(w) }) },
      filed: {
        ok: members(CONTRACTORS, 409),
        stateReason: 'a filed claim is no longer editable',
        target: async (w) => ({ id: await newFiled(w) }),
      },
    },
  },
  'POST /api/claims/:id/file': {
    body: () => ({}),
    variants: {
      draft: { ok: members(CONTRACTORS, 200), denied: 404, target: async (w) => ({ id: await newDraft(w) }) },
      // Filing a filed claim answers it as it is (a retry or a double tap files once).
      filed: { ok: members(CONTRACTORS, 200), target: async (w) => ({ id: await newFiled(w) }) },
    },
  },
  'DELETE /api/claims/:id': {
    variants: {
      draft: { ok: members(CONTRACTORS, 204), denied: 404, target: async (w) => ({ id: await newDraft(w) }) },
      filed: {
        ok: members(CONTRACTORS, 409),
        stateReason: 'only a draft can be deleted',
        target: async (w) => ({ id: await newFiled(w) }),
      },
    },
  },

  // Attachments: read with the claim; added while a draft (or while waiting on the installer), removed only
  // before filing. Downloads included: a foreign download is a 404.
  'GET /api/claims/:id/attachments': {
    variants: {
      draft: { ...DRAFT_READ, target: (w) => ({ id: w.draftId }) },
      filed: { ...CLAIM_READ, target: (w) => ({ id: w.filedId }) },
    },
  },
  'POST /api/claims/:id/attachments': {
    upload: photoUpload,
    variants: {
      draft: { ok: members(CONTRACTORS, 201), denied: 404, target: async (w) => ({ id: await newDraft(w) }) },
      filed: { ok: {}, target: (w) => ({ id: w.filedId }) },
    },
  },
  ...Object.fromEntries(
    ['', '/content', '/thumbnail'].map((suffix) => [
      `GET /api/claims/:id/attachments/:attachmentId${suffix}`,
      {
        variants: {
          draft: { ...DRAFT_READ, target: (w: World) => ({ id: w.draftId, attachmentId: w.draftPhotoId }) },
          filed: { ...CLAIM_READ, target: (w: World) => ({ id: w.filedId, attachmentId: w.filedPhotoId }) },
        },
      } satisfies Entry,
    ]),
  ),
  'DELETE /api/claims/:id/attachments/:attachmentId': {
    variants: {
      draft: {
        ok: members(CONTRACTORS, 204),
        denied: 404,
        target: async (w) => {
          const id = await newDraft(w);
          return { id, attachmentId: await newPhoto(w, id) };
        },
      },
      filed: { ok: {}, target: (w) => ({ id: w.filedId, attachmentId: w.filedPhotoId }) },
    },
  },

  // The review workflow: every move at a stage where it is legal, for the role that makes it.
  'POST /api/claims/:id/actions/:action': {
    fixed: ['action'],
    variants: Object.fromEntries(
      Object.entries(MOVES).map(([action, v]) => [
        action,
        { ...v, target: async (w: World, a: Actor) => ({ ...(await v.target!(w, a)), action }) },
      ]),
    ),
  },
  'POST /api/claims/:id/assign': {
    ok: REVIEWER,
    target: async (w) => ({ id: await claimAt(w, 'in_review') }),
    body: () => ({ assigneeId: null }),
  },
  'GET /api/claims/:id/workflow': {
    variants: {
      draft: { ...DRAFT_READ, target: (w) => ({ id: w.draftId }) },
      filed: { ...CLAIM_READ, target: (w) => ({ id: w.filedId }) },
    },
  },
  'GET /api/claims/:id/documents/:docId': {
    ...CLAIM_READ,
    target: (w) => ({ id: w.approvedId, docId: w.letterDocId }),
  },
  // The next answer's files: the contractor's own until sent (the manufacturer sees no such collection: 404);
  // added only while the question is open.
  'POST /api/claims/:id/conversation/uploads': {
    upload: photoUpload,
    denied: members(MANUFACTURERS, 404),
    variants: {
      needs_info: {
        ok: members(CONTRACTORS, 201),
        target: async (w) => ({ id: await claimAt(w, 'needs_info') }),
      },
      in_review: { ok: {}, target: async (w) => ({ id: await claimAt(w, 'in_review') }) },
    },
  },
  'GET /api/claims/:id/conversation/uploads': {
    ok: members(CONTRACTORS, 200),
    denied: members(MANUFACTURERS, 404),
    target: (w) => ({ id: w.pendingId }),
  },
  ...Object.fromEntries(
    ['', '/content', '/thumbnail'].map((suffix) => [
      `GET /api/claims/:id/conversation/uploads/:attachmentId${suffix}`,
      {
        ok: members(CONTRACTORS, 200),
        denied: members(MANUFACTURERS, 404),
        target: (w: World) => ({ id: w.pendingId, attachmentId: w.pendingFileId }),
      } satisfies Entry,
    ]),
  ),
  'DELETE /api/claims/:id/conversation/uploads/:attachmentId': {
    ok: members(CONTRACTORS, 204),
    denied: members(MANUFACTURERS, 404),
    target: async (w) => {
      const id = await claimAt(w, 'needs_info');
      return { id, attachmentId: await newConversationUpload(w, id) };
    },
  },
  'GET /api/claims/:id/conversation/files/:fileId': {
    ...CLAIM_READ,
    target: (w) => ({ id: w.answeredId, fileId: w.answerFileId }),
  },
  'GET /api/claims/:id/conversation/files/:fileId/thumbnail': {
    ...CLAIM_READ,
    target: (w) => ({ id: w.answeredId, fileId: w.answerFileId }),
  },
  'GET /api/review/queue': { ok: REVIEWER },
  'GET /api/review/summary': { ok: REVIEWER },
  // The desk's pickers: contractors that file with the manufacturer (its reviewers and administrators), and the
  // reviewers a claim can be handed to (those who may assign).
  'GET /api/review/contractors': { ok: members(['reviewer', 'mAdmin'], 200) },
  'GET /api/review/reviewers': { ok: REVIEWER },

  // Credits: one memo per approved claim, by the manufacturer's accountant, with an Idempotency-Key.
  'POST /api/claims/:id/credits': {
    ok: { accountant: 201 },
    target: async (w) => ({ id: await approvedClaim(w) }),
    headers: () => ({ 'Idempotency-Key': crypto.randomUUID() }),
    body: () => ({}),
  },
  'GET /api/credits': { ok: MEMO_READERS },
  'GET /api/credits/queue': { ok: { accountant: 200 } },
  'GET /api/credits/balances': { ok: MEMO_READERS },
  'GET /api/credits/export': { ok: { accountant: 200 }, query: 'from=2025-01-01&to=2026-12-31' },
  'GET /api/credits/cost': { ok: { accountant: 200 } },
  // The accounts the journal books memos to: the manufacturer's accountants and administrators; the journal
  // itself is an export (its accountants).
  'GET /api/credits/accounting-map': { ok: { accountant: 200, mAdmin: 200 } },
  'PUT /api/credits/accounting-map': { ok: { accountant: 200, mAdmin: 200 }, body: () => ACCOUNTING_MAP },
  'GET /api/credits/journal': {
    ok: { accountant: 200 },
    query: 'from=2026-01-01&to=2026-12-31',
    target: async (w) => {
      await t.ds.getRepository(AccountingMap).upsert(
        {
          organizationId: w.m.id,
          debitAccountCode: ACCOUNTING_MAP.debitAccount.code,
          debitAccountName: ACCOUNTING_MAP.debitAccount.name,
          creditAccountCode: ACCOUNTING_MAP.creditAccount.code,
          creditAccountName: ACCOUNTING_MAP.creditAccount.name,
          journalCode: ACCOUNTING_MAP.journalCode,
        },
        ['organizationId'],
      );
      return {};
    },
  },
  'GET /api/credits/:id': { ok: MEMO_READERS, denied: 404, target: (w) => ({ id: w.memoId }) },
  'GET /api/credits/:id/pdf': { ok: MEMO_READERS, denied: 404, target: (w) => ({ id: w.memoId }) },
  'POST /api/credits/:id/void': {
    ok: { accountant: 201 },
    denied: { installer: 403, cAdmin: 403, reviewer: 404, mAdmin: 404 },
    target: async (w) => ({ id: await newMemo(w) }),
    body: () => ({ reason: 'Issued against the wrong account.' }),
  },

  // Reliability analytics for the manufacturer's reviewers and administrators; the reserve for its accountants.
  // Per product model: another manufacturer's model is as missing as a made-up one.
  ...Object.fromEntries(
    ['life', 'failure-modes'].map((r) => [
      `GET /api/analytics/${r}`,
      {
        ok: members(['reviewer', 'mAdmin'], 200),
        query: (c: Ctx) => `productModelId=${c.world.product.id}`,
        foreignBody: true,
        roleCheckFirst: true,
      } satisfies Entry,
    ]),
  ),
  'GET /api/analytics/claims-ageing': { ok: members(['reviewer', 'mAdmin'], 200) },
  'GET /api/reserve': { ok: members(['accountant', 'mAdmin'], 200) },

  // Bulk filing: the contractor's own batches only; anyone else's batch is as missing as a made-up one.
  'GET /api/claims/batches/template.csv': { ok: members(CONTRACTORS, 200) },
  'POST /api/claims/batches': {
    ok: members(CONTRACTORS, 200),
    query: 'dryRun=true',
    body: (c) => ({ csv: batchCsv(c.own) }),
  },
  'GET /api/claims/batches/:id': {
    ok: members(CONTRACTORS, 200),
    denied: 404,
    target: (w) => ({ id: w.batchId }),
  },
  'POST /api/claims/batches/:id/file': {
    ok: members(CONTRACTORS, 200),
    denied: 404,
    target: async (w) => ({ id: await newBatch(w) }),
    body: () => ({}),
  },

  // Demo mode only: an administrator reads their own organisation's mail.
  'GET /api/mailbox': { ok: members(['cAdmin', 'mAdmin'], 200) },
};

// ---------------------------------------------------------------------------------------------------------

let t: TestContext;
let w1: World;
let w2: World;
const agents = new Map<Actor, supertest.Agent>();

/** Signs every shared session in again (after a route that ended the actor's other sessions). */
async function signInAgain() {
  for (const a of SIGNED_IN) agents.set(a, await signIn(t.request(), w1.users[a].email));
  for (const w of [w1, w2]) w.agent = await signIn(t.request(), w.users.installer.email);
}

async function buildWorld(): Promise<World> {
  const c = await createOrganization(t.ds, 'contractor');
  const m = await createOrganization(t.ds, 'manufacturer');
  const users: Record<Member, User> = {
    installer: await createUser(t.ds, c, ['installer']),
    cAdmin: await createUser(t.ds, c, ['administrator']),
    reviewer: await createUser(t.ds, m, ['reviewer']),
    accountant: await createUser(t.ds, m, ['accountant']),
    mAdmin: await createUser(t.ds, m, ['administrator']),
  };
  const colleague = {
    contractor: await createUser(t.ds, c, ['installer']),
    manufacturer: await createUser(t.ds, m, ['reviewer']),
  };
  const product = await createProduct(t.ds, m);
  const { policy, versions } = await createPolicy(t.ds, m, [product], [{ effectiveFrom: '2023-01-01' }]);
  const agent = await signIn(t.request(), users.installer.email);
  const inst = await agent
    .post('/api/installations')
    .send(installationPayload(product.id, { installDate: '2024-03-01', purchaseDate: '2024-02-15' }));
  if (inst.status !== 201)
    throw new Error(`installation fixture: ${inst.status} ${JSON.stringify(inst.body)}`);
  const w: World = {
    c,
    m,
    users,
    colleague,
    product,
    policy,
    version: versions[0],
    installationId: inst.body.installation.id,
    serial: inst.body.installation.serials[0],
    agent,
    draftId: '',
    filedId: '',
    filedPhotoId: '',
    draftPhotoId: '',
    batchId: '',
    review: undefined as unknown as ReviewWorld,
    approvedId: '',
    letterDocId: '',
    answeredId: '',
    answerFileId: '',
    pendingId: '',
    pendingFileId: '',
    memoId: '',
  };
  w.draftId = await newDraft(w);
  w.draftPhotoId = await newPhoto(w, w.draftId);
  const toFile = await newDraft(w);
  w.filedPhotoId = await newPhoto(w, toFile);
  w.filedId = await fileIt(w, toFile);
  w.batchId = await newBatch(w);
  w.review = await createReviewWorld(t.ds, c, m);
  const reviewer = await signIn(t.request(), users.reviewer.email);
  w.approvedId = await claimAt(w, 'in_review');
  const approved = await reviewer
    .post(`/api/claims/${w.approvedId}/actions/approve`)
    .send({ resolution: 'credit', amount: await creditOf(w.approvedId), overrideReason: 'Checked.' });
  if (approved.status !== 200)
    throw new Error(`approval fixture: ${approved.status} ${JSON.stringify(approved.body)}`);
  w.letterDocId = String(approved.body.workflow.decision.letter.url).match(/documents\/([0-9a-f-]{36})/)![1];
  w.answeredId = await claimAt(w, 'needs_info');
  w.answerFileId = await newConversationUpload(w, w.answeredId);
  w.pendingId = await claimAt(w, 'needs_info');
  w.pendingFileId = await newConversationUpload(w, w.pendingId);
  w.memoId = await newMemo(w);
  const answered = await agent
    .post(`/api/claims/${w.answeredId}/actions/answer_info`)
    .send({ message: 'Here it is.', attachmentIds: [w.answerFileId] });
  if (answered.status !== 200)
    throw new Error(`answer fixture: ${answered.status} ${JSON.stringify(answered.body)}`);
  return w;
}

beforeAll(async () => {
  t = await createTestApp();
  w1 = await buildWorld();
  w2 = await buildWorld();
  for (const a of SIGNED_IN) agents.set(a, await signIn(t.request(), w1.users[a].email));
  agents.set('anon', t.request());
}, 120_000);
afterAll(() => closeTestApp(t));

const key = (r: { method: string; path: string }) => `${r.method} ${r.path}`;
const paramNames = (path: string) => [...path.matchAll(/:([A-Za-z]+)/g)].map((m) => m[1]);

function expected(entry: Entry, route: string, actor: Actor, kase: Case): number {
  const own = (): number => {
    const ok = entry.ok?.[actor];
    if (ok !== undefined) return ok;
    if (actor === 'anon') return 401;
    const d = entry.denied ?? 403;
    return typeof d === 'number' ? d : (d[actor] ?? 403);
  };
  if (kase === 'own') return own();
  if (entry.roleCheckFirst && actor !== 'anon' && entry.ok?.[actor] === undefined) return own();
  if (actor === 'anon' && entry.ok?.anon === undefined) return 401;
  const passes = (o: number) => o < 300 || o === 409 || o === 422;
  // Another record's id under one the actor may use: as missing as a made-up one (unless refused before it is looked up).
  if (kase === 'crossed') return entry.crossed ?? (passes(own()) ? 404 : own());
  if (kase === 'missing') return 404;
  if (entry.foreign === 'public') {
    const o = own();
    if (route.startsWith('GET ')) return o;
    return passes(o) ? 403 : o;
  }
  return 404;
}

const auditCount = async () => Number((await t.ds.query('SELECT COUNT(*) AS n FROM audit_events'))[0].n);

async function send(agent: supertest.Agent, method: string, url: string, entry: Entry, body: unknown) {
  const m = method.toLowerCase() as 'get' | 'post' | 'patch' | 'put' | 'delete';
  const req = agent[m](url);
  if (entry.headers) req.set(entry.headers());
  if (entry.upload) {
    const u = await entry.upload();
    return req.field('purpose', u.purpose).attach('file', u.file, u.filename);
  }
  return body === undefined ? req : req.send(body as object);
}

/** Every (route, variant) pair with its merged entry. */
function expand(name: string): { label: string; entry: Entry }[] {
  const { variants, ...base } = ROUTES[name];
  if (!variants) return [{ label: name, entry: base }];
  return Object.entries(variants).map(([v, over]) => ({
    label: `${name} (${v})`,
    entry: { ...base, ...over },
  }));
}

describe('authorisation matrix', () => {
  it('has an entry for every registered route, and no entry for a route that does not exist', () => {
    const registered = listRoutes(t.app).map(key);
    const missing = registered.filter((r) => !ROUTES[r]);
    const stale = Object.keys(ROUTES).filter((r) => !registered.includes(r));
    expect({
      'routes without an entry in the authorisation matrix': missing,
      'entries for routes that do not exist': stale,
    }).toEqual({
      'routes without an entry in the authorisation matrix': [],
      'entries for routes that do not exist': [],
    });
  });

  it(
    'every actor gets exactly the expected answer on own, foreign and missing records',
    { timeout: 900_000 },
    async () => {
      const mismatches: string[] = [];
      let cases = 0;
      let variants = 0;
      const routes = listRoutes(t.app).filter((r) => ROUTES[key(r)]);
      for (const r of routes) {
        const all = paramNames(r.path);
        const names = all.filter((n) => !ROUTES[key(r)].fixed?.includes(n));
        for (const { label, entry } of expand(key(r))) {
          variants++;
          const kinds: Case[] =
            names.length === 0
              ? entry.foreignBody
                ? ['own', 'foreign']
                : ['own']
              : entry.foreign === 'none'
                ? ['own', 'missing']
                : names.length > 1
                  ? ['own', 'foreign', 'missing', 'crossed']
                  : ['own', 'foreign', 'missing'];
          for (const actor of ACTORS) {
            const answers: Partial<Record<Case, { status: number; body: unknown }>> = {};
            for (const kase of kinds) {
              cases++;
              const world = kase === 'foreign' ? w2 : w1;
              let params: Params = {};
              if (names.length) {
                if (kase === 'missing') {
                  params = Object.fromEntries(
                    names.map((n) => [
                      n,
                      n === 'token' ? crypto.randomBytes(32).toString('base64url') : crypto.randomUUID(),
                    ]),
                  );
                } else if (kase === 'crossed') {
                  const mine = await entry.target!(w1, actor);
                  const theirs = await entry.target!(w2, actor);
                  params = Object.fromEntries(names.map((n, i) => [n, i === 0 ? mine[n] : theirs[n]]));
                } else {
                  params = await entry.target!(world, actor);
                }
                // Parameters that are not ids (an action's name) stay what the route is about.
                if (entry.fixed && kase === 'missing') {
                  const own = await entry.target!(w1, actor);
                  for (const n of entry.fixed) params[n] = own[n];
                }
              }
              const query =
                typeof entry.query === 'function'
                  ? entry.query({ actor, world, own: w1, params })
                  : entry.query;
              const url =
                r.path.replace(/:([A-Za-z]+)/g, (_m, n: string) => encodeURIComponent(params[n])) +
                (query ? `?${query}` : '');
              const agent = entry.freshSession
                ? actor === 'anon'
                  ? t.request()
                  : await signIn(t.request(), w1.users[actor].email)
                : agents.get(actor)!;
              const body = await entry.body?.({ actor, world, own: w1, params });
              const want = expected(entry, key(r), actor, kase);
              const before = want >= 400 ? await auditCount() : 0;
              const res = await send(agent, r.method, url, entry, body);
              answers[kase] = { status: res.status, body: res.body };
              const where = `${label} [${actor}, ${kase}]`;
              if (res.status !== want) {
                mismatches.push(
                  `${where}: expected ${want}, got ${res.status} ${JSON.stringify(res.body).slice(0, 160)}`,
                );
              } else if (want >= 400 && (await auditCount()) !== before) {
                mismatches.push(`${where}: refused with ${want} but wrote an audit event`);
              }
              if (entry.endsOtherSessions) await signInAgain();
            }
            const f = answers.foreign;
            const m = answers.missing;
            if (f && m && f.status === 404 && JSON.stringify(f.body) !== JSON.stringify(m.body)) {
              mismatches.push(
                `${label} [${actor}]: a foreign record answers ${JSON.stringify(f.body)}, a missing one ${JSON.stringify(m.body)}`,
              );
            }
          }
        }
      }
      console.info(
        `authorisation matrix: ${routes.length} routes (${variants} with their stages) x ${ACTORS.length} actors, ${cases} cases`,
      );
      expect(mismatches).toEqual([]);
    },
  );
});
