import { spawn, type ChildProcess } from 'node:child_process';
import crypto from 'node:crypto';
import path from 'node:path';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { inject } from 'vitest';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { Claim } from '../../server/db/entities/claim.entity';
import { CreditMemo } from '../../server/db/entities/credit-memo.entity';
import { IdempotencyKey } from '../../server/db/entities/idempotency-key.entity';
import { LedgerEntry } from '../../server/db/entities/ledger-entry.entity';
import { checkLedger } from '../../server/modules/credits/ledger-check';
import { createApprovedClaim } from '../support/credit-factories';
import { creditWorld, fetchSignIn, postCredit } from '../support/credit-world';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// The server killed (SIGKILL) in the middle of issuing a credit leaves everything or nothing; a retry with the
// same key then succeeds, once.

let t: TestContext;
const children: ChildProcess[] = [];
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  for (const c of children) if (c.exitCode === null) c.kill('SIGKILL');
  await closeTestApp(t);
});

function startServer(env: Record<string, string>) {
  const child = spawn(process.execPath, ['--import', 'tsx', path.resolve('tests/support/crash-server.ts')], {
    env: {
      ...process.env,
      NODE_ENV: 'test',
      APP_MODE: 'demo',
      LOG_LEVEL: 'silent',
      DATABASE_URL: inject('databaseUrl'),
      DATA_DIR: '.data/test-run',
      PUBLIC_URL: 'http://127.0.0.1:3000',
      ...env,
    },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  children.push(child);
  return new Promise<{ child: ChildProcess; base: string }>((resolve, reject) => {
    let out = '';
    child.stdout!.on('data', (d: Buffer) => {
      out += d.toString();
      const line = out.split('\n').find((l) => l.startsWith('{'));
      if (line) resolve({ child, base: `http://127.0.0.1:${(JSON.parse(line) as { port: number }).port}` });
    });
    child.on('exit', (code) => reject(new Error(`server exited early (${code})`)));
  });
}

const sleepers = async () =>
  Number(
    (
      (await t.ds.query(
        "SELECT COUNT(*) AS n FROM information_schema.PROCESSLIST WHERE INFO LIKE 'SELECT SLEEP%'",
      )) as { n: string }[]
    )[0].n,
  );

async function until(what: string, fn: () => Promise<boolean>, ms = 20_000) {
  const end = Date.now() + ms;
  while (Date.now() < end) {
    if (await fn()) return;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`timed out waiting for ${what}`);
}

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

    const paused = await startServer({ TEST_CREDIT_PAUSE_MS: '4000' });
    const cookie = await fetchSignIn(paused.base, w.accountant.user.email);
    const inFlight = postCredit(paused.base, cookie, claim.id, key).catch((e: Error) => e);
    // The transaction is open, the memo row inserted (uncommitted) and the server asleep inside it.
    await until('the paused transaction', async () => (await sleepers()) > 0);
    const exited = new Promise((r) => paused.child.on('exit', r));
    paused.child.kill('SIGKILL');
    await exited;
    expect(await inFlight).toBeInstanceOf(Error);
    // The database rolls the dead connection's transaction back.
    await until('the dead connection to go', async () => (await sleepers()) === 0);

    expect(await t.ds.getRepository(CreditMemo).countBy({ claimId: claim.id })).toBe(0);
    expect(
      await t.ds
        .getRepository(LedgerEntry)
        .countBy({ contractorId: w.contractor.id, manufacturerId: w.mfr.id }),
    ).toBe(0);
    expect((await t.ds.getRepository(Claim).findOneByOrFail({ id: claim.id })).stage).toBe('approved');
    expect(await t.ds.getRepository(IdempotencyKey).countBy({ key, userId: w.accountant.user.id })).toBe(0);
    expect(await t.ds.getRepository(AuditEvent).countBy({ entityId: claim.id })).toBe(0);

    const fresh = await startServer({});
    const cookie2 = await fetchSignIn(fresh.base, w.accountant.user.email);
    const retry = await postCredit(fresh.base, cookie2, claim.id, key);
    expect(retry.status).toBe(201);
    expect(retry.replayed).toBeNull();
    const replay = await postCredit(fresh.base, cookie2, claim.id, key);
    expect(replay).toEqual({ status: 201, replayed: 'true', text: retry.text });
    fresh.child.kill('SIGKILL');

    expect(await t.ds.getRepository(CreditMemo).countBy({ claimId: claim.id })).toBe(1);
    expect((await t.ds.getRepository(Claim).findOneByOrFail({ id: claim.id })).stage).toBe('credited');
    const ledger = await checkLedger(t.ds, { manufacturerId: w.mfr.id });
    expect(ledger.problems).toEqual([]);
    expect(ledger.balances.get(`${w.contractor.id}|${w.mfr.id}|USD`)).toBe('73.41');
  },
);
