import { DESK_OPTIONS_LIMIT, type QueueItemDto, type QueueQuery } from '../../../shared/claims/workflow';
import type { AppAbility } from '../../../shared/abilities';
import type { ClaimStage } from '../../../shared/schemas/claims';
import type { AppDataSource } from '../../db/data-source';
import { Conditions, readPageWithTotal, readRows } from '../../db/read';
import { claimSearch } from '../../lib/claim-search';
import { clock } from '../../lib/clock';
import { likeContains, parseSort } from '../../lib/pagination';
import { scopeConditions } from '../../lib/tenant-scope';

// The reviewer's desk: the queue (the manufacturer's claims with the reviewer's filters, sorted, paged: two
// statements a page, whatever the page size), the counts for the home panel, and the names behind the desk's
// pickers. Which claims a reviewer sees comes from the CASL rules (server/lib/tenant-scope.ts): the
// manufacturer's own, never a draft. Every filter follows manufacturer_id, and each has an index that starts
// (manufacturer_id, <filter>, …).

const SORTS: Record<string, string> = {
  filedAt: 'c.filed_at',
  stageChangedAt: 'c.stage_changed_at',
  amount: 'c.expected_credit',
  number: 'c.number',
};

/** The stages a claim can wait in for a reviewer (the summary's "mine" and "oldest waiting"). */
const OPEN_FOR_REVIEW: readonly ClaimStage[] = ['filed', 'in_review', 'unit_received', 'return_requested'];

/** One queue row as read: what review.presenter.ts turns into a QueueItemDto. */
export type QueueRow = {
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

export type SummaryRows = {
  byStage: { stage: ClaimStage; n: string | number }[];
  mine: number;
  unassigned: number;
  oldestWaitingSince: Date | null;
};

const FROM =
  'FROM claims c JOIN organizations o ON o.id = c.contractor_id JOIN product_models p ON p.id = c.product_model_id ' +
  'JOIN installations i ON i.id = c.installation_id LEFT JOIN users u ON u.id = c.assigned_reviewer_id';

function queueConditions(ability: AppAbility, q: QueueQuery, userId: string) {
  const w = new Conditions();
  const scope = scopeConditions(ability, 'Claim', 'c');
  w.and(scope.sql, ...scope.params);
  const now = clock.nowMs();
  if (q.stage) w.and('c.stage IN (?)', q.stage);
  if (q.verdict) w.and('c.verdict = ?', q.verdict);
  if (q.waitingOn) w.and('c.waiting_on = ?', q.waitingOn);
  if (q.productModelId) w.and('c.product_model_id = ?', q.productModelId);
  if (q.contractorId) w.and('c.contractor_id = ?', q.contractorId);
  if (q.minAmount) w.and('c.expected_credit >= ?', q.minAmount);
  if (q.maxAmount) w.and('c.expected_credit <= ?', q.maxAmount);
  if (q.minAgeDays !== undefined) w.and('c.filed_at <= ?', new Date(now - q.minAgeDays * 86_400_000));
  if (q.maxAgeDays !== undefined) w.and('c.filed_at >= ?', new Date(now - (q.maxAgeDays + 1) * 86_400_000));
  if (q.assignee === 'me') w.and('c.assigned_reviewer_id = ?', userId);
  else if (q.assignee === 'none') w.and('c.assigned_reviewer_id IS NULL');
  else if (q.assignee) w.and('c.assigned_reviewer_id = ?', q.assignee);
  const search = claimSearch(q.q);
  if (search) w.and(search.sql, ...search.params);
  // The search reads the claim's own search text: the count needs no join.
  return { w, countJoins: false };
}

export function createReviewService(ds: AppDataSource) {
  return {
    /** One page of the queue and the total. */
    async queue(ability: AppAbility, userId: string, q: QueueQuery) {
      const { w, countJoins } = queueConditions(ability, q, userId);
      const sort = parseSort(q.sort, SORTS)!;
      // STRAIGHT_JOIN keeps the claims first, so the page walks a (manufacturer_id, <sort>) index and stops at the
      // page's last row; left to itself the optimiser starts from the 24 organisations and sorts every match in a
      // temporary table (25x slower on 100,000 claims: scripts/bench/queue.bench.ts). The serials are counted, not
      // selected: a JSON column in a sort would put that table on disk.
      // The page carries its total (readPageWithTotal): one statement.
      return readPageWithTotal<QueueRow>(
        ds,
        {
          modifiers: 'STRAIGHT_JOIN',
          select:
            `c.id, c.number, c.stage, c.waiting_on, c.contractor_id, o.name AS contractor_name, p.id AS product_id, p.model_number, ` +
            `p.name AS product_name, i.site_name, c.units, JSON_LENGTH(c.serials) AS serial_count, c.filed_at, c.stage_changed_at, c.verdict, ` +
            `c.expected_credit, c.currency, c.assigned_reviewer_id AS assignee_id, u.name AS assignee_name, c.version`,
          rest: `${FROM} ${w.sql} ORDER BY ${sort.column} ${sort.direction}, c.id ${sort.direction} LIMIT ? OFFSET ?`,
          params: [...w.params, q.pageSize, (q.page - 1) * q.pageSize],
        },
        {
          sql: `SELECT STRAIGHT_JOIN COUNT(*) AS n ${countJoins ? FROM : 'FROM claims c'} ${w.sql}`,
          params: w.params,
        },
      );
    },

    /** The home panel's counts: claims by stage, those assigned to this reviewer, the unassigned, the oldest. */
    async summary(ability: AppAbility, userId: string): Promise<SummaryRows> {
      const scope = scopeConditions(ability, 'Claim', 'c');
      const count = (sql: string, params: unknown[]) =>
        readRows<{ n: string | number }>(ds, sql, params).then((r) => Number(r[0]?.n ?? 0));
      const [byStage, mine, unassigned, oldest] = await Promise.all([
        readRows<{ stage: ClaimStage; n: string | number }>(
          ds,
          `SELECT c.stage, COUNT(*) AS n FROM claims c WHERE ${scope.sql} GROUP BY c.stage`,
          scope.params,
        ),
        count(
          `SELECT COUNT(*) AS n FROM claims c WHERE c.assigned_reviewer_id = ? AND c.stage IN (?) AND ${scope.sql}`,
          [userId, [...OPEN_FOR_REVIEW, 'needs_info'], ...scope.params],
        ),
        count(
          `SELECT COUNT(*) AS n FROM claims c WHERE ${scope.sql} AND c.stage = 'filed' AND c.assigned_reviewer_id IS NULL`,
          scope.params,
        ),
        readRows<{ at: Date | null }>(
          ds,
          `SELECT MIN(c.stage_changed_at) AS at FROM claims c
            WHERE ${scope.sql} AND c.waiting_on = 'manufacturer' AND c.stage IN (?)`,
          [...scope.params, OPEN_FOR_REVIEW],
        ),
      ]);
      return { byStage, mine, unassigned, oldestWaitingSince: oldest[0]?.at ?? null };
    },

    /**
     * The contractors with filed claims on this manufacturer (the queue's contractor filter). The subquery walks
     * ix_claims_mfr_contractor; one row more than the limit says whether the list was cut.
     */
    async contractors(ability: AppAbility, q: { q?: string }) {
      const w = new Conditions().and("o.kind = 'contractor'");
      const scope = scopeConditions(ability, 'Claim', 'c');
      w.and(`o.id IN (SELECT c.contractor_id FROM claims c WHERE ${scope.sql})`, ...scope.params);
      if (q.q) w.and('o.name LIKE ?', likeContains(q.q));
      const rows = await readRows<{ id: string; name: string }>(
        ds,
        `SELECT o.id, o.name FROM organizations o ${w.sql} ORDER BY o.name, o.id LIMIT ?`,
        [...w.params, DESK_OPTIONS_LIMIT + 1],
      );
      return { rows: rows.slice(0, DESK_OPTIONS_LIMIT), more: rows.length > DESK_OPTIONS_LIMIT };
    },

    /**
     * The active reviewers of the signed-in reviewer's own manufacturer: whom a claim can be handed to. The people
     * list is the administrators'; this names only id and name, and only to those who may assign.
     */
    async reviewers(organizationId: string) {
      const rows = await readRows<{ id: string; name: string; roles: string }>(
        ds,
        "SELECT u.id, u.name, u.roles FROM users u WHERE u.organization_id = ? AND u.status = 'active' ORDER BY u.name, u.id",
        [organizationId],
      );
      return rows.filter((u) => (u.roles ? u.roles.split(',') : []).includes('reviewer'));
    },
  };
}

export type ReviewService = ReturnType<typeof createReviewService>;
