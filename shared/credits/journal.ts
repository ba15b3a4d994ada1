import Papa from 'papaparse';
import { normalizeAmount, sumAmounts } from './money';
import type { JournalLine, JournalTotal } from '../schemas/credits';

// Credit memos and their reversals as a double-entry journal for a manufacturer's books, in two forms: CSV lines
// and an SIE 4 file (the Swedish SIE-Gruppen's open interchange format, "SIE filformat ver. 4B", which accounting
// packages import as vouchers). No I/O: the server loads the memos and encodes the file.
//
// A credit memo charges the account the manufacturer books warranty credits to (debit) and credits the account
// that holds what it owes its contractors, or reduces what they owe it (credit). A reversal is the same entry the
// other way round, dated when the memo was voided. Each entry balances; so does every export.

export type AccountRef = { code: string; name: string };

/** The accounts an organisation maps once (PUT /api/credits/accounting-map). */
export type AccountingMapping = {
  /** Debited by a credit memo: warranty expense, or the warranty provision where one is kept. */
  debitAccount: AccountRef;
  /** Credited by a credit memo: contractors' credits payable, or trade receivables. */
  creditAccount: AccountRef;
  /** The journal (voucher series) the entries go into. */
  journalCode: string;
};

export type JournalMemo = {
  number: string;
  kind: 'credit' | 'reversal';
  /** The calendar day the memo was issued (YYYY-MM-DD). */
  issuedOn: string;
  /** Positive, two places, as stored. */
  amount: string;
  currency: string;
  claimNumber: string;
  contractorId: string;
  contractorName: string;
  /** For a reversal, the memo it reverses. */
  reverses: string | null;
};

// The line and total shapes are zod in shared/schemas/credits.ts (the journal export's answer).
export type { JournalLine, JournalTotal };

export function describeMemo(m: JournalMemo) {
  return m.kind === 'reversal'
    ? `Reversal ${m.number} of ${m.reverses ?? 'a credit memo'}, claim ${m.claimNumber}, ${m.contractorName}`
    : `Credit memo ${m.number}, claim ${m.claimNumber}, ${m.contractorName}`;
}

/** Two lines per memo: debit then credit, the accounts swapped for a reversal. */
export function journalLines(memos: readonly JournalMemo[], map: AccountingMapping): JournalLine[] {
  const lines: JournalLine[] = [];
  for (const m of memos) {
    const amount = normalizeAmount(m.amount);
    const [debited, credited] =
      m.kind === 'reversal' ? [map.creditAccount, map.debitAccount] : [map.debitAccount, map.creditAccount];
    const common = {
      journal: map.journalCode,
      entry: m.number,
      date: m.issuedOn,
      currency: m.currency,
      memoNumber: m.number,
      kind: m.kind,
      claimNumber: m.claimNumber,
      contractor: m.contractorName,
      contractorId: m.contractorId,
      description: describeMemo(m),
    };
    lines.push({ ...common, account: debited.code, accountName: debited.name, debit: amount, credit: '' });
    lines.push({ ...common, account: credited.code, accountName: credited.name, debit: '', credit: amount });
  }
  return lines;
}

/** Per currency: the number of entries and the sums of the debit and credit columns (equal when balanced). */
export function journalTotals(lines: readonly JournalLine[]): JournalTotal[] {
  const by = new Map<string, { entries: Set<string>; debit: string[]; credit: string[] }>();
  for (const l of lines) {
    const t = by.get(l.currency) ?? { entries: new Set(), debit: [], credit: [] };
    t.entries.add(l.entry);
    if (l.debit) t.debit.push(l.debit);
    if (l.credit) t.credit.push(l.credit);
    by.set(l.currency, t);
  }
  return [...by.entries()]
    .sort(([a], [b]) => a.localeCompare(b))
    .map(([currency, t]) => ({
      currency,
      entries: t.entries.size,
      debit: sumAmounts(t.debit),
      credit: sumAmounts(t.credit),
    }));
}

export const JOURNAL_CSV_COLUMNS = [
  'journal',
  'entry',
  'date',
  'account',
  'account_name',
  'debit',
  'credit',
  'currency',
  'memo_number',
  'kind',
  'claim_number',
  'contractor',
  'contractor_id',
  'description',
] as const;

/** One row per line and nothing else (no total rows), so that an accounting package can import it as it is. */
export function journalCsv(lines: readonly JournalLine[]): string {
  // Spreadsheets run cells that begin with = + - @ as formulas; text cells get a leading apostrophe.
  const safe = (v: string) => (/^[=+\-@\t\r]/.test(v) ? `'${v}` : v);
  const data = lines.map((l) => [
    safe(l.journal),
    safe(l.entry),
    l.date,
    safe(l.account),
    safe(l.accountName),
    l.debit,
    l.credit,
    l.currency,
    safe(l.memoNumber),
    l.kind,
    safe(l.claimNumber),
    safe(l.contractor),
    l.contractorId,
    safe(l.description),
  ]);
  return Papa.unparse({ fields: [...JOURNAL_CSV_COLUMNS], data }, { newline: '\r\n' }) + '\r\n';
}

/** SIE account numbers are digits (the BAS chart's four-digit accounts among them). */
export const SIE_ACCOUNT = /^\d{1,10}$/;

/** A quoted SIE field: backslash before a quote or a backslash; control characters dropped. */
function sieText(s: string) {
  // eslint-disable-next-line no-control-regex
  return `"${s.replace(/[\x00-\x1f\x7f]/g, ' ').replace(/(["\\])/g, '\\$1')}"`;
}

const sieDate = (iso: string) => iso.replaceAll('-', '');

/**
 * An SIE 4 file of type 4I (vouchers for import) for one currency (null: the memos are all in one already). The text is returned as a string; it must be
 * written in IBM code page 437 (#FORMAT PC8). Each memo is a voucher (#VER) in the mapped series whose
 * transactions (#TRANS) sum to zero: a debit is positive, a credit negative. The voucher number is left empty so
 * that the importing package numbers them in its own series; the memo number goes in the voucher text.
 */
export function journalSie(
  memos: readonly JournalMemo[],
  map: AccountingMapping,
  opts: { company: string; generatedOn: string; currency: string | null; program: string; version: string },
): string {
  const out: string[] = [
    '#FLAGGA 0',
    `#PROGRAM ${sieText(opts.program)} ${sieText(opts.version)}`,
    '#FORMAT PC8',
    `#GEN ${sieDate(opts.generatedOn)}`,
    '#SIETYP 4',
    `#FNAMN ${sieText(opts.company)}`,
    // The currency of the amounts; without it an importing package assumes its own.
    ...(opts.currency ? [`#VALUTA ${opts.currency}`] : []),
    `#KONTO ${map.debitAccount.code} ${sieText(map.debitAccount.name)}`,
    `#KONTO ${map.creditAccount.code} ${sieText(map.creditAccount.name)}`,
  ];
  for (const m of memos) {
    if (opts.currency && m.currency !== opts.currency) continue;
    const amount = normalizeAmount(m.amount);
    const [debited, credited] =
      m.kind === 'reversal' ? [map.creditAccount, map.debitAccount] : [map.debitAccount, map.creditAccount];
    const text = sieText(describeMemo(m));
    out.push(`#VER ${sieText(map.journalCode)} "" ${sieDate(m.issuedOn)} ${text}`);
    out.push('{');
    out.push(`   #TRANS ${debited.code} {} ${amount}`);
    out.push(`   #TRANS ${credited.code} {} -${amount}`);
    out.push('}');
  }
  return out.join('\r\n') + '\r\n';
}
