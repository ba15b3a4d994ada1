import type { EntityManager } from 'typeorm';
import { toDecimal } from '../../../shared/credits/money';

// The auditor's check: recompute every balance from the memos and compare it with the ledger, and check that
// each memo has its one entry, each credited claim its one standing credit, each voided credit its reversal.
// Used by the credit, accounting and demo tests after every scenario.

export type LedgerReport = {
  problems: string[];
  /** "contractorId|manufacturerId|currency" -> balance from the ledger's entries. */
  balances: Map<string, string>;
};

type Q = Pick<EntityManager, 'query'>;

export async function checkLedger(db: Q, scope: { manufacturerId?: string } = {}): Promise<LedgerReport> {
  const problems: string[] = [];
  const where = scope.manufacturerId ? 'WHERE cm.manufacturer_id = ?' : '';
  const args = scope.manufacturerId ? [scope.manufacturerId] : [];

  const memos: {
    id: string;
    number: string;
    kind: 'credit' | 'reversal';
    amount: string;
    currency: string;
    contractor_id: string;
    manufacturer_id: string;
    claim_id: string;
    credited_claim_id: string | null;
    reverses_memo_id: string | null;
    entries: string | number;
    entry_amount: string | null;
    entry_currency: string | null;
    entry_contractor: string | null;
    entry_manufacturer: string | null;
  }[] = await db.query(
    `SELECT cm.id, cm.number, cm.kind, cm.amount, cm.currency, cm.contractor_id, cm.manufacturer_id, cm.claim_id,
            cm.credited_claim_id, cm.reverses_memo_id, COUNT(l.id) AS entries, MIN(l.amount) AS entry_amount,
            MIN(l.currency) AS entry_currency, MIN(l.contractor_id) AS entry_contractor, MIN(l.manufacturer_id) AS entry_manufacturer
       FROM credit_memos cm LEFT JOIN ledger_entries l ON l.memo_id = cm.id ${where}
      GROUP BY cm.id`,
    args,
  );
  const fromMemos = new Map<string, ReturnType<typeof toDecimal>>();
  const reversed = new Set(memos.filter((m) => m.kind === 'reversal').map((m) => m.reverses_memo_id));
  for (const m of memos) {
    if (Number(m.entries) !== 1) problems.push(`memo ${m.number} has ${m.entries} ledger entries`);
    const signed = m.kind === 'reversal' ? toDecimal(m.amount).negated() : toDecimal(m.amount);
    if (!toDecimal(m.amount).gt(0))
      problems.push(`memo ${m.number} has a non-positive face value ${m.amount}`);
    if (m.entry_amount !== null && !toDecimal(m.entry_amount).equals(signed)) {
      problems.push(`memo ${m.number}: entry ${m.entry_amount}, memo says ${signed.toFixed(2)}`);
    }
    if (m.entry_currency !== null && m.entry_currency !== m.currency)
      problems.push(`memo ${m.number}: entry in ${m.entry_currency}`);
    if (
      m.entry_contractor !== null &&
      (m.entry_contractor !== m.contractor_id || m.entry_manufacturer !== m.manufacturer_id)
    ) {
      problems.push(`memo ${m.number}: entry on another account`);
    }
    if (m.kind === 'credit' && m.credited_claim_id === null && !reversed.has(m.id)) {
      problems.push(`credit ${m.number} is no longer standing but has no reversal`);
    }
    if (m.kind === 'credit' && m.credited_claim_id !== null && reversed.has(m.id)) {
      problems.push(`credit ${m.number} is reversed but still standing`);
    }
    if (m.kind === 'credit' && m.credited_claim_id !== null && m.credited_claim_id !== m.claim_id) {
      problems.push(`credit ${m.number} stands for another claim`);
    }
    const key = `${m.contractor_id}|${m.manufacturer_id}|${m.currency}`;
    fromMemos.set(key, (fromMemos.get(key) ?? toDecimal(0)).plus(signed));
  }

  const lwhere = scope.manufacturerId ? 'WHERE manufacturer_id = ?' : '';
  const sums: { k: string; balance: string }[] = await db.query(
    `SELECT CONCAT(contractor_id, '|', manufacturer_id, '|', currency) AS k, SUM(amount) AS balance
       FROM ledger_entries ${lwhere} GROUP BY contractor_id, manufacturer_id, currency`,
    args,
  );
  const balances = new Map(sums.map((s) => [s.k, toDecimal(s.balance).toFixed(2)]));
  for (const [k, v] of fromMemos) {
    if (!toDecimal(balances.get(k) ?? '0').equals(v))
      problems.push(`account ${k}: ledger ${balances.get(k)}, memos ${v.toFixed(2)}`);
  }
  for (const k of balances.keys())
    if (!fromMemos.has(k)) problems.push(`account ${k} has entries but no memos`);

  const cwhere = scope.manufacturerId ? 'AND c.manufacturer_id = ?' : '';
  const claims: { id: string; number: string | null; stage: string; standing: string | number }[] =
    await db.query(
      `SELECT c.id, c.number, c.stage, COUNT(cm.id) AS standing
       FROM claims c LEFT JOIN credit_memos cm ON cm.credited_claim_id = c.id
      WHERE (c.stage = 'credited' OR cm.id IS NOT NULL) ${cwhere}
      GROUP BY c.id`,
      args,
    );
  for (const c of claims) {
    const standing = Number(c.standing);
    if (c.stage === 'credited' && standing !== 1)
      problems.push(`claim ${c.number ?? c.id} is credited with ${standing} standing memos`);
    if (standing > 0 && c.stage !== 'credited' && c.stage !== 'closed') {
      problems.push(`claim ${c.number ?? c.id} has a standing credit but is ${c.stage}`);
    }
  }
  return { problems, balances };
}
