import crypto from 'node:crypto';
import { PDFParse } from 'pdf-parse';
import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { Claim } from '../../server/db/entities/claim.entity';
import { CreditMemo } from '../../server/db/entities/credit-memo.entity';
import { IdempotencyKey } from '../../server/db/entities/idempotency-key.entity';
import { LedgerEntry } from '../../server/db/entities/ledger-entry.entity';
import { OutboxMessage } from '../../server/db/entities/outbox-message.entity';
import { sha256Hex } from '../../server/lib/pdf/hash';
import { checkLedger } from '../../server/modules/credits/ledger-check';
import { MEMO_NUMBER_PATTERN } from '../../shared/credits/memo-number';
import { sumAmounts } from '../../shared/credits/money';
import { createApprovedClaim } from '../support/credit-factories';
import { creditWorld, fetchSignIn, listen, postCredit } from '../support/credit-world';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

let t: TestContext;
let w: Awaited<ReturnType<typeof creditWorld>>;
beforeAll(async () => {
  t = await createTestApp();
  w = await creditWorld(t);
});
afterAll(() => closeTestApp(t));

const key = () => crypto.randomUUID();
const memosOf = (claimId: string) => t.ds.getRepository(CreditMemo).findBy({ claimId });
const entriesOf = async (claimId: string) => {
  const ids = (await memosOf(claimId)).map((m) => m.id);
  return ids.length
    ? t.ds
        .getRepository(LedgerEntry)
        .createQueryBuilder('l')
        .where('l.memo_id IN (:...ids)', { ids })
        .getMany()
    : [];
};
const stageOf = async (id: string) => (await t.ds.getRepository(Claim).findOneByOrFail({ id })).stage;
const approved = (extra: Partial<Parameters<typeof createApprovedClaim>[1]> = {}) =>
  createApprovedClaim(t.ds, { manufacturer: w.mfr, contractor: w.contractor, ...extra });

async function expectUntouched(claimId: string) {
  expect(await memosOf(claimId)).toHaveLength(0);
  expect(await entriesOf(claimId)).toHaveLength(0);
  expect(await stageOf(claimId)).toBe('approved');
  expect(await t.ds.getRepository(AuditEvent).countBy({ entityType: 'Claim', entityId: claimId })).toBe(0);
}

// Scoped to this file's manufacturer: other files' claims are not this check's business.
async function expectLedgerSound() {
  const report = await checkLedger(t.ds, { manufacturerId: w.mfr.id });
  expect(report.problems).toEqual([]);
}

describe('issuing a credit memo', () => {
  it('writes the memo, its ledger entry, the claim move, the audit rows and the e-mail with the stored PDF, in one go', async () => {
    const claim = await approved({ amount: '287.35' });
    const r = await w.accountant.agent
      .post(`/api/claims/${claim.id}/credits`)
      .set('Idempotency-Key', key())
      .send({});
    expect(r.status).toBe(201);
    expect(r.headers['idempotent-replayed']).toBeUndefined();
    expect(r.body).toEqual({
      creditMemo: {
        id: expect.any(String),
        number: expect.stringMatching(MEMO_NUMBER_PATTERN),
        amount: '287.35',
        currency: 'USD',
        claimId: claim.id,
      },
    });
    const memo = await t.ds.getRepository(CreditMemo).findOneByOrFail({ id: r.body.creditMemo.id });
    expect(memo).toMatchObject({
      kind: 'credit',
      amount: '287.35',
      currency: 'USD',
      creditedClaimId: claim.id,
      contractorId: w.contractor.id,
      issuedById: w.accountant.user.id,
    });
    const entries = await entriesOf(claim.id);
    expect(entries.map((e) => e.amount)).toEqual(['287.35']);
    expect(await stageOf(claim.id)).toBe('credited');
    const audit = await t.ds.getRepository(AuditEvent).findBy({ entityId: claim.id });
    expect(audit.map((a) => a.action)).toEqual(['claim.credited']);
    expect(
      await t.ds.getRepository(AuditEvent).countBy({ entityId: memo.id, action: 'credit_memo.issued' }),
    ).toBe(1);
    const mail = await t.ds
      .getRepository(OutboxMessage)
      .createQueryBuilder('o')
      .where('o.subject LIKE :s', { s: `%${memo.number}%` })
      .getMany();
    expect(mail).toHaveLength(1);
    expect(mail[0].to).toBe(w.contractorAdmin.user.email);
    expect(mail[0].attachments).toEqual([
      { filename: `${memo.number}.pdf`, contentType: 'application/pdf', storageKey: memo.pdfStorageKey },
    ]);

    const pdf = await w.accountant.agent
      .get(`/api/credits/${memo.id}/pdf`)
      .buffer(true)
      .parse((res, cb) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(pdf.status).toBe(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    expect(sha256Hex(pdf.body as Buffer)).toBe(memo.pdfSha256);
    const text = (await new PDFParse({ data: new Uint8Array(pdf.body as Buffer) }).getText()).text;
    expect(text).toContain(memo.number);
    expect(text).toContain('287.35');
    expect(text).toContain(claim.number!);
    await expectLedgerSound();
  });

  it('numbers memos CM-<code>-<year>-<sequence>, one sequence per manufacturer and year', async () => {
    const a = await approved();
    const b = await approved();
    const n1 = (
      await w.accountant.agent.post(`/api/claims/${a.id}/credits`).set('Idempotency-Key', key()).send({})
    ).body.creditMemo.number as string;
    const n2 = (
      await w.accountant.agent.post(`/api/claims/${b.id}/credits`).set('Idempotency-Key', key()).send({})
    ).body.creditMemo.number as string;
    const year = new Date().getUTCFullYear();
    expect(n1.slice(0, 3)).toBe('CM-');
    expect(n1).toContain(`-${year}-`);
    expect(Number(n2.slice(-6))).toBe(Number(n1.slice(-6)) + 1);
    expect(n1.split('-')[1]).toBe(n2.split('-')[1]);
    expect(n1.split('-')[1].slice(0, 3)).toBe(w.mfr.name.slice(0, 3).toUpperCase());
  });

  it('replays the first answer for the same key, marked as a replay, and makes no second memo', async () => {
    const claim = await approved();
    const k = key();
    const first = await w.accountant.agent
      .post(`/api/claims/${claim.id}/credits`)
      .set('Idempotency-Key', k)
      .send({ note: 'March batch' });
    const again = await w.accountant.agent
      .post(`/api/claims/${claim.id}/credits`)
      .set('Idempotency-Key', k)
      .send({ note: 'March batch' });
    expect(again.status).toBe(201);
    expect(again.headers['idempotent-replayed']).toBe('true');
    expect(again.body).toEqual(first.body);
    expect(await memosOf(claim.id)).toHaveLength(1);
  });

  it('refuses the same key with another body (422) and another key for a credited claim (409); nothing changes', async () => {
    const claim = await approved();
    const k = key();
    await w.accountant.agent.post(`/api/claims/${claim.id}/credits`).set('Idempotency-Key', k).send({});
    const other = await w.accountant.agent
      .post(`/api/claims/${claim.id}/credits`)
      .set('Idempotency-Key', k)
      .send({ note: 'changed' });
    expect(other.status).toBe(422);
    expect(other.body.error.code).toBe('idempotency.key_reused');
    const otherClaim = await approved();
    const elsewhere = await w.accountant.agent
      .post(`/api/claims/${otherClaim.id}/credits`)
      .set('Idempotency-Key', k)
      .send({});
    expect(elsewhere.status).toBe(422);
    await expectUntouched(otherClaim.id);
    const second = await w.accountant.agent
      .post(`/api/claims/${claim.id}/credits`)
      .set('Idempotency-Key', key())
      .send({});
    expect(second.status).toBe(409);
    expect(second.body.error.code).toBe('credit.already_issued');
    expect(second.body.error.message).toContain((await memosOf(claim.id))[0].number);
    expect(await memosOf(claim.id)).toHaveLength(1);
    expect(await entriesOf(claim.id)).toHaveLength(1);
  });

  it('needs an Idempotency-Key and a strict body: 400 with details, nothing written', async () => {
    const claim = await approved();
    const none = await w.accountant.agent.post(`/api/claims/${claim.id}/credits`).send({});
    expect(none.status).toBe(400);
    expect(none.body.error.details[0].path).toBe('idempotency-key');
    const short = await w.accountant.agent
      .post(`/api/claims/${claim.id}/credits`)
      .set('Idempotency-Key', 'abc')
      .send({});
    expect(short.status).toBe(400);
    const extra = await w.accountant.agent
      .post(`/api/claims/${claim.id}/credits`)
      .set('Idempotency-Key', key())
      .send({ amount: '9999.00' });
    expect(extra.status).toBe(400);
    expect(extra.body.error.code).toBe('validation.failed');
    const badId = await w.accountant.agent
      .post(`/api/claims/not-an-id/credits`)
      .set('Idempotency-Key', key())
      .send({});
    expect(badId.status).toBe(400);
    await expectUntouched(claim.id);
    expect(
      await t.ds
        .getRepository(IdempotencyKey)
        .countBy({ userId: w.accountant.user.id, requestHash: sha256Hex('x') }),
    ).toBe(0);
  });

  it('refuses claims that are not approved (409) or have no amount (409), changing nothing', async () => {
    const inReview = await approved({ stage: 'in_review' });
    const r = await w.accountant.agent
      .post(`/api/claims/${inReview.id}/credits`)
      .set('Idempotency-Key', key())
      .send({});
    expect(r.status).toBe(409);
    expect(r.body.error).toMatchObject({
      code: 'claim.invalid_transition',
      message: 'A claim in review cannot be credited.',
    });
    expect(await stageOf(inReview.id)).toBe('in_review');
    const denied = await approved({ stage: 'denied' });
    expect(
      (
        await w.accountant.agent
          .post(`/api/claims/${denied.id}/credits`)
          .set('Idempotency-Key', key())
          .send({})
      ).body.error.message,
    ).toBe('A denied claim cannot be credited.');
    const noAmount = await approved({ amount: null });
    const n = await w.accountant.agent
      .post(`/api/claims/${noAmount.id}/credits`)
      .set('Idempotency-Key', key())
      .send({});
    expect(n.status).toBe(409);
    expect(n.body.error.code).toBe('credit.no_amount');
    await expectUntouched(noAmount.id);
  });
});

describe('tenancy and roles', () => {
  it("another manufacturer's accountant gets 404, exactly like a missing claim", async () => {
    const claim = await approved();
    const r = await w.otherAccountant.agent
      .post(`/api/claims/${claim.id}/credits`)
      .set('Idempotency-Key', key())
      .send({});
    const missing = await w.otherAccountant.agent
      .post(`/api/claims/${crypto.randomUUID()}/credits`)
      .set('Idempotency-Key', key())
      .send({});
    expect(r.status).toBe(404);
    expect(r.body).toEqual(missing.body);
    await expectUntouched(claim.id);
  });

  it('a reviewer of the manufacturer and the installer of the claim get 403; another contractor 404; no session 401', async () => {
    const claim = await approved();
    for (const who of [w.reviewer, w.installer, w.contractorAdmin]) {
      const r = await who.agent
        .post(`/api/claims/${claim.id}/credits`)
        .set('Idempotency-Key', key())
        .send({});
      expect(r.status).toBe(403);
      expect(r.body.error.code).toBe('forbidden');
    }
    expect(
      (
        await w.otherInstaller.agent
          .post(`/api/claims/${claim.id}/credits`)
          .set('Idempotency-Key', key())
          .send({})
      ).status,
    ).toBe(404);
    expect(
      (await t.request().post(`/api/claims/${claim.id}/credits`).set('Idempotency-Key', key()).send({}))
        .status,
    ).toBe(401);
    await expectUntouched(claim.id);
  });

  it('memos are seen by the issuing manufacturer and the credited contractor only', async () => {
    const claim = await approved();
    const memo = (
      await w.accountant.agent.post(`/api/claims/${claim.id}/credits`).set('Idempotency-Key', key()).send({})
    ).body.creditMemo;
    expect((await w.installer.agent.get(`/api/credits/${memo.id}`)).status).toBe(200);
    expect(
      (await w.installer.agent.get(`/api/credits`)).body.items.map((m: { id: string }) => m.id),
    ).toContain(memo.id);
    expect((await w.otherInstaller.agent.get(`/api/credits/${memo.id}`)).status).toBe(404);
    expect((await w.otherInstaller.agent.get(`/api/credits/${memo.id}/pdf`)).status).toBe(404);
    expect((await w.otherAccountant.agent.get(`/api/credits/${memo.id}`)).status).toBe(404);
    expect(
      (await w.otherAccountant.agent.get(`/api/credits`)).body.items.map((m: { id: string }) => m.id),
    ).not.toContain(memo.id);
    expect((await w.reviewer.agent.get(`/api/credits`)).status).toBe(403);
    expect(
      (await w.installer.agent.post(`/api/credits/${memo.id}/void`).send({ reason: 'Not mine to void' }))
        .status,
    ).toBe(403);
    expect(
      (
        await w.otherAccountant.agent
          .post(`/api/credits/${memo.id}/void`)
          .send({ reason: 'Not mine to void' })
      ).status,
    ).toBe(404);
    expect((await w.installer.agent.get(`/api/credits/export?from=2020-01-01&to=2030-12-31`)).status).toBe(
      403,
    );
    expect((await w.installer.agent.get(`/api/credits/queue`)).status).toBe(403);
  });
});

describe('concurrency (a real listening server)', () => {
  it('50 parallel requests with distinct keys for one claim make one memo and 49 answers of 409', async () => {
    const srv = await listen(t);
    try {
      const claim = await approved({ amount: '118.07' });
      const cookie = await fetchSignIn(srv.base, w.accountant.user.email);
      const answers = await Promise.all(
        Array.from({ length: 50 }, () => postCredit(srv.base, cookie, claim.id, key())),
      );
      const statuses = answers.map((a) => a.status).sort();
      expect(statuses.filter((s) => s === 201)).toHaveLength(1);
      expect(statuses.filter((s) => s === 409)).toHaveLength(49);
      expect(await memosOf(claim.id)).toHaveLength(1);
      expect(await entriesOf(claim.id)).toHaveLength(1);
      expect(
        await t.ds.getRepository(AuditEvent).countBy({ entityId: claim.id, action: 'claim.credited' }),
      ).toBe(1);
      await expectLedgerSound();
    } finally {
      await srv.close();
    }
  });

  it('20 parallel requests with one key make one memo and 20 identical answers', async () => {
    const srv = await listen(t);
    try {
      const claim = await approved({ amount: '64.99' });
      const cookie = await fetchSignIn(srv.base, w.accountant.user.email);
      const k = key();
      const answers = await Promise.all(
        Array.from({ length: 20 }, () => postCredit(srv.base, cookie, claim.id, k)),
      );
      expect(answers.map((a) => a.status)).toEqual(Array(20).fill(201));
      expect(new Set(answers.map((a) => a.text)).size).toBe(1);
      expect(answers.filter((a) => a.replayed === 'true')).toHaveLength(19);
      expect(await memosOf(claim.id)).toHaveLength(1);
      expect(await entriesOf(claim.id)).toHaveLength(1);
      await expectLedgerSound();
    } finally {
      await srv.close();
    }
  });

  it('the database refuses a second standing credit for a claim even without the service', async () => {
    const claim = await approved();
    const memo = (
      await w.accountant.agent.post(`/api/claims/${claim.id}/credits`).set('Idempotency-Key', key()).send({})
    ).body.creditMemo;
    const row = await t.ds.getRepository(CreditMemo).findOneByOrFail({ id: memo.id });
    await expect(
      t.ds.getRepository(CreditMemo).insert({ ...row, id: crypto.randomUUID(), number: `${row.number}-X` }),
    ).rejects.toThrow(/uq_credit_memos_credited_claim/);
  });
});

describe('the ledger', () => {
  it('voiding a memo adds a reversal and a negative entry, returns the claim to approved; it can then be credited again', async () => {
    const claim = await approved({ amount: '450.10' });
    const memo = (
      await w.accountant.agent.post(`/api/claims/${claim.id}/credits`).set('Idempotency-Key', key()).send({})
    ).body.creditMemo;
    const noReason = await w.accountant.agent.post(`/api/credits/${memo.id}/void`).send({});
    expect(noReason.status).toBe(400);
    expect(await stageOf(claim.id)).toBe('credited');

    const v = await w.accountant.agent
      .post(`/api/credits/${memo.id}/void`)
      .send({ reason: 'Issued against the wrong account' });
    expect(v.status).toBe(201);
    expect(v.body.creditMemo).toMatchObject({
      amount: '450.10',
      currency: 'USD',
      claimId: claim.id,
      number: expect.stringMatching(MEMO_NUMBER_PATTERN),
    });
    expect(await stageOf(claim.id)).toBe('approved');
    // Approved again, like any approved claim: waiting on the manufacturer's accountants (shared/claims/workflow.ts).
    expect((await t.ds.getRepository(Claim).findOneByOrFail({ id: claim.id })).waitingOn).toBe(
      'manufacturer',
    );
    expect((await entriesOf(claim.id)).map((e) => e.amount).sort()).toEqual(['-450.10', '450.10']);
    const reversal = await t.ds.getRepository(CreditMemo).findOneByOrFail({ id: v.body.creditMemo.id });
    expect(reversal).toMatchObject({
      kind: 'reversal',
      reversesMemoId: memo.id,
      reason: 'Issued against the wrong account',
      creditedClaimId: null,
    });
    const again = await w.accountant.agent
      .post(`/api/credits/${memo.id}/void`)
      .send({ reason: 'Once more please' });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('credit.already_voided');
    const ofReversal = await w.accountant.agent
      .post(`/api/credits/${reversal.id}/void`)
      .send({ reason: 'Reverse the reversal' });
    expect(ofReversal.status).toBe(409);

    const listed = (await w.accountant.agent.get(`/api/credits?q=${memo.number}`)).body.items[0];
    expect(listed.reversedBy).toEqual({ id: reversal.id, number: reversal.number });

    const reissued = await w.accountant.agent
      .post(`/api/claims/${claim.id}/credits`)
      .set('Idempotency-Key', key())
      .send({});
    expect(reissued.status).toBe(201);
    expect(await stageOf(claim.id)).toBe('credited');
    expect((await entriesOf(claim.id)).map((e) => e.amount).sort()).toEqual(['-450.10', '450.10', '450.10']);
    await expectLedgerSound();
  });

  it('the database refuses to edit or delete ledger entries and memos', async () => {
    const claim = await approved();
    const memo = (
      await w.accountant.agent.post(`/api/claims/${claim.id}/credits`).set('Idempotency-Key', key()).send({})
    ).body.creditMemo;
    await expect(
      t.ds.query('UPDATE ledger_entries SET amount = 1 WHERE memo_id = ?', [memo.id]),
    ).rejects.toThrow(/append-only/);
    await expect(t.ds.query('DELETE FROM ledger_entries WHERE memo_id = ?', [memo.id])).rejects.toThrow(
      /append-only/,
    );
    await expect(t.ds.query('UPDATE credit_memos SET amount = 1 WHERE id = ?', [memo.id])).rejects.toThrow(
      /never edited/,
    );
    await expect(
      t.ds.query('UPDATE credit_memos SET credited_claim_id = ? WHERE id = ?', [
        crypto.randomUUID(),
        memo.id,
      ]),
    ).rejects.toThrow(/never edited/);
    await expect(t.ds.query('DELETE FROM credit_memos WHERE id = ?', [memo.id])).rejects.toThrow(
      /never deleted/,
    );
    expect((await entriesOf(claim.id)).map((e) => e.amount)).toEqual(['192.00']);
  });

  it('balances per contractor and currency are the sum of entries, for the contractor and for the accountant', async () => {
    const contractor = w.otherContractor;
    const amounts = ['10.01', '0.99', '1234.56'];
    const ids: string[] = [];
    for (const a of amounts) {
      const c = await createApprovedClaim(t.ds, {
        manufacturer: w.mfr,
        contractor,
        amount: a,
        currency: 'CAD',
      });
      ids.push(
        (await w.accountant.agent.post(`/api/claims/${c.id}/credits`).set('Idempotency-Key', key()).send({}))
          .body.creditMemo.id,
      );
    }
    await w.accountant.agent
      .post(`/api/credits/${ids[1]}/void`)
      .send({ reason: 'Duplicate of another memo' });
    const mine = (await w.otherInstaller.agent.get('/api/credits/balances')).body.items;
    expect(mine).toEqual([
      {
        contractor: { id: contractor.id, name: contractor.name },
        manufacturer: { id: w.mfr.id, name: w.mfr.name },
        currency: 'CAD',
        balance: '1244.57',
        memos: 4,
      },
    ]);
    const theirs = (await w.accountant.agent.get('/api/credits/balances')).body.items;
    expect(
      theirs.find((b: { contractor: { id: string } }) => b.contractor.id === contractor.id).balance,
    ).toBe('1244.57');
    const report = await checkLedger(t.ds, { manufacturerId: w.mfr.id });
    expect(report.balances.get(`${contractor.id}|${w.mfr.id}|CAD`)).toBe('1244.57');
    expect(report.problems).toEqual([]);
  });
});

describe('exports and reports', () => {
  it('the CSV lists memos and reversals in the range; its totals per currency equal the sum of its rows and the ledger', async () => {
    const t0 = await createTestApp();
    try {
      const world = await creditWorld(t0);
      const amounts = ['19.99', '0.01', '333.33', '47.50'];
      const memoIds: string[] = [];
      for (const [i, a] of amounts.entries()) {
        const c = await createApprovedClaim(t0.ds, {
          manufacturer: world.mfr,
          contractor: world.contractor,
          amount: a,
          currency: i === 3 ? 'EUR' : 'USD',
        });
        memoIds.push(
          (
            await world.accountant.agent
              .post(`/api/claims/${c.id}/credits`)
              .set('Idempotency-Key', key())
              .send({})
          ).body.creditMemo.id,
        );
      }
      await world.accountant.agent
        .post(`/api/credits/${memoIds[2]}/void`)
        .send({ reason: '=HYPERLINK("x") wrong amount' });
      const today = new Date().toISOString().slice(0, 10);
      const r = await world.accountant.agent.get(`/api/credits/export?from=${today}&to=${today}`);
      expect(r.status).toBe(200);
      expect(r.headers['content-type']).toContain('text/csv');
      const parsed = Papa.parse<Record<string, string>>(r.text, { header: true, skipEmptyLines: true }).data;
      const rows = parsed.filter((p) => p.kind !== 'total');
      const totals = parsed.filter((p) => p.kind === 'total');
      expect(rows).toHaveLength(5);
      expect(rows.find((p) => p.kind === 'reversal')).toMatchObject({
        amount: '-333.33',
        reason: `'=HYPERLINK("x") wrong amount`,
      });
      for (const tot of totals) {
        expect(tot.amount).toBe(
          sumAmounts(rows.filter((p) => p.currency === tot.currency).map((p) => p.amount)),
        );
      }
      expect(totals.map((x) => [x.currency, x.amount])).toEqual([
        ['EUR', '47.50'],
        ['USD', '20.00'],
      ]);
      const ledger = await checkLedger(t0.ds, { manufacturerId: world.mfr.id });
      expect(ledger.problems).toEqual([]);
      expect(ledger.balances.get(`${world.contractor.id}|${world.mfr.id}|USD`)).toBe('20.00');
      expect(ledger.balances.get(`${world.contractor.id}|${world.mfr.id}|EUR`)).toBe('47.50');

      const empty = await world.accountant.agent.get(`/api/credits/export?from=2001-01-01&to=2001-01-31`);
      expect(empty.text.trim().split('\r\n')).toHaveLength(1);
      expect(
        (await world.accountant.agent.get(`/api/credits/export?from=2026-02-01&to=2026-01-01`)).status,
      ).toBe(400);
      expect(
        (await world.accountant.agent.get(`/api/credits/export?from=yesterday&to=${today}`)).status,
      ).toBe(400);
      expect((await world.accountant.agent.get(`/api/credits/export`)).status).toBe(400);

      const cost = (await world.accountant.agent.get('/api/credits/cost')).body;
      expect(cost.totals).toEqual([
        { currency: 'EUR', credited: '47.50', pending: '0.00' },
        { currency: 'USD', credited: '20.00', pending: '333.33' },
      ]);
      expect(cost.byContractor).toHaveLength(2);
      expect(cost.byMonth[0].key).toMatch(/^\d{4}-\d{2}$/);
    } finally {
      await closeTestApp(t0);
    }
  });

  it("the accountant's queue lists their approved claims with amounts and ages, filtered", async () => {
    const old = await approved({ amount: '12.00', approvedAt: new Date(Date.now() - 40 * 86_400_000) });
    const foreign = await createApprovedClaim(t.ds, { manufacturer: w.otherMfr, contractor: w.contractor });
    const q = (await w.accountant.agent.get('/api/credits/queue?minAgeDays=30&pageSize=200')).body;
    expect(q.items.map((i: { claimId: string }) => i.claimId)).toContain(old.id);
    const item = q.items.find((i: { claimId: string }) => i.claimId === old.id);
    expect(item).toMatchObject({
      amount: '12.00',
      currency: 'USD',
      ageDays: 40,
      contractor: { id: w.contractor.id },
    });
    const all = (await w.accountant.agent.get('/api/credits/queue?pageSize=200')).body.items.map(
      (i: { claimId: string }) => i.claimId,
    );
    expect(all).not.toContain(foreign.id);
    expect((await w.accountant.agent.get('/api/credits/queue?minAgeDays=-1')).status).toBe(400);
    expect((await w.accountant.agent.get('/api/credits/queue?unknown=1')).status).toBe(400);
  });
});
