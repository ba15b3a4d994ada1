import iconv from 'iconv-lite';
import {
  type AccountingMapping,
  type JournalMemo,
  journalCsv,
  journalLines,
  journalSie,
  journalTotals,
  SIE_ACCOUNT,
} from '../../../shared/credits/journal';
import type { AccountingMapDto, AccountingMapInput, JournalQuery } from '../../../shared/schemas/credits';
import type { AppDataSource } from '../../db/data-source';
import { AccountingMap } from '../../db/entities/accounting-map.entity';
import { Organization } from '../../db/entities/organization.entity';
import { type Actor, recordAudit } from '../../lib/audit';
import { clock } from '../../lib/clock';
import { AppError } from '../../lib/errors';

// The manufacturer's books: the accounts it maps once, and its credit memos and reversals as journal entries
// (shared/credits/journal.ts) in CSV, SIE 4 or JSON for the page's preview.

const dayStart = (d: string) => new Date(`${d}T00:00:00.000Z`);
const dayAfter = (d: string) => new Date(dayStart(d).getTime() + 86_400_000);

export function presentAccountingMap(row: AccountingMap | null): AccountingMapDto | null {
  if (!row) return null;
  return {
    debitAccount: { code: row.debitAccountCode, name: row.debitAccountName },
    creditAccount: { code: row.creditAccountCode, name: row.creditAccountName },
    journalCode: row.journalCode,
    updatedAt: row.updatedAt.toISOString(),
  };
}

const mappingOf = (row: AccountingMap): AccountingMapping => ({
  debitAccount: { code: row.debitAccountCode, name: row.debitAccountName },
  creditAccount: { code: row.creditAccountCode, name: row.creditAccountName },
  journalCode: row.journalCode,
});

export function createAccountingService(ds: AppDataSource) {
  const maps = ds.getRepository(AccountingMap);

  async function memosIn(manufacturerId: string, q: JournalQuery): Promise<JournalMemo[]> {
    // Issued in the range (UTC days, as the memo CSV), oldest first; a reversal names the memo it reverses.
    const rows: {
      number: string;
      kind: 'credit' | 'reversal';
      issued_at: string;
      amount: string;
      currency: string;
      claim_number: string | null;
      contractor_id: string;
      contractor_name: string;
      reverses: string | null;
    }[] = await ds.query(
      `SELECT cm.number, cm.kind, DATE_FORMAT(cm.issued_at, '%Y-%m-%d') AS issued_at, cm.amount, cm.currency,
              cl.number AS claim_number, cm.contractor_id, con.name AS contractor_name, orig.number AS reverses
         FROM credit_memos cm
         JOIN claims cl ON cl.id = cm.claim_id
         JOIN organizations con ON con.id = cm.contractor_id
         LEFT JOIN credit_memos orig ON orig.id = cm.reverses_memo_id
        WHERE cm.manufacturer_id = ? AND cm.issued_at >= ? AND cm.issued_at < ?
              ${q.currency ? 'AND cm.currency = ?' : ''}
        ORDER BY cm.issued_at, cm.number`,
      [manufacturerId, dayStart(q.from), dayAfter(q.to), ...(q.currency ? [q.currency] : [])],
    );
    return rows.map((r) => ({
      number: r.number,
      kind: r.kind,
      issuedOn: r.issued_at,
      amount: r.amount,
      currency: r.currency,
      claimNumber: r.claim_number ?? '',
      contractorId: r.contractor_id,
      contractorName: r.contractor_name,
      reverses: r.reverses,
    }));
  }

  return {
    async getMap(organizationId: string) {
      return maps.findOne({ where: { organizationId } });
    },

    async putMap(organizationId: string, actor: Actor, input: AccountingMapInput) {
      return ds.transaction(async (m) => {
        const before = await m.findOne(AccountingMap, {
          where: { organizationId },
          lock: { mode: 'pessimistic_write' },
        });
        const values = {
          organizationId,
          debitAccountCode: input.debitAccount.code,
          debitAccountName: input.debitAccount.name,
          creditAccountCode: input.creditAccount.code,
          creditAccountName: input.creditAccount.name,
          journalCode: input.journalCode,
          updatedById: actor.userId,
        };
        await m.upsert(AccountingMap, values, ['organizationId']);
        await recordAudit(m, actor, {
          action: 'accounting_map.updated',
          entityType: 'Organization',
          entityId: organizationId,
          before: presentAccountingMap(before) as Record<string, unknown> | null,
          after: input as unknown as Record<string, unknown>,
        });
        return m.findOneOrFail(AccountingMap, { where: { organizationId } });
      });
    },

    /** The journal in the asked format; refuses until the accounts are mapped. */
    async journal(organizationId: string, actor: Actor, q: JournalQuery) {
      const row = await maps.findOne({ where: { organizationId } });
      if (!row)
        throw new AppError(
          409,
          'accounting.map_missing',
          'Map the accounts credit memos are booked to before exporting a journal.',
        );
      const map = mappingOf(row);
      const memos = await memosIn(organizationId, q);
      const lines = journalLines(memos, map);
      const totals = journalTotals(lines);
      const name = `lumenproof-journal-${q.from}-to-${q.to}`;
      if (q.format === 'json')
        return { kind: 'json' as const, body: { from: q.from, to: q.to, lines, totals } };

      let file: { kind: 'file'; type: string; filename: string; body: Buffer };
      if (q.format === 'csv') {
        file = {
          kind: 'file',
          type: 'text/csv; charset=utf-8',
          filename: `${name}.csv`,
          body: Buffer.from(journalCsv(lines)),
        };
      } else {
        // An SIE file holds one currency: the one asked for, or the only one in the range.
        const currencies = [...new Set(memos.map((mm) => mm.currency))];
        if (!q.currency && currencies.length > 1)
          throw new AppError(
            422,
            'accounting.currency_required',
            'An SIE file holds one currency: choose one.',
            [{ path: 'currency', message: `The range has memos in ${currencies.join(', ')}.` }],
          );
        const currency = q.currency ?? currencies[0] ?? null;
        for (const [field, code] of [
          ['debitAccount', map.debitAccount.code],
          ['creditAccount', map.creditAccount.code],
        ] as const)
          if (!SIE_ACCOUNT.test(code))
            throw new AppError(422, 'accounting.sie_account_code', 'SIE account codes are digits only.', [
              {
                path: `${field}.code`,
                message: `"${code}" is not a number; map a numeric account to export SIE.`,
              },
            ]);
        const org = await ds.getRepository(Organization).findOneOrFail({ where: { id: organizationId } });
        const text = journalSie(memos, map, {
          company: org.name,
          generatedOn: clock.now().toISOString().slice(0, 10),
          currency,
          program: 'Lumenproof',
          version: '1',
        });
        // #FORMAT PC8: IBM code page 437 (SIE filformat ver. 4B).
        file = {
          kind: 'file',
          type: 'text/plain; charset=IBM437',
          filename: `${name}${currency ? `-${currency}` : ''}.se`,
          body: iconv.encode(text, 'cp437'),
        };
      }
      await ds.transaction((m) =>
        recordAudit(m, actor, {
          action: 'credits.journal_exported',
          entityType: 'Organization',
          entityId: organizationId,
          after: {
            format: q.format,
            from: q.from,
            to: q.to,
            currency: q.currency ?? null,
            lines: lines.length,
            totals,
          },
        }),
      );
      return file;
    },
  };
}
