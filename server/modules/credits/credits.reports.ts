import Papa from 'papaparse';
import type { AbilityUser, AppAbility } from '../../../shared/abilities';
import { negate, normalizeAmount, sumAmounts, toDecimal } from '../../../shared/credits/money';
import type {
  BalanceDto,
  CostRow,
  CreditExportQuery,
  CreditListQuery,
  CreditQueueQuery,
  WarrantyCostDto,
  WarrantyCostQuery,
} from '../../../shared/schemas/credits';
import type { AppDataSource } from '../../db/data-source';
import { Claim } from '../../db/entities/claim.entity';
import { CreditMemo } from '../../db/entities/credit-memo.entity';
import { clock } from '../../lib/clock';
import { likeContains, parseSort } from '../../lib/pagination';
import { namedScope, scopeConditions } from '../../lib/tenant-scope';
import { presentMemo, presentQueueItem, type FirstApproval, type LoadedMemo } from './credits.presenter';

// Read side of the credits: lists, the accountant's queue, balances, the export and the cost view. Every query
// is scoped to the user's organisation (the manufacturer's memos, or the contractor's): the lists take that scope
// from the CASL rules (server/lib/tenant-scope.ts); ledger entries follow their memos' rule.

const MEMO_SORTS = { issuedAt: 'cm.issued_at', number: 'cm.number', amount: 'cm.amount' };
const QUEUE_SORTS = { approvedAt: 'c.stage_changed_at', amount: 'c.expected_credit', number: 'c.number' };

const dayStart = (d: string) => new Date(`${d}T00:00:00.000Z`);
const dayAfter = (d: string) => new Date(dayStart(d).getTime() + 86_400_000);

export function createCreditsReports(ds: AppDataSource) {
  function memoQuery() {
    return ds
      .getRepository(CreditMemo)
      .createQueryBuilder('cm')
      .innerJoinAndSelect('cm.contractor', 'con')
      .innerJoinAndSelect('cm.manufacturer', 'mfr')
      .innerJoinAndSelect('cm.claim', 'cl')
      .leftJoinAndSelect('cm.issuedBy', 'by')
      .leftJoinAndSelect('cm.reversesMemo', 'orig')
      .leftJoinAndMapOne('cm.reversedBy', CreditMemo, 'rev', 'rev.reverses_memo_id = cm.id');
  }

  return {
    async findMemo(id: string) {
      const memo = (await memoQuery().where('cm.id = :id', { id }).getOne()) as LoadedMemo | null;
      return memo;
    },

    async list(ability: AppAbility, user: AbilityUser, q: CreditListQuery) {
      const scope = namedScope(scopeConditions(ability, 'CreditMemo', 'cm'));
      const sort = parseSort(q.sort, MEMO_SORTS)!;
      const qb = memoQuery()
        .where(scope.sql, scope.params)
        .orderBy(sort.column, sort.direction)
        .addOrderBy('cm.number', sort.direction)
        .offset((q.page - 1) * q.pageSize)
        .limit(q.pageSize);
      if (q.kind) qb.andWhere('cm.kind = :kind', { kind: q.kind });
      if (q.contractorId) qb.andWhere('cm.contractor_id = :cid', { cid: q.contractorId });
      if (q.manufacturerId) qb.andWhere('cm.manufacturer_id = :mid', { mid: q.manufacturerId });
      if (q.currency) qb.andWhere('cm.currency = :cur', { cur: q.currency });
      if (q.from) qb.andWhere('cm.issued_at >= :from', { from: dayStart(q.from) });
      if (q.to) qb.andWhere('cm.issued_at < :to', { to: dayAfter(q.to) });
      if (q.q)
        qb.andWhere('(cm.number LIKE :q OR cl.number LIKE :q OR con.name LIKE :q)', { q: likeContains(q.q) });
      const [items, total] = await qb.getManyAndCount();
      return { items: (items as LoadedMemo[]).map((m) => presentMemo(m, user.organization.id)), total };
    },

    async queue(ability: AppAbility, user: AbilityUser, q: CreditQueueQuery) {
      const creditable = scopeConditions(ability, 'Claim', 'c', { action: 'credit' });
      const scope = namedScope(creditable);
      const sort = parseSort(q.sort, QUEUE_SORTS)!;
      const now = clock.now();
      const qb = ds
        .getRepository(Claim)
        .createQueryBuilder('c')
        .innerJoinAndSelect('c.contractor', 'con')
        .innerJoinAndSelect('c.productModel', 'pm')
        .where(scope.sql, scope.params)
        .andWhere('c.stage = :stage', { stage: 'approved' })
        // Only what can be credited: an approved claim with an amount (a replacement without credit is not money).
        .andWhere('c.expected_credit > 0')
        .orderBy(sort.column, sort.direction)
        .addOrderBy('c.id', 'ASC')
        .offset((q.page - 1) * q.pageSize)
        .limit(q.pageSize);
      if (q.contractorId) qb.andWhere('c.contractor_id = :cid', { cid: q.contractorId });
      if (q.currency) qb.andWhere('c.currency = :cur', { cur: q.currency });
      if (q.minAgeDays !== undefined) {
        qb.andWhere('c.stage_changed_at <= :before', {
          before: new Date(now.getTime() - q.minAgeDays * 86_400_000),
        });
      }
      if (q.q)
        qb.andWhere('(c.number LIKE :q OR con.name LIKE :q OR pm.model_number LIKE :q)', {
          q: likeContains(q.q),
        });
      const [items, total] = await qb.getManyAndCount();
      const totals: { currency: string; amount: string; n: string }[] = await ds.query(
        `SELECT c.currency, SUM(c.expected_credit) AS amount, COUNT(*) AS n FROM claims c
          WHERE ${creditable.sql} AND c.stage = 'approved' GROUP BY c.currency ORDER BY c.currency`,
        creditable.params,
      );
      // First approvals of credits above the second-approval amount, for this page's claims (the amount must
      // still be the claim's: a changed decision starts over).
      const firsts = new Map<string, FirstApproval>();
      if (items.length) {
        const rows: {
          claim_id: string;
          approved_by_id: string;
          name: string;
          approved_at: Date;
          amount: string;
        }[] = await ds.query(
          `SELECT a.claim_id, a.approved_by_id, u.name, a.approved_at, a.amount
               FROM credit_approvals a JOIN users u ON u.id = a.approved_by_id
              WHERE a.claim_id IN (${items.map(() => '?').join(',')})`,
          items.map((c) => c.id),
        );
        for (const r of rows)
          firsts.set(r.claim_id, {
            approvedById: r.approved_by_id,
            approverName: r.name,
            approvedAt: r.approved_at,
          });
      }
      return {
        items: items.map((c) => presentQueueItem(c, now, firsts.get(c.id), user.id)),
        total,
        totals: totals.map((t) => ({
          currency: t.currency,
          amount: normalizeAmount(t.amount ?? '0'),
          claims: Number(t.n),
        })),
      };
    },

    /** Balances: the sum of the ledger entries per contractor, manufacturer and currency. */
    async balances(ability: AppAbility): Promise<BalanceDto[]> {
      const scope = scopeConditions(ability, 'CreditMemo', 'l');
      const rows: {
        cid: string;
        cname: string;
        mid: string;
        mname: string;
        currency: string;
        balance: string;
        n: string;
      }[] = await ds.query(
        `SELECT l.contractor_id AS cid, con.name AS cname, l.manufacturer_id AS mid, mfr.name AS mname, l.currency,
                  SUM(l.amount) AS balance, COUNT(*) AS n
             FROM ledger_entries l
             JOIN organizations con ON con.id = l.contractor_id
             JOIN organizations mfr ON mfr.id = l.manufacturer_id
            WHERE ${scope.sql}
            GROUP BY l.contractor_id, con.name, l.manufacturer_id, mfr.name, l.currency
            ORDER BY mfr.name, con.name, l.currency`,
        scope.params,
      );
      return rows.map((r) => ({
        contractor: { id: r.cid, name: r.cname },
        manufacturer: { id: r.mid, name: r.mname },
        currency: r.currency,
        balance: normalizeAmount(r.balance),
        memos: Number(r.n),
      }));
    },

    /** The manufacturer's memos and reversals issued in [from, to] (UTC days), for the accounting system. */
    async exportRows(manufacturerId: string, q: CreditExportQuery) {
      const memos = (await memoQuery()
        .where('cm.manufacturer_id = :org', { org: manufacturerId })
        .andWhere('cm.issued_at >= :from AND cm.issued_at < :to', {
          from: dayStart(q.from),
          to: dayAfter(q.to),
        })
        .orderBy('cm.issued_at', 'ASC')
        .addOrderBy('cm.number', 'ASC')
        .getMany()) as LoadedMemo[];
      const rows = memos.map((m) => ({
        memo_number: m.number,
        kind: m.kind,
        issued_at: m.issuedAt.toISOString(),
        claim_number: m.claim?.number ?? '',
        contractor: m.contractor?.name ?? '',
        contractor_id: m.contractorId,
        currency: m.currency,
        amount: m.kind === 'reversal' ? negate(m.amount) : normalizeAmount(m.amount),
        reverses_memo: m.reversesMemo?.number ?? '',
        reason: m.reason ?? '',
        pdf_sha256: m.pdfSha256,
      }));
      const byCurrency = new Map<string, string[]>();
      for (const r of rows) byCurrency.set(r.currency, [...(byCurrency.get(r.currency) ?? []), r.amount]);
      const totals = [...byCurrency.entries()]
        .sort(([a], [b]) => a.localeCompare(b))
        .map(([currency, amounts]) => ({ currency, amount: sumAmounts(amounts), memos: amounts.length }));
      return { rows, totals };
    },

    toCsv(data: {
      rows: Record<string, string>[];
      totals: { currency: string; amount: string; memos: number }[];
    }) {
      const columns = [
        'memo_number',
        'kind',
        'issued_at',
        'claim_number',
        'contractor',
        'contractor_id',
        'currency',
        'amount',
        'reverses_memo',
        'reason',
        'pdf_sha256',
      ];
      // Spreadsheets run cells that begin with = + - @ as formulas; text cells get a leading apostrophe.
      const safe = (v: string) => (/^[=+\-@\t\r]/.test(v) ? `'${v}` : v);
      const body = data.rows.map((r) => columns.map((c) => (c === 'amount' ? r[c] : safe(r[c] ?? ''))));
      const totals = data.totals.map((t) =>
        columns.map((c) =>
          c === 'kind'
            ? 'total'
            : c === 'currency'
              ? t.currency
              : c === 'amount'
                ? t.amount
                : c === 'reason'
                  ? `${t.memos} memos`
                  : '',
        ),
      );
      return Papa.unparse({ fields: columns, data: [...body, ...totals] }, { newline: '\r\n' }) + '\r\n';
    },

    /** Credited (net of reversals) and pending (approved, not credited) amounts by month, product and contractor. */
    async warrantyCost(manufacturerId: string, q: WarrantyCostQuery): Promise<WarrantyCostDto> {
      const params: unknown[] = [manufacturerId];
      let ledgerRange = '';
      if (q.from) {
        ledgerRange += ' AND l.created_at >= ?';
        params.push(dayStart(q.from));
      }
      if (q.to) {
        ledgerRange += ' AND l.created_at < ?';
        params.push(dayAfter(q.to));
      }
      const cur = q.currency ? ' AND l.currency = ?' : '';
      if (q.currency) params.push(q.currency);
      type Row = { k: string; label: string; currency: string; amount: string };
      const credited = (group: string, label: string): Promise<Row[]> =>
        ds.query(
          `SELECT ${group} AS k, ${label} AS label, l.currency, SUM(l.amount) AS amount
             FROM ledger_entries l
             JOIN credit_memos cm ON cm.id = l.memo_id
             JOIN claims c ON c.id = cm.claim_id
             JOIN product_models pm ON pm.id = c.product_model_id
             JOIN organizations con ON con.id = l.contractor_id
            WHERE l.manufacturer_id = ?${ledgerRange}${cur}
            GROUP BY k, label, l.currency`,
          params,
        );
      const pParams: unknown[] = [manufacturerId];
      let pendingRange = '';
      if (q.from) {
        pendingRange += ' AND c.stage_changed_at >= ?';
        pParams.push(dayStart(q.from));
      }
      if (q.to) {
        pendingRange += ' AND c.stage_changed_at < ?';
        pParams.push(dayAfter(q.to));
      }
      if (q.currency) {
        pendingRange += ' AND c.currency = ?';
        pParams.push(q.currency);
      }
      const pending = (group: string, label: string): Promise<Row[]> =>
        ds.query(
          `SELECT ${group} AS k, ${label} AS label, c.currency, SUM(c.expected_credit) AS amount
             FROM claims c
             JOIN product_models pm ON pm.id = c.product_model_id
             JOIN organizations con ON con.id = c.contractor_id
            WHERE c.manufacturer_id = ? AND c.stage = 'approved' AND c.expected_credit IS NOT NULL${pendingRange}
            GROUP BY k, label, c.currency`,
          pParams,
        );
      const merge = (a: Row[], b: Row[], sortByKey: boolean): CostRow[] => {
        const map = new Map<string, CostRow>();
        const at = (r: Row) => {
          const id = `${r.k}|${r.currency}`;
          let row = map.get(id);
          if (!row)
            map.set(
              id,
              (row = { key: r.k, label: r.label, currency: r.currency, credited: '0.00', pending: '0.00' }),
            );
          return row;
        };
        for (const r of a) at(r).credited = normalizeAmount(r.amount);
        for (const r of b) at(r).pending = normalizeAmount(r.amount);
        const rows = [...map.values()];
        return sortByKey
          ? rows.sort((x, y) => x.key.localeCompare(y.key) || x.currency.localeCompare(y.currency))
          : rows.sort(
              (x, y) =>
                toDecimal(y.credited).plus(y.pending).comparedTo(toDecimal(x.credited).plus(x.pending)) ||
                x.label.localeCompare(y.label),
            );
      };
      const month = "DATE_FORMAT(l.created_at, '%Y-%m')";
      const pMonth = "DATE_FORMAT(c.stage_changed_at, '%Y-%m')";
      const [cm, pmo, cp, pp, cc, pc] = await Promise.all([
        credited(month, month),
        pending(pMonth, pMonth),
        credited('pm.id', "CONCAT(pm.model_number, ' · ', pm.name)"),
        pending('pm.id', "CONCAT(pm.model_number, ' · ', pm.name)"),
        credited('con.id', 'con.name'),
        pending('con.id', 'con.name'),
      ]);
      const byMonth = merge(cm, pmo, true);
      const totals = new Map<string, { credited: string[]; pending: string[] }>();
      for (const r of byMonth) {
        const t = totals.get(r.currency) ?? { credited: [], pending: [] };
        t.credited.push(r.credited);
        t.pending.push(r.pending);
        totals.set(r.currency, t);
      }
      return {
        byMonth,
        byProduct: merge(cp, pp, false),
        byContractor: merge(cc, pc, false),
        totals: [...totals.entries()]
          .sort(([a], [b]) => a.localeCompare(b))
          .map(([currency, t]) => ({
            currency,
            credited: sumAmounts(t.credited),
            pending: sumAmounts(t.pending),
          })),
      };
    },
  };
}
