import crypto from 'node:crypto';
import fs from 'node:fs';
import type supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hashToken } from '../../server/modules/users/users.service';
import { Invitation } from '../../server/db/entities/invitation.entity';
import type { Organization } from '../../server/db/entities/organization.entity';
import type { ProductModel } from '../../server/db/entities/product-model.entity';
import type { User } from '../../server/db/entities/user.entity';
import type { WarrantyPolicy } from '../../server/db/entities/warranty-policy.entity';
import type { WarrantyPolicyVersion } from '../../server/db/entities/warranty-policy-version.entity';
import { listRoutes } from '../../server/lib/routes';
import {
  createPolicy,
  createProduct,
  installationPayload,
  productPayload,
  termsPayload,
} from '../support/catalogue-factories';
import { createOrganization, createUser, signIn, TEST_PASSWORD } from '../support/factories';
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
};

type Params = Record<string, string>;
type Case = 'own' | 'foreign' | 'missing';
type Ctx = { actor: Actor; world: World; own: World; params: Params };

type Entry = {
  /** The actors that pass authorisation on their own (or tied) record, with the status each then gets. */
  ok: Partial<Record<Actor, number>>;
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
  query?: string;
  /** Use a new session for every case (the route ends or replaces it). */
  freshSession?: boolean;
  /** Why an allowed actor still gets 409/422 here. */
  stateReason?: string;
};

const validClaim = JSON.parse(fs.readFileSync('tests/shared/engine/fixtures/valid-claim.json', 'utf8'));
const unique = () => crypto.randomBytes(4).toString('hex');
const colleagueOf = (w: World, a: Actor) =>
  a !== 'anon' && KIND[a] === 'manufacturer' ? w.colleague.manufacturer : w.colleague.contractor;
const everyone = (status: number) =>
  Object.fromEntries(ACTORS.map((a) => [a, status])) as Record<Actor, number>;
const members = (list: Member[], status: number) =>
  Object.fromEntries(list.map((a) => [a, status])) as Partial<Record<Actor, number>>;

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

// ---------------------------------------------------------------------------------------------------------
// The table.
const ROUTES: Record<string, Entry> = {
  'GET /api/health': { ok: everyone(200) },
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

  // The one-time token is the credential: no sign-in, and nothing to be foreign to.
  'GET /api/invitations/:token': { ok: everyone(200), foreign: 'none', target: (w) => newInvitation(w) },
  'POST /api/invitations/:token/accept': {
    ok: everyone(200),
    foreign: 'none',
    target: (w) => newInvitation(w),
    body: () => ({ password: 'a long enough password for the test' }),
  },

  'GET /api/users': { ok: members(['cAdmin', 'mAdmin'], 200) },
  'POST /api/users/invitations': {
    ok: members(['cAdmin', 'mAdmin'], 201),
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
  'PATCH /api/users/:id': {
    ok: members(['cAdmin', 'mAdmin'], 200),
    denied: 404,
    target: (w, a) => ({ id: colleagueOf(w, a).id }),
    body: () => ({ name: `Renamed ${unique()}` }),
  },

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

  // Demo mode only: an administrator reads their own organisation's mail.
  'GET /api/mailbox': { ok: members(['cAdmin', 'mAdmin'], 200) },
};

// ---------------------------------------------------------------------------------------------------------

let t: TestContext;
let w1: World;
let w2: World;
const agents = new Map<Actor, supertest.Agent>();

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
  const installer = await signIn(t.request(), users.installer.email);
  const inst = await installer.post('/api/installations').send(installationPayload(product.id));
  if (inst.status !== 201)
    throw new Error(`installation fixture: ${inst.status} ${JSON.stringify(inst.body)}`);
  return {
    c,
    m,
    users,
    colleague,
    product,
    policy,
    version: versions[0],
    installationId: inst.body.installation.id,
  };
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
    const ok = entry.ok[actor];
    if (ok !== undefined) return ok;
    if (actor === 'anon') return 401;
    const d = entry.denied ?? 403;
    return typeof d === 'number' ? d : (d[actor] ?? 403);
  };
  if (kase === 'own') return own();
  if (actor === 'anon' && entry.ok.anon === undefined) return 401;
  if (kase === 'missing') return 404;
  // Foreign
  if (entry.foreign === 'public') {
    const o = own();
    if (route.startsWith('GET ')) return o;
    return o < 300 || o === 409 || o === 422 ? 403 : o;
  }
  return 404;
}

const auditCount = async () => Number((await t.ds.query('SELECT COUNT(*) AS n FROM audit_events'))[0].n);

function send(agent: supertest.Agent, method: string, url: string, body: unknown) {
  const m = method.toLowerCase() as 'get' | 'post' | 'patch' | 'put' | 'delete';
  const req = agent[m](url);
  return body === undefined ? req : req.send(body as object);
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
    { timeout: 600_000 },
    async () => {
      const mismatches: string[] = [];
      let cases = 0;
      const routes = listRoutes(t.app).filter((r) => ROUTES[key(r)]);
      for (const r of routes) {
        const name = key(r);
        const entry = ROUTES[name];
        const names = paramNames(r.path);
        const kinds: Case[] =
          names.length === 0
            ? ['own']
            : entry.foreign === 'none'
              ? ['own', 'missing']
              : ['own', 'foreign', 'missing'];
        for (const actor of ACTORS) {
          const bodies: Partial<Record<Case, { status: number; body: unknown }>> = {};
          for (const kase of kinds) {
            cases++;
            const world = kase === 'foreign' ? w2 : w1;
            let params: Params = {};
            if (names.length) {
              params =
                kase === 'missing'
                  ? Object.fromEntries(
                      names.map((n) => [
                        n,
                        n === 'token' ? crypto.randomBytes(32).toString('base64url') : crypto.randomUUID(),
                      ]),
                    )
                  : await entry.target!(world, actor);
            }
            const url =
              r.path.replace(/:([A-Za-z]+)/g, (_m, n: string) => encodeURIComponent(params[n])) +
              (entry.query ? `?${entry.query}` : '');
            const agent =
              entry.freshSession && actor !== 'anon'
                ? await signIn(t.request(), w1.users[actor].email)
                : entry.freshSession
                  ? t.request()
                  : agents.get(actor)!;
            const body = await entry.body?.({ actor, world, own: w1, params });
            const want = expected(entry, name, actor, kase);
            const before = want >= 400 ? await auditCount() : 0;
            const res = await send(agent, r.method, url, body);
            bodies[kase] = { status: res.status, body: res.body };
            const where = `${name} [${actor}, ${kase}]`;
            if (res.status !== want) {
              mismatches.push(
                `${where}: expected ${want}, got ${res.status} ${JSON.stringify(res.body).slice(0, 160)}`,
              );
            } else if (want >= 400 && (await auditCount()) !== before) {
              mismatches.push(`${where}: refused with ${want} but wrote an audit event`);
            }
          }
          const f = bodies.foreign;
          const m = bodies.missing;
          if (f && m && f.status === 404 && JSON.stringify(f.body) !== JSON.stringify(m.body)) {
            mismatches.push(
              `${name} [${actor}]: a foreign record answers ${JSON.stringify(f.body)}, a missing one ${JSON.stringify(m.body)}`,
            );
          }
        }
      }
      console.info(`authorisation matrix: ${routes.length} routes x ${ACTORS.length} actors, ${cases} cases`);
      expect(mismatches).toEqual([]);
    },
  );
});
