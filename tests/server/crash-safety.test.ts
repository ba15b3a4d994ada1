import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { Attachment } from '../../server/db/entities/attachment.entity';
import { Invitation } from '../../server/db/entities/invitation.entity';
import { User } from '../../server/db/entities/user.entity';
import { claimCountsDrift } from '../../server/lib/claim-counts';
import { Claim } from '../../server/db/entities/claim.entity';
import { CreditMemo } from '../../server/db/entities/credit-memo.entity';
import { Decision } from '../../server/db/entities/decision.entity';
import { IdempotencyKey } from '../../server/db/entities/idempotency-key.entity';
import { LedgerEntry } from '../../server/db/entities/ledger-entry.entity';
import { createDiskStorage } from '../../server/lib/storage';
import { referencedKeys, sweepStorage } from '../../server/lib/storage-sweep';
import { createApprovedClaim } from '../support/credit-factories';
import { createClaimAt, createReviewWorld } from '../support/review-factories';
import { createOrganization, createUser } from '../support/factories';
import {
  connectionGone,
  httpJson,
  httpSignIn,
  killAllCrashServers,
  startCrashServer,
  storedKeys,
  type CrashServer,
  type Json,
} from '../support/crash-harness';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';
import { pngImage } from '../support/upload-fixtures';

// The server in a child process, held at a named point inside a transaction (server/lib/crash-point.ts) and
// killed there with SIGKILL; then, with the database and the files as the crash left them, the storage sweep
// run as a restarted server runs it (with no grace period: nothing is in flight) and a fresh server: the
// invariants hold, no stored object is left without its row nor a row without its object, and the retry
// succeeds exactly once. Every crash point in the server is visited by one of the scenarios below.

// A storage folder of this file's own, so that "every stored object has a row" is exact.
const STORAGE_DIR = fs.mkdtempSync(path.join(os.tmpdir(), 'lumenproof-crash-'));
const ENV = { STORAGE_DIR };
const storage = createDiskStorage(STORAGE_DIR);

// Every point (server/lib/crash-point.ts) of each flow, in the order the flow reaches them, with the number of
// objects the flow has stored by then that the killed transaction leaves without a row (the sweep's work).
const FILING: [point: string, orphans: number][] = [
  // The photo upload: the photo and its thumbnail are written before the row's transaction.
  ['attachment.save.after_store', 2],
  ['attachment.save.after_row', 2],
  ['attachment.save.before_commit', 2],
  // Filing itself (the photo already committed) writes no object.
  ['claim.file.after_evaluation', 0],
  ['claim.file.after_update', 0],
  ['claim.file.after_audit', 0],
  ['claim.file.before_commit', 0],
];
const DECISION: [string, number][] = [
  // The determination letter is stored first, then its row, the decision, the e-mails, the audit row.
  ['claim.document.after_store', 1],
  ['claim.document.after_row', 1],
  ['claim.move.after_decision', 1],
  ['claim.move.after_outbox', 1],
  ['claim.move.after_update', 1],
  ['claim.move.before_commit', 1],
];
const CREDIT: [string, number][] = [
  ['credit.issue.after_number', 0],
  ['credit.issue.after_pdf', 1],
  ['credit.issue.after_memo', 1],
  ['credit.issue.after_ledger', 1],
  ['credit.issue.after_move', 1],
  ['credit.issue.after_audit', 1],
  ['credit.issue.before_commit', 1],
];
const INVITATION = ['user.invite.after_user', 'user.invite.before_commit'];

/** Claims this file made: every row of theirs that names an object must find it in this folder. */
const ours: string[] = [];

let t: TestContext;
let fresh: CrashServer;
beforeAll(async () => {
  t = await createTestApp(ENV);
  fresh = await startCrashServer(ENV);
}, 60_000);
afterAll(async () => {
  await killAllCrashServers();
  await closeTestApp(t);
  fs.rmSync(STORAGE_DIR, { recursive: true, force: true });
});

// The points in the order the tests visit them: while one test runs, the server armed for the next one starts
// (a server takes seconds to start; the file visits every point).
const ORDER = [...INVITATION, ...[...FILING, ...DECISION, ...CREDIT].map(([p]) => p)];
const starting = new Map<string, Promise<CrashServer>>();
function armedServer(point: string) {
  const start = (p: string) => {
    const s = startCrashServer({ ...ENV, TEST_CRASH_POINT: p });
    // One started for a test that a filter then skips is killed in afterAll; its failure is nobody's.
    s.catch(() => undefined);
    return s;
  };
  const server = starting.get(point) ?? start(point);
  starting.delete(point);
  const next = ORDER[ORDER.indexOf(point) + 1];
  if (next && !starting.has(next)) starting.set(next, start(next));
  return server;
}

/** Starts a server armed at the point, sends the request, waits for it to reach the point, kills it there. */
async function crashAt(
  point: string,
  send: (s: CrashServer, cookie: string) => Promise<unknown>,
  email: string,
) {
  const s = await armedServer(point);
  const cookie = await httpSignIn(s.base, email);
  const inFlight = send(s, cookie).then(
    () => 'answered',
    () => 'cut off',
  );
  const at = await s.reached;
  expect(at.crashPoint).toBe(point);
  await s.kill();
  expect(await inFlight).toBe('cut off');
  await connectionGone(t.ds, at.connectionId);
}

describe('crash points', () => {
  it('every crash point in the server is visited by a scenario of this file', () => {
    const found = new Set<string>();
    const walk = (dir: string) => {
      for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
        const f = path.join(dir, e.name);
        if (e.isDirectory()) walk(f);
        else if (f.endsWith('.ts'))
          for (const m of fs.readFileSync(f, 'utf8').matchAll(/crashPoint\('([a-z0-9_.]+)'/g))
            found.add(m[1]);
      }
    };
    walk(path.resolve('server'));
    expect([...found].sort()).toEqual([...new Set(ORDER)].sort());
  });
});

const outboxTo = async (email: string) =>
  Number(
    (await t.ds.query('SELECT COUNT(*) AS n FROM outbox_messages WHERE to_address LIKE ?', [`%${email}%`]))[0]
      .n,
  );

describe('crash safety: invitations', () => {
  for (const point of INVITATION) {
    it(
      `killed at ${point}: no user, invitation, audit row or e-mail; the retry invites once`,
      { timeout: 60_000 },
      async () => {
        const org = await createOrganization(t.ds, 'manufacturer');
        const admin = await createUser(t.ds, org, ['administrator']);
        const email = `crash-${crypto.randomBytes(4).toString('hex')}@example.test`;
        const body = { email, name: 'Crash Test', roles: ['reviewer'] };
        await crashAt(
          point,
          (s, cookie) => httpJson(s.base, cookie, 'POST', '/api/users/invitations', body),
          admin.email,
        );

        expect(await t.ds.getRepository(User).countBy({ email })).toBe(0);
        expect(await t.ds.getRepository(Invitation).count({ where: { createdById: admin.id } })).toBe(0);
        expect(
          await t.ds.getRepository(AuditEvent).countBy({ action: 'user.invited', organizationId: org.id }),
        ).toBe(0);
        expect(await outboxTo(email)).toBe(0);

        const cookie = await httpSignIn(fresh.base, admin.email);
        const retry = await httpJson(fresh.base, cookie, 'POST', '/api/users/invitations', body);
        expect(retry.status).toBe(202);
        const again = await httpJson(fresh.base, cookie, 'POST', '/api/users/invitations', body);
        expect(again.status).toBe(409);
        expect(await t.ds.getRepository(User).countBy({ email })).toBe(1);
        expect(await t.ds.getRepository(Invitation).count({ where: { createdById: admin.id } })).toBe(1);
        expect(
          await t.ds.getRepository(AuditEvent).countBy({ action: 'user.invited', organizationId: org.id }),
        ).toBe(1);
        expect(await outboxTo(email)).toBe(1);
      },
    );
  }
});

const outboxTotal = async () => Number((await t.ds.query('SELECT COUNT(*) AS n FROM outbox_messages'))[0].n);

/**
 * After a crash (or a retry): the sweep, as a restarted server runs it, removes exactly the objects left without
 * a row; then every stored object has a row, and every row of this file's claims has its object.
 */
async function sweepAndCheckStorage(expectRemoved: number) {
  const swept = await sweepStorage(t.ds, storage, { graceMs: 0 });
  expect(swept.removed).toHaveLength(expectRemoved);
  expect(swept.failed).toEqual([]);
  // Nothing half-written either (a write in flight is a temporary file beside its target).
  const files = storedKeys(STORAGE_DIR);
  expect(files.filter((k) => k.split('/').pop()!.startsWith('.tmp-'))).toEqual([]);
  const named = await referencedKeys(t.ds, files);
  expect(files.filter((k) => !named.has(k))).toEqual([]);
  const stored = new Set(files);
  const rows = (await t.ds.query(
    `SELECT storage_key AS k FROM attachments WHERE owner_id IN (?)
     UNION SELECT thumbnail_key FROM attachments WHERE owner_id IN (?) AND thumbnail_key IS NOT NULL
     UNION SELECT storage_key FROM claim_documents WHERE claim_id IN (?)
     UNION SELECT pdf_storage_key FROM credit_memos WHERE claim_id IN (?)`,
    [ours, ours, ours, ours],
  )) as { k: string }[];
  expect(rows.map((r) => r.k).filter((k) => !stored.has(k))).toEqual([]);
  return { stored, rows: rows.length };
}

/** The claim's stage and version agree with its audit trail: one row per move, the last one naming the stage. */
async function claimAgreesWithAudit(claimId: string, created: { stage: string; version: number }) {
  const c = await t.ds.getRepository(Claim).findOneByOrFail({ id: claimId });
  const moves = (
    await t.ds
      .getRepository(AuditEvent)
      .find({ where: { entityType: 'Claim', entityId: claimId }, order: { id: 'ASC' } })
  ).filter((a) => (a.after as { stage?: string } | null)?.stage !== undefined);
  const last = moves.at(-1);
  expect(c.stage).toBe(last ? (last.after as { stage: string }).stage : created.stage);
  expect(c.version).toBe(created.version + moves.length);
  // The claim counts the triggers keep agree with the claims (a killed transaction appended nothing).
  expect(await claimCountsDrift(t.ds)).toEqual([]);
  return c;
}

async function parties() {
  const c = await createOrganization(t.ds, 'contractor');
  const m = await createOrganization(t.ds, 'manufacturer');
  return {
    c,
    m,
    installer: await createUser(t.ds, c, ['installer']),
    reviewer: await createUser(t.ds, m, ['reviewer']),
    accountant: await createUser(t.ds, m, ['accountant']),
    review: await createReviewWorld(t.ds, c, m),
  };
}

let photo: Buffer;
async function uploadPhoto(base: string, cookie: string, claimId: string) {
  photo ??= await pngImage();
  const form = new FormData();
  form.set('purpose', 'failure');
  form.set('file', new Blob([new Uint8Array(photo)], { type: 'image/png' }), 'dark-strings.png');
  const r = await fetch(`${base}/api/claims/${claimId}/attachments`, {
    method: 'POST',
    headers: { cookie },
    body: form,
  });
  return { status: r.status, body: (await r.json()) as Json };
}

const count = (sql: string, params: unknown[]) =>
  t.ds.query(sql, params).then((r: { n: string }[]) => Number(r[0].n));

describe('crash safety: filing a claim with a photo', () => {
  for (const [point, orphans] of FILING) {
    it(
      `killed at ${point}: no half-filed claim, no file without its row, no e-mail; upload and filing then happen once`,
      { timeout: 60_000 },
      async () => {
        const p = await parties();
        const draft = await createClaimAt(t.ds, p.review, 'draft', { filedById: p.installer.id });
        ours.push(draft.id);
        const outbox = await outboxTotal();
        await crashAt(
          point,
          async (s, cookie) => {
            const up = await uploadPhoto(s.base, cookie, draft.id);
            if (up.status !== 201) throw new Error(`upload: ${up.status}`);
            return httpJson(s.base, cookie, 'POST', `/api/claims/${draft.id}/file`, {});
          },
          p.installer.email,
        );

        // The photo committed only when the kill came after its transaction, i.e. while filing.
        const photoCommitted = point.startsWith('claim.file.');
        const files = await t.ds.getRepository(Attachment).countBy({ ownerType: 'claim', ownerId: draft.id });
        expect(files).toBe(photoCommitted ? 1 : 0);
        expect(
          await t.ds
            .getRepository(AuditEvent)
            .countBy({ action: 'attachment.added', organizationId: p.c.id }),
        ).toBe(photoCommitted ? 1 : 0);
        const after = await claimAgreesWithAudit(draft.id, { stage: 'draft', version: draft.version });
        expect(after).toMatchObject({ stage: 'draft', number: null, filedAt: null, evaluation: null });
        expect(await outboxTotal()).toBe(outbox);
        await sweepAndCheckStorage(orphans);

        const cookie = await httpSignIn(fresh.base, p.installer.email);
        if (!photoCommitted) expect((await uploadPhoto(fresh.base, cookie, draft.id)).status).toBe(201);
        const filed = await httpJson(fresh.base, cookie, 'POST', `/api/claims/${draft.id}/file`, {});
        expect(filed.status).toBe(200);
        expect(filed.body!.replayed).toBe(false);
        const again = await httpJson(fresh.base, cookie, 'POST', `/api/claims/${draft.id}/file`, {});
        expect(again.status).toBe(200);
        expect(again.body!.replayed).toBe(true);
        expect(again.body!.claim.number).toBe(filed.body!.claim.number);
        const done = await claimAgreesWithAudit(draft.id, { stage: 'draft', version: draft.version });
        expect(done.stage).toBe('filed');
        expect(
          await t.ds.getRepository(AuditEvent).countBy({ entityId: draft.id, action: 'claim.filed' }),
        ).toBe(1);
        expect(await t.ds.getRepository(Attachment).countBy({ ownerType: 'claim', ownerId: draft.id })).toBe(
          1,
        );
        expect(await outboxTotal()).toBeGreaterThan(outbox);
        const { rows } = await sweepAndCheckStorage(0);
        expect(rows).toBeGreaterThanOrEqual(2);
      },
    );
  }
});

describe('crash safety: a decision (approval with its letter)', () => {
  for (const [point, orphans] of DECISION) {
    it(
      `killed at ${point}: still in review, no decision, letter, audit row or e-mail; the retry approves once`,
      { timeout: 60_000 },
      async () => {
        const p = await parties();
        const claim = await createClaimAt(t.ds, p.review, 'in_review', { reviewerId: p.reviewer.id });
        ours.push(claim.id);
        const body = {
          resolution: 'credit',
          amount: claim.expectedCredit ?? '96.00',
          overrideReason: 'Checked against the photos.',
        };
        const outbox = await outboxTotal();
        await crashAt(
          point,
          (s, cookie) => httpJson(s.base, cookie, 'POST', `/api/claims/${claim.id}/actions/approve`, body),
          p.reviewer.email,
        );

        await claimAgreesWithAudit(claim.id, { stage: 'in_review', version: claim.version });
        expect(await t.ds.getRepository(Decision).countBy({ claimId: claim.id })).toBe(0);
        expect(await count('SELECT COUNT(*) AS n FROM claim_documents WHERE claim_id = ?', [claim.id])).toBe(
          0,
        );
        expect(await outboxTotal()).toBe(outbox);
        await sweepAndCheckStorage(orphans);

        const cookie = await httpSignIn(fresh.base, p.reviewer.email);
        const ok = await httpJson(
          fresh.base,
          cookie,
          'POST',
          `/api/claims/${claim.id}/actions/approve`,
          body,
        );
        expect(ok.status).toBe(200);
        const twice = await httpJson(
          fresh.base,
          cookie,
          'POST',
          `/api/claims/${claim.id}/actions/approve`,
          body,
        );
        expect(twice.status).toBe(409);
        const done = await claimAgreesWithAudit(claim.id, { stage: 'in_review', version: claim.version });
        expect(done.stage).toBe('approved');
        expect(await t.ds.getRepository(Decision).countBy({ claimId: claim.id })).toBe(1);
        expect(await count('SELECT COUNT(*) AS n FROM claim_documents WHERE claim_id = ?', [claim.id])).toBe(
          1,
        );
        expect(
          await t.ds.getRepository(AuditEvent).countBy({ entityId: claim.id, action: 'claim.approved' }),
        ).toBe(1);
        expect(await outboxTotal()).toBeGreaterThan(outbox);
        await sweepAndCheckStorage(0);
      },
    );
  }
});

describe('crash safety: issuing a credit', () => {
  for (const [point, orphans] of CREDIT) {
    it(
      `killed at ${point}: no memo, ledger entry, key, move or e-mail; the same Idempotency-Key then issues exactly once`,
      { timeout: 60_000 },
      async () => {
        const p = await parties();
        // The contractor's administrator hears of the credit (an e-mail with the memo PDF attached).
        await createUser(t.ds, p.c, ['administrator']);
        const claim = await createApprovedClaim(t.ds, {
          manufacturer: p.m,
          contractor: p.c,
          amount: '73.41',
        });
        ours.push(claim.id);
        const key = crypto.randomUUID();
        const send = (base: string, cookie: string) =>
          httpJson(base, cookie, 'POST', `/api/claims/${claim.id}/credits`, {}, { 'Idempotency-Key': key });
        const outbox = await outboxTotal();
        await crashAt(point, (s, cookie) => send(s.base, cookie), p.accountant.email);

        expect(await t.ds.getRepository(CreditMemo).countBy({ claimId: claim.id })).toBe(0);
        expect(await t.ds.getRepository(LedgerEntry).countBy({ contractorId: p.c.id })).toBe(0);
        expect(await t.ds.getRepository(AuditEvent).countBy({ entityId: claim.id })).toBe(0);
        expect(await t.ds.getRepository(IdempotencyKey).countBy({ key, userId: p.accountant.id })).toBe(0);
        expect((await t.ds.getRepository(Claim).findOneByOrFail({ id: claim.id })).stage).toBe('approved');
        expect(await outboxTotal()).toBe(outbox);
        await sweepAndCheckStorage(orphans);

        const cookie = await httpSignIn(fresh.base, p.accountant.email);
        const first = await send(fresh.base, cookie);
        expect(first.status).toBe(201);
        const replay = await send(fresh.base, cookie);
        expect(replay.status).toBe(201);
        expect(replay.body).toEqual(first.body);
        // A credited claim: exactly one memo, one ledger entry and its audit rows.
        const memos = await t.ds.getRepository(CreditMemo).findBy({ claimId: claim.id });
        expect(memos).toHaveLength(1);
        expect(await t.ds.getRepository(LedgerEntry).findBy({ memoId: memos[0].id })).toHaveLength(1);
        expect(await t.ds.getRepository(LedgerEntry).countBy({ contractorId: p.c.id })).toBe(1);
        expect(
          await t.ds.getRepository(AuditEvent).countBy({ entityId: claim.id, action: 'claim.credited' }),
        ).toBe(1);
        expect(
          await t.ds
            .getRepository(AuditEvent)
            .countBy({ entityId: memos[0].id, action: 'credit_memo.issued' }),
        ).toBe(1);
        const done = await claimAgreesWithAudit(claim.id, { stage: 'approved', version: claim.version });
        expect(done.stage).toBe('credited');
        expect(await outboxTotal()).toBe(outbox + 1);
        const { stored } = await sweepAndCheckStorage(0);
        expect(stored.has(memos[0].pdfStorageKey)).toBe(true);
      },
    );
  }
});
