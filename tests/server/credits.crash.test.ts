import crypto from 'node:crypto';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { Claim } from '../../server/db/entities/claim.entity';
import { CreditMemo } from '../../server/db/entities/credit-memo.entity';
import { IdempotencyKey } from '../../server/db/entities/idempotency-key.entity';
import { LedgerEntry } from '../../server/db/entities/ledger-entry.entity';
import { checkLedger } from '../../server/modules/credits/ledger-check';
import { connectionGone, killAllCrashServers, startCrashServer } from '../support/crash-harness';
import { createApprovedClaim } from '../support/credit-factories';
import { creditWorld, fetchSignIn, postCredit } from '../support/credit-world';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// The server killed (SIGKILL) in the middle of issuing a credit leaves everything or nothing; a retry with the
// same key then succeeds, once. The server is held at the crash point after the memo insert
// (server/lib/crash-point.ts, armed by TEST_CRASH_POINT), its transaction open, and killed there.

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  await killAllCrashServers();
  await closeTestApp(t);
});

it(
  'SIGKILL mid-transaction leaves nothing; the retry with the same key makes exactly one memo',
  { timeout: 90_000 },
  async () => {
    const w = await creditWorld(t);
    const claim = await createApprovedClaim(t.ds, {
      manufacturer: w.mfr,
      contractor: w.contractor,
      amount: '73.41',
    });
    const key = crypto.randomUUID();

    const held = await startCrashServer({ TEST_CRASH_POINT: 'credit.issue.after_memo' });
    const cookie = await fetchSignIn(held.base, w.accountant.user.email);
    const inFlight = postCredit(held.base, cookie, claim.id, key).catch((e: Error) => e);
    // The transaction is open, the memo row inserted (uncommitted) and the server held inside it.
    const at = await held.reached;
    expect(at.crashPoint).toBe('credit.issue.after_memo');
    await held.kill();
    expect(await inFlight).toBeInstanceOf(Error);
    // The database rolls the dead connection's transaction back.
    await connectionGone(t.ds, at.connectionId);

    expect(await t.ds.getRepository(CreditMemo).countBy({ claimId: claim.id })).toBe(0);
    expect(
      await t.ds
        .getRepository(LedgerEntry)
        .countBy({ contractorId: w.contractor.id, manufacturerId: w.mfr.id }),
    ).toBe(0);
    expect((await t.ds.getRepository(Claim).findOneByOrFail({ id: claim.id })).stage).toBe('approved');
    expect(await t.ds.getRepository(IdempotencyKey).countBy({ key, userId: w.accountant.user.id })).toBe(0);
    expect(await t.ds.getRepository(AuditEvent).countBy({ entityId: claim.id })).toBe(0);

    const fresh = await startCrashServer();
    const cookie2 = await fetchSignIn(fresh.base, w.accountant.user.email);
    const retry = await postCredit(fresh.base, cookie2, claim.id, key);
    expect(retry.status).toBe(201);
    expect(retry.replayed).toBeNull();
    const replay = await postCredit(fresh.base, cookie2, claim.id, key);
    expect(replay).toEqual({ status: 201, replayed: 'true', text: retry.text });
    await fresh.kill();

    expect(await t.ds.getRepository(CreditMemo).countBy({ claimId: claim.id })).toBe(1);
    expect((await t.ds.getRepository(Claim).findOneByOrFail({ id: claim.id })).stage).toBe('credited');
    const ledger = await checkLedger(t.ds, { manufacturerId: w.mfr.id });
    expect(ledger.problems).toEqual([]);
    expect(ledger.balances.get(`${w.contractor.id}|${w.mfr.id}|USD`)).toBe('73.41');
  },
);
