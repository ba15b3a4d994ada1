import { Router } from 'express';
import {
  DESK_OPTIONS_LIMIT,
  queueQuerySchema,
  reviewContractorsQuerySchema,
  reviewReviewersQuerySchema,
  type QueueItemDto,
  type QueueQuery,
  type QueueSummaryDto,
} from '../../../shared/claims/workflow';
import type { ClaimStage } from '../../../shared/schemas/claims';
import type { AppContext } from '../../context';
import { Claim } from '../../db/entities/claim.entity';
import { User } from '../../db/entities/user.entity';
import { claimSearch } from '../../lib/claim-search';
import { clock } from '../../lib/clock';
import { likeContains, pageOf, parseSort } from '../../lib/pagination';
import { authorizeNew, authorizeType, requireUser } from '../../middleware/auth';
import { parseQuery } from '../../middleware/validate';
import { presentDeskOption } from './review.presenter';

// The reviewer's desk: GET /api/review/queue (the manufacturer's claims with the reviewer's filters, sorted,
// paged: two queries a page, whatever the page size), GET /api/review/summary (counts for the home panel), and
// the names behind the desk's pickers: GET /api/review/contractors and GET /api/review/reviewers.
// Every filter leads with manufacturer_id, and each has an index that starts (manufacturer_id, <filter>, …).

const SORTS: Record<string, string> = {
  filedAt: 'c.filed_at',
  stageChangedAt: 'c.stage_changed_at',
  amount: 'c.expected_credit',
  number: 'c.number',
};

type Row = {
  id: string;
  number: string | null;
  stage: ClaimStage;
  waiting_on: 'manufacturer' | 'contractor' | null;
  contractor_id: string;
  contractor_name: string;
  product_id: string;
  model_number: string;
  product_name: string;
  site_name: string;
  units: number | null;
  serial_count: number | string | null;
  filed_at: Date | null;
  stage_changed_at: Date;
  verdict: QueueItemDto['verdict'];
  expected_credit: string | null;
  currency: string | null;
  assignee_id: string | null;
  assignee_name: string | null;
  version: number;
};

function where(q: QueueQuery, manufacturerId: string, userId: string) {
  const clauses = ['c.manufacturer_id = ?', "c.stage <> 'draft'"];
  const params: unknown[] = [manufacturerId];
  const now = clock.nowMs();
  const add = (clause: string, ...values: unknown[]) => {
    clauses.push(clause);
    params.push(...values);
  };
  if (q.stage) {
    clauses.push(`c.stage IN (${q.stage.map(() => '?').join(', ')})`);
    params.push(...q.stage);
  }
  if (q.verdict) add('c.verdict = ?', q.verdict);
  if (q.waitingOn) add('c.waiting_on = ?', q.waitingOn);
  if (q.productModelId) add('c.product_model_id = ?', q.productModelId);
  if (q.contractorId) add('c.contractor_id = ?', q.contractorId);
  if (q.minAmount) add('c.expected_credit >= ?', q.minAmount);
  if (q.maxAmount) add('c.expected_credit <= ?', q.maxAmount);
  if (q.minAgeDays !== undefined) add('c.filed_at <= ?', new Date(now - q.minAgeDays * 86_400_000));
  if (q.maxAgeDays !== undefined) add('c.filed_at >= ?', new Date(now - (q.maxAgeDays + 1) * 86_400_000));
  if (q.assignee === 'me') add('c.assigned_reviewer_id = ?', userId);
  else if (q.assignee === 'none') add('c.assigned_reviewer_id IS NULL');
  else if (q.assignee) add('c.assigned_reviewer_id = ?', q.assignee);
  const search = claimSearch(q.q);
  if (search) add(search.sql, ...search.params);
  // The search reads the claim's own search text: the count needs no join.
  return { sql: clauses.join(' AND '), params, countJoins: false };
}

export function reviewRouter(ctx: AppContext) {
  const r = Router();
  r.use(requireUser);

  r.get('/queue', async (req, res) => {
    authorizeType(req, 'review', 'Claim');
    const q = parseQuery(queueQuerySchema, req);
    const user = req.user!;
    const { sql, params, countJoins } = where(q, user.organizationId, user.id);
    const sort = parseSort(q.sort, SORTS)!;
    const from =
      'FROM claims c JOIN organizations o ON o.id = c.contractor_id JOIN product_models p ON p.id = c.product_model_id ' +
      'JOIN installations i ON i.id = c.installation_id LEFT JOIN users u ON u.id = c.assigned_reviewer_id';
    // STRAIGHT_JOIN keeps the claims first, so the page walks a (manufacturer_id, <sort>) index and stops at the
    // page's last row; left to itself the optimiser starts from the 24 organisations and sorts every match in a
    // temporary table (25x slower on 100,000 claims: scripts/bench/queue.bench.ts). The serials are counted, not
    // selected: a JSON column in a sort would put that table on disk.
    const [rows, count] = await Promise.all([
      ctx.ds.query(
        `SELECT STRAIGHT_JOIN c.id, c.number, c.stage, c.waiting_on, c.contractor_id, o.name AS contractor_name, p.id AS product_id, p.model_number, ` +
          `p.name AS product_name, i.site_name, c.units, JSON_LENGTH(c.serials) AS serial_count, c.filed_at, c.stage_changed_at, c.verdict, ` +
          `c.expected_credit, c.currency, c.assigned_reviewer_id AS assignee_id, u.name AS assignee_name, c.version ${from} WHERE ${sql} ` +
          `ORDER BY ${sort.column} ${sort.direction}, c.id ${sort.direction} LIMIT ? OFFSET ?`,
        [...params, q.pageSize, (q.page - 1) * q.pageSize],
      ) as Promise<Row[]>,
      ctx.ds.query(
        `SELECT STRAIGHT_JOIN COUNT(*) AS n ${countJoins ? from : 'FROM claims c'} WHERE ${sql}`,
        params,
      ) as Promise<{ n: number | string }[]>,
    ]);
    const now = clock.now();
    const days = (d: Date) => Math.max(0, Math.floor((now.getTime() - new Date(d).getTime()) / 86_400_000));
    const items: QueueItemDto[] = rows.map((x) => {
      return {
        id: x.id,
        number: x.number,
        stage: x.stage,
        waitingOn: x.waiting_on,
        contractor: { id: x.contractor_id, name: x.contractor_name },
        product: { id: x.product_id, modelNumber: x.model_number, name: x.product_name },
        siteName: x.site_name,
        units: x.units ?? (Number(x.serial_count ?? 0) || 1),
        filedAt: x.filed_at ? new Date(x.filed_at).toISOString() : null,
        stageChangedAt: new Date(x.stage_changed_at).toISOString(),
        daysInStage: days(x.stage_changed_at),
        daysSinceFiling: x.filed_at ? days(x.filed_at) : null,
        verdict: x.verdict,
        expectedCredit: x.expected_credit,
        currency: x.currency,
        assignee: x.assignee_id ? { id: x.assignee_id, name: x.assignee_name ?? '' } : null,
        version: x.version,
      };
    });
    res.json(pageOf(items, Number(count[0]?.n ?? 0), q));
  });

  r.get('/summary', async (req, res) => {
    authorizeType(req, 'review', 'Claim');
    const user = req.user!;
    const repo = ctx.ds.getRepository(Claim);
    const [byStage, mine, unassigned, oldest] = await Promise.all([
      ctx.ds.query(
        "SELECT stage, COUNT(*) AS n FROM claims WHERE manufacturer_id = ? AND stage <> 'draft' GROUP BY stage",
        [user.organizationId],
      ) as Promise<{ stage: ClaimStage; n: string | number }[]>,
      ctx.ds.query(
        "SELECT COUNT(*) AS n FROM claims WHERE assigned_reviewer_id = ? AND stage IN ('filed','in_review','unit_received','return_requested','needs_info')",
        [user.id],
      ) as Promise<{ n: string | number }[]>,
      ctx.ds.query(
        "SELECT COUNT(*) AS n FROM claims WHERE manufacturer_id = ? AND stage = 'filed' AND assigned_reviewer_id IS NULL",
        [user.organizationId],
      ) as Promise<{ n: string | number }[]>,
      repo
        .createQueryBuilder('c')
        .select('MIN(c.stage_changed_at)', 'at')
        .where(
          "c.manufacturer_id = :m AND c.waiting_on = 'manufacturer' AND c.stage IN ('filed','in_review','unit_received','return_requested')",
          { m: user.organizationId },
        )
        .getRawOne<{ at: Date | null }>(),
    ]);
    const summary: QueueSummaryDto = {
      counts: Object.fromEntries(byStage.map((s) => [s.stage, Number(s.n)])),
      mine: Number(mine[0]?.n ?? 0),
      unassigned: Number(unassigned[0]?.n ?? 0),
      oldestWaitingDays: oldest?.at
        ? Math.max(0, Math.floor((clock.nowMs() - new Date(oldest.at).getTime()) / 86_400_000))
        : null,
    };
    res.json(summary);
  });

  // The contractors with filed claims on this manufacturer (the queue's contractor filter). The subquery walks
  // ix_claims_mfr_contractor; one row more than the limit says whether the list was cut.
  r.get('/contractors', async (req, res) => {
    const q = parseQuery(reviewContractorsQuerySchema, req);
    authorizeNew(req, 'read', 'Organization', { kind: 'contractor' });
    const params: unknown[] = [req.user!.organizationId];
    let filter = '';
    if (q.q) {
      filter = ' AND o.name LIKE ?';
      params.push(likeContains(q.q));
    }
    const rows = (await ctx.ds.query(
      "SELECT o.id, o.name FROM organizations o WHERE o.kind = 'contractor' AND o.id IN " +
        "(SELECT c.contractor_id FROM claims c WHERE c.manufacturer_id = ? AND c.stage <> 'draft')" +
        `${filter} ORDER BY o.name, o.id LIMIT ?`,
      [...params, DESK_OPTIONS_LIMIT + 1],
    )) as { id: string; name: string }[];
    res.json({
      items: rows.slice(0, DESK_OPTIONS_LIMIT).map(presentDeskOption),
      more: rows.length > DESK_OPTIONS_LIMIT,
    });
  });

  // The active reviewers of the signed-in reviewer's own manufacturer: whom a claim can be handed to. The people
  // list is the administrators'; this names only id and name, and only to those who may assign.
  r.get('/reviewers', async (req, res) => {
    parseQuery(reviewReviewersQuerySchema, req);
    authorizeType(req, 'review', 'Claim');
    const active = await ctx.ds.getRepository(User).find({
      where: { organizationId: req.user!.organizationId, status: 'active' },
      select: { id: true, name: true, roles: true },
      order: { name: 'ASC', id: 'ASC' },
    });
    const reviewers = active.filter((u) => u.roles.includes('reviewer'));
    res.json({ items: reviewers.map(presentDeskOption) });
  });

  return r;
}
