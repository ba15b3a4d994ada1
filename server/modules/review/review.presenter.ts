import type { DeskOptionDto, QueueItemDto, QueueSummaryDto } from '../../../shared/claims/workflow';
import { pick } from '../../lib/present';
import type { QueueRow, SummaryRows } from './review.service';

// The desk's pickers name people and organisations by id and name only: a reviewer's e-mail and roles, or a
// contractor's address, are not the picker's business.

const OPTION_FIELDS = ['id', 'name'] as const;

export const presentDeskOption = (row: { id: string; name: string }): DeskOptionDto =>
  pick(row, OPTION_FIELDS);

/** Whole days from `since` to `now` (never negative). */
const daysBetween = (since: Date, now: Date) =>
  Math.max(0, Math.floor((now.getTime() - new Date(since).getTime()) / 86_400_000));

/** A queue row as the desk shows it; `now` is the request's clock (server/lib/clock.ts). */
export function presentQueueItem(x: QueueRow, now: Date): QueueItemDto {
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
    daysInStage: daysBetween(x.stage_changed_at, now),
    daysSinceFiling: x.filed_at ? daysBetween(x.filed_at, now) : null,
    verdict: x.verdict,
    expectedCredit: x.expected_credit,
    currency: x.currency,
    assignee: x.assignee_id ? { id: x.assignee_id, name: x.assignee_name ?? '' } : null,
    version: x.version,
  };
}

export function presentQueueSummary(s: SummaryRows, now: Date): QueueSummaryDto {
  return {
    counts: Object.fromEntries(s.byStage.map((r) => [r.stage, Number(r.n)])),
    mine: s.mine,
    unassigned: s.unassigned,
    oldestWaitingDays: s.oldestWaitingSince ? daysBetween(s.oldestWaitingSince, now) : null,
  };
}
