import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { Invitation } from '../../server/db/entities/invitation.entity';
import { User } from '../../server/db/entities/user.entity';
import { Claim } from '../../server/db/entities/claim.entity';
import { CreditMemo } from '../../server/db/entities/credit-memo.entity';
import { Decision } from '../../server/db/entities/decision.entity';
import { LedgerEntry } from '../../server/db/entities/ledger-entry.entity';
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
} from '../support/crash-harness';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// The server in a child process, held at a named point inside a transaction (server/lib/crash-point.ts) and
// killed there with SIGKILL; then, with the database and the files as the crash left them and a fresh server:
// the invariants hold, and the retry succeeds exactly once.

// A storage folder of this file's own, so that "every stored object has a row" is exact.
const STORAGE_DIR = fs.mkdtempSync(path.join(os.tmpdir(), 'lumenproof-crash-'));
const ENV = { STORAGE_DIR };

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

/** Starts a server armed at the point, sends the request, waits for it to reach the point, kills it there. */
async function crashAt(
  point: string,
  send: (s: CrashServer, cookie: string) => Promise<unknown>,
  email: string,
) {
  const s = await startCrashServer({ ...ENV, TEST_CRASH_POINT: point });
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

const outboxTo = async (email: string) =>
  Number(
    (await t.ds.query('SELECT COUNT(*) AS n FROM outbox_messages WHERE to_address LIKE ?', [`%${email}%`]))[0]
      .n,
  );

describe('crash safety: invitations', () => {
  for (const point of ['user.invite.after_user', 'user.invite.before_commit']) {
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
        expect(retry.status).toBe(201);
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

/** Every stored object has a row, and every row of this folder's records has its object. */
async function storageInvariants() {
  const rows = (await t.ds.query(
    `SELECT storage_key AS k FROM attachments UNION SELECT thumbnail_key FROM attachments WHERE thumbnail_key IS NOT NULL
     UNION SELECT storage_key FROM claim_documents UNION SELECT pdf_storage_key FROM credit_memos`,
  )) as { k: string }[];
  const known = new Set(rows.map((r) => r.k));
  const stored = storedKeys(STORAGE_DIR).filter((k) => !k.split('/').pop()!.startsWith('.tmp-'));
  return { orphans: stored.filter((k) => !known.has(k)), stored: new Set(stored) };
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

describe('crash safety: filing a claim', () => {
  for (const point of ['claim.file.after_update', 'claim.file.before_commit']) {
    it(
      `killed at ${point}: still a draft, no number, audit row or e-mail; filing again files once, same number`,
      { timeout: 60_000 },
      async () => {
        const p = await parties();
        const draft = await createClaimAt(t.ds, p.review, 'draft', { filedById: p.installer.id });
        const outbox = await outboxTotal();
        await crashAt(
          point,
          (s, cookie) => httpJson(s.base, cookie, 'POST', `/api/claims/${draft.id}/file`, {}),
          p.installer.email,
        );

        const after = await claimAgreesWithAudit(draft.id, { stage: 'draft', version: draft.version });
        expect(after).toMatchObject({ stage: 'draft', number: null, filedAt: null, evaluation: null });
        expect(await outboxTotal()).toBe(outbox);
        expect((await storageInvariants()).orphans).toEqual([]);

        const cookie = await httpSignIn(fresh.base, p.installer.email);
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
        expect(await outboxTotal()).toBeGreaterThan(outbox);
      },
    );
  }
});

describe('crash safety: a stage move (approval)', () => {
  for (const point of ['claim.move.after_update', 'claim.move.before_commit']) {
    it(
      `killed at ${point}: still in review, no decision, letter row, audit row or e-mail; the retry approves once`,
      { timeout: 60_000 },
      async () => {
        const p = await parties();
        const claim = await createClaimAt(t.ds, p.review, 'in_review', { reviewerId: p.reviewer.id });
        const body = {
          resolution: 'credit',
          amount: claim.expectedCredit ?? '96.00',
          overrideReason: 'Checked against the photos.',
        };
        const outbox = await outboxTotal();
        const orphansBefore = (await storageInvariants()).orphans.length;
        await crashAt(
          point,
          (s, cookie) => httpJson(s.base, cookie, 'POST', `/api/claims/${claim.id}/actions/approve`, body),
          p.reviewer.email,
        );

        await claimAgreesWithAudit(claim.id, { stage: 'in_review', version: claim.version });
        expect(await t.ds.getRepository(Decision).countBy({ claimId: claim.id })).toBe(0);
        expect(
          Number(
            (await t.ds.query('SELECT COUNT(*) AS n FROM claim_documents WHERE claim_id = ?', [claim.id]))[0]
              .n,
          ),
        ).toBe(0);
        expect(await outboxTotal()).toBe(outbox);
        const { orphans } = await storageInvariants();

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
        // Known gap (reported): the letter PDF is stored before the commit, so a kill after it leaves that one
        // object without a row; nothing sweeps it yet. Never more than the one letter, never a row without its file.
        expect(orphans.length - orphansBefore).toBeLessThanOrEqual(1);
        const { stored } = await storageInvariants();
        const docs = (await t.ds.query('SELECT storage_key AS k FROM claim_documents WHERE claim_id = ?', [
          claim.id,
        ])) as { k: string }[];
        for (const d of docs) expect(stored.has(d.k)).toBe(true);
      },
    );
  }
});

describe('crash safety: issuing a credit', () => {
  for (const point of ['credit.issue.after_memo', 'credit.issue.before_commit']) {
    it(
      `killed at ${point}: no memo, ledger entry, key, move or e-mail; the same Idempotency-Key then issues exactly once`,
      { timeout: 60_000 },
      async () => {
        const p = await parties();
        const claim = await createApprovedClaim(t.ds, {
          manufacturer: p.m,
          contractor: p.c,
          amount: '73.41',
        });
        const key = crypto.randomUUID();
        const send = (base: string, cookie: string) =>
          httpJson(base, cookie, 'POST', `/api/claims/${claim.id}/credits`, {}, { 'Idempotency-Key': key });
        const outbox = await outboxTotal();
        await crashAt(point, (s, cookie) => send(s.base, cookie), p.accountant.email);

        expect(await t.ds.getRepository(CreditMemo).countBy({ claimId: claim.id })).toBe(0);
        expect(await t.ds.getRepository(LedgerEntry).countBy({ contractorId: p.c.id })).toBe(0);
        expect(await t.ds.getRepository(AuditEvent).countBy({ entityId: claim.id })).toBe(0);
        expect((await t.ds.getRepository(Claim).findOneByOrFail({ id: claim.id })).stage).toBe('approved');
        expect(await outboxTotal()).toBe(outbox);

        const cookie = await httpSignIn(fresh.base, p.accountant.email);
        const first = await send(fresh.base, cookie);
        expect(first.status).toBe(201);
        const replay = await send(fresh.base, cookie);
        expect(replay.status).toBe(201);
        expect(replay.body).toEqual(first.body);
        const memos = await t.ds.getRepository(CreditMemo).findBy({ claimId: claim.id });
        expect(memos).toHaveLength(1);
        expect(await t.ds.getRepository(LedgerEntry).findBy({ memoId: memos[0].id })).toHaveLength(1);
        expect(
          await t.ds.getRepository(AuditEvent).countBy({ entityId: claim.id, action: 'claim.credited' }),
        ).toBe(1);
        expect(
          await t.ds
            .getRepository(AuditEvent)
            .countBy({ entityId: memos[0].id, action: 'credit_memo.issued' }),
        ).toBe(1);
        await claimAgreesWithAudit(claim.id, { stage: 'approved', version: claim.version });
        // Every row's object exists (the memo's PDF).
        expect((await storageInvariants()).stored.has(memos[0].pdfStorageKey)).toBe(true);
      },
    );
  }
});
