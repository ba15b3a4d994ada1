import crypto from 'node:crypto';
import iconv from 'iconv-lite';
import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AccountingMap } from '../../server/db/entities/accounting-map.entity';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { Organization } from '../../server/db/entities/organization.entity';
import { checkLedger } from '../../server/modules/credits/ledger-check';
import { sumAmounts } from '../../shared/credits/money';
import { createApprovedClaim } from '../support/credit-factories';
import { creditWorld } from '../support/credit-world';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

let t: TestContext;
let w: Awaited<ReturnType<typeof creditWorld>>;
beforeAll(async () => {
  t = await createTestApp();
  w = await creditWorld(t);
});
afterAll(() => closeTestApp(t));

// Invented demo codes: 5410 warranty credits (expense), 2440 contractor credits payable.
const MAP = {
  debitAccount: { code: '5410', name: 'Warranty credits' },
  creditAccount: { code: '2440', name: 'Contractor credits payable' },
  journalCode: 'WC',
};
const today = () => new Date().toISOString().slice(0, 10);
const yearAgo = () => new Date(Date.now() - 365 * 86_400_000).toISOString().slice(0, 10);
const range = () => `from=${yearAgo()}&to=${today()}`;

async function issue(amount: string, currency = 'USD') {
  const claim = await createApprovedClaim(t.ds, {
    manufacturer: w.mfr,
    contractor: w.contractor,
    amount,
    currency,
  });
  const r = await w.accountant.agent
    .post(`/api/claims/${claim.id}/credits`)
    .set('Idempotency-Key', crypto.randomUUID())
    .send({});
  expect(r.status).toBe(201);
  return r.body.creditMemo as { id: string; number: string };
}

describe('the accounting map', () => {
  it('is the accountants’ and administrators’ of a manufacturer only', async () => {
    expect((await w.reviewer.agent.get('/api/credits/accounting-map')).status).toBe(403);
    expect((await w.reviewer.agent.put('/api/credits/accounting-map').send(MAP)).status).toBe(403);
    expect((await w.installer.agent.put('/api/credits/accounting-map').send(MAP)).status).toBe(403);
    expect(await t.ds.getRepository(AccountingMap).countBy({ organizationId: w.mfr.id })).toBe(0);
  });

  it('refuses a bad map, naming the field, and keeps nothing', async () => {
    const r = await w.accountant.agent
      .put('/api/credits/accounting-map')
      .send({ ...MAP, creditAccount: { code: '5410', name: 'Same account' } });
    expect(r.status).toBe(400);
    expect(JSON.stringify(r.body)).toContain('creditAccount');
    const bad = await w.accountant.agent
      .put('/api/credits/accounting-map')
      .send({ ...MAP, journalCode: 'W C;' });
    expect(bad.status).toBe(400);
    expect(await t.ds.getRepository(AccountingMap).countBy({ organizationId: w.mfr.id })).toBe(0);
  });

  it('refuses a journal until the accounts are mapped', async () => {
    const r = await w.accountant.agent.get(`/api/credits/journal?${range()}`);
    expect(r.status).toBe(409);
    expect(r.body.error.code).toBe('accounting.map_missing');
  });

  it('is kept per organisation and audited', async () => {
    const r = await w.accountant.agent.put('/api/credits/accounting-map').send(MAP);
    expect(r.status).toBe(200);
    expect(r.body.accountingMap).toMatchObject(MAP);
    expect((await w.accountant.agent.get('/api/credits/accounting-map')).body.accountingMap).toMatchObject(
      MAP,
    );
    expect((await w.otherAccountant.agent.get('/api/credits/accounting-map')).body.accountingMap).toBeNull();
    expect(
      await t.ds
        .getRepository(AuditEvent)
        .countBy({ action: 'accounting_map.updated', organizationId: w.mfr.id }),
    ).toBe(1);
  });
});

describe('the journal', () => {
  it('books memos and reversals so that debits equal credits and the expense equals the ledger', async () => {
    // Contractor's name with letters outside ASCII, for the SIE file's code page below.
    await t.ds.getRepository(Organization).update({ id: w.contractor.id }, { name: 'Åsa & Sön Elektriska' });
    const a = await issue('287.35');
    await issue('1061.88');
    const c = await issue('120.00');
    const voided = await w.accountant.agent
      .post(`/api/credits/${c.id}/void`)
      .send({ reason: 'Issued against the wrong claim' });
    expect(voided.status).toBe(201);

    const r = await w.accountant.agent.get(`/api/credits/journal?${range()}&currency=USD`);
    expect(r.status).toBe(200);
    // By hand: 287.35 + 1,061.88 + 120.00 credits and one 120.00 reversal: 1,589.23 on each side; the warranty
    // account nets 287.35 + 1,061.88 = 1,349.23.
    expect(r.body.totals).toEqual([{ currency: 'USD', entries: 4, debit: '1589.23', credit: '1589.23' }]);
    type Line = { account: string; debit: string; credit: string; memoNumber: string; contractor: string };
    const lines = r.body.lines as Line[];
    expect(lines).toHaveLength(8);
    const net = (acc: string) =>
      sumAmounts([
        ...lines.filter((l) => l.account === acc && l.debit).map((l) => l.debit),
        ...lines.filter((l) => l.account === acc && l.credit).map((l) => `-${l.credit}`),
      ]);
    expect(net('5410')).toBe('1349.23');
    expect(net('2440')).toBe('-1349.23');
    expect(lines.find((l) => l.memoNumber === a.number)?.contractor).toBe('Åsa & Sön Elektriska');

    // The ledger's own balance for this contractor and manufacturer in USD is what the journal leaves owed.
    const ledger = await checkLedger(t.ds, { manufacturerId: w.mfr.id });
    expect(ledger.problems).toEqual([]);
    expect(ledger.balances.get(`${w.contractor.id}|${w.mfr.id}|USD`)).toBe('1349.23');
  });

  it('downloads the same lines as CSV', async () => {
    const r = await w.accountant.agent.get(`/api/credits/journal?${range()}&format=csv&currency=USD`);
    expect(r.status).toBe(200);
    expect(r.headers['content-type']).toMatch(/^text\/csv/);
    expect(r.headers['content-disposition']).toMatch(/lumenproof-journal-\d{4}-\d\d-\d\d-to-.*\.csv/);
    const rows = Papa.parse<Record<string, string>>(r.text.trim(), { header: true }).data;
    expect(rows).toHaveLength(8);
    expect(sumAmounts(rows.map((x) => x.debit).filter(Boolean))).toBe('1589.23');
    expect(sumAmounts(rows.map((x) => x.credit).filter(Boolean))).toBe('1589.23');
    expect(
      await t.ds
        .getRepository(AuditEvent)
        .countBy({ action: 'credits.journal_exported', organizationId: w.mfr.id }),
    ).toBeGreaterThan(0);
  });

  it('downloads an SIE 4 file in code page 437, one balanced voucher per memo', async () => {
    const r = await w.accountant.agent
      .get(`/api/credits/journal?${range()}&format=sie&currency=USD`)
      .buffer(true)
      .parse((res, done) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => done(null, Buffer.concat(chunks)));
      });
    expect(r.status).toBe(200);
    const bytes = r.body as Buffer;
    // IBM code page 437: Å is 0x8F, ö is 0x94 (IBM PC character set; from memory).
    expect(bytes.includes(Buffer.from([0x8f, 0x73, 0x61]))).toBe(true); // "Åsa"
    expect(bytes.includes(Buffer.from([0x53, 0x94, 0x6e]))).toBe(true); // "Sön"
    const text = iconv.decode(bytes, 'cp437');
    expect(text.startsWith('#FLAGGA 0\r\n')).toBe(true);
    expect(text).toContain('#FORMAT PC8');
    expect(text).toContain('#VALUTA USD');
    const vouchers = text.split('#VER').slice(1);
    expect(vouchers).toHaveLength(4);
    for (const v of vouchers) {
      const cents = [...v.matchAll(/#TRANS \d+ \{\} (-?\d+\.\d{2})/g)].map((m) =>
        Math.round(Number(m[1]) * 100),
      );
      expect(cents).toHaveLength(2);
      expect(cents.reduce((s, x) => s + x, 0)).toBe(0);
    }
  });

  it('asks for one currency when an SIE file would hold two', async () => {
    await issue('55.00', 'CAD');
    const r = await w.accountant.agent.get(`/api/credits/journal?${range()}&format=sie`);
    expect(r.status).toBe(422);
    expect(r.body.error.code).toBe('accounting.currency_required');
  });

  it('never shows another manufacturer’s memos, and is refused to those who may not export', async () => {
    await w.otherAccountant.agent.put('/api/credits/accounting-map').send(MAP);
    const other = await w.otherAccountant.agent.get(`/api/credits/journal?${range()}`);
    expect(other.status).toBe(200);
    expect(other.body.lines).toEqual([]);
    expect((await w.reviewer.agent.get(`/api/credits/journal?${range()}`)).status).toBe(403);
    expect((await w.installer.agent.get(`/api/credits/journal?${range()}`)).status).toBe(403);
    const bad = await w.accountant.agent.get('/api/credits/journal?from=2026-12-01&to=2026-11-01');
    expect(bad.status).toBe(400);
  });
});
