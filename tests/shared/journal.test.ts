import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import {
  type AccountingMapping,
  JOURNAL_CSV_COLUMNS,
  type JournalMemo,
  journalCsv,
  journalLines,
  journalSie,
  journalTotals,
} from '../../shared/credits/journal';

// Demo account codes (invented): 5410 warranty expense, 2440 contractors' credits payable.
const map: AccountingMapping = {
  debitAccount: { code: '5410', name: 'Warranty credits' },
  creditAccount: { code: '2440', name: 'Contractor credits payable' },
  journalCode: 'WC',
};

const memo = (over: Partial<JournalMemo>): JournalMemo => ({
  number: 'CM-ALD-2026-000001',
  kind: 'credit',
  issuedOn: '2026-11-03',
  amount: '120.00',
  currency: 'USD',
  claimNumber: 'LP-2026-000010',
  contractorId: '00000000-0000-4000-8000-000000000001',
  contractorName: 'Harborview Electric',
  reverses: null,
  ...over,
});

const memos = [
  memo({ number: 'CM-1', amount: '120.00' }),
  memo({ number: 'CM-2', amount: '287.35', issuedOn: '2026-11-04' }),
  memo({ number: 'CM-3', amount: '1061.88', currency: 'CAD' }),
  memo({ number: 'CM-4', kind: 'reversal', amount: '120.00', reverses: 'CM-1', issuedOn: '2026-11-20' }),
];

describe('journal lines', () => {
  it('books a memo as a debit to the mapped expense and a credit to the mapped liability, a reversal the other way', () => {
    const lines = journalLines(memos, map);
    expect(lines).toHaveLength(8);
    // Double entry: each entry's debits equal its credits (Pacioli, Summa de arithmetica, 1494; from memory).
    expect(lines.slice(0, 2).map((l) => [l.account, l.debit, l.credit])).toEqual([
      ['5410', '120.00', ''],
      ['2440', '', '120.00'],
    ]);
    expect(lines.slice(6, 8).map((l) => [l.account, l.debit, l.credit, l.date])).toEqual([
      ['2440', '120.00', '', '2026-11-20'],
      ['5410', '', '120.00', '2026-11-20'],
    ]);
    expect(lines[6].description).toBe('Reversal CM-4 of CM-1, claim LP-2026-000010, Harborview Electric');
    expect(new Set(lines.map((l) => l.journal))).toEqual(new Set(['WC']));
  });

  it('totals each currency by hand: debits equal credits', () => {
    // USD: 120.00 + 287.35 + 120.00 (the reversal) = 527.35 on each side; CAD: 1,061.88.
    expect(journalTotals(journalLines(memos, map))).toEqual([
      { currency: 'CAD', entries: 1, debit: '1061.88', credit: '1061.88' },
      { currency: 'USD', entries: 3, debit: '527.35', credit: '527.35' },
    ]);
  });
});

describe('journal CSV', () => {
  it('is one row per line under its header, with no total rows to import by mistake', () => {
    const csv = journalCsv(journalLines(memos, map));
    const parsed = Papa.parse<Record<string, string>>(csv.trim(), { header: true });
    expect(parsed.meta.fields).toEqual([...JOURNAL_CSV_COLUMNS]);
    expect(parsed.data).toHaveLength(8);
    expect(parsed.data[1]).toMatchObject({ account: '2440', debit: '', credit: '120.00', entry: 'CM-1' });
    expect(csv.endsWith('\r\n')).toBe(true);
  });

  it('keeps a contractor name that starts like a formula from running as one', () => {
    const csv = journalCsv(journalLines([memo({ contractorName: '=HYPERLINK("x")' })], map));
    expect(csv).toContain(`'=HYPERLINK`);
  });
});

describe('SIE 4 file', () => {
  // SIE filformat ver. 4B (SIE-Gruppen): the identification items, #VER with its #TRANS in braces, dates as
  // YYYYMMDD, each voucher's transactions summing to zero (debits positive, credits negative). From memory.
  const text = journalSie(memos, map, {
    company: 'Aldercrest "North" Lighting',
    generatedOn: '2026-12-03',
    currency: 'USD',
    program: 'Lumenproof',
    version: '1',
  });
  const lines = text.split('\r\n');

  it('opens with the identification items a type 4 import file needs', () => {
    expect(lines[0]).toBe('#FLAGGA 0');
    expect(lines).toContain('#FORMAT PC8');
    expect(lines).toContain('#SIETYP 4');
    expect(lines).toContain('#GEN 20261203');
    expect(lines).toContain('#VALUTA USD');
    expect(lines).toContain('#FNAMN "Aldercrest \\"North\\" Lighting"');
    expect(lines).toContain('#KONTO 5410 "Warranty credits"');
  });

  it('writes one balanced voucher per memo of the currency, a reversal with the signs swapped', () => {
    const vers = lines.filter((l) => l.startsWith('#VER'));
    expect(vers).toHaveLength(3); // the CAD memo is another file's
    expect(vers[0]).toBe(
      '#VER "WC" "" 20261103 "Credit memo CM-1, claim LP-2026-000010, Harborview Electric"',
    );
    const blocks = text.split('#VER').slice(1);
    for (const b of blocks) {
      const amounts = [...b.matchAll(/#TRANS (\d+) \{\} (-?\d+\.\d{2})/g)].map((m) =>
        Math.round(Number(m[2]) * 100),
      );
      expect(amounts).toHaveLength(2);
      expect(amounts[0] + amounts[1]).toBe(0);
    }
    expect(blocks[2]).toContain('#TRANS 2440 {} 120.00');
    expect(blocks[2]).toContain('#TRANS 5410 {} -120.00');
  });
});
