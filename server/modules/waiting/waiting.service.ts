import { In, type DataSource } from 'typeorm';
import { addDays } from '../../../shared/claims/workflow';
import { calendarDayIn } from '../../../shared/dates';
import { RETURN_OVERDUE_DAYS, type WaitingItemDto, type WaitingKind } from '../../../shared/schemas/waiting';
import type { SessionUser } from '../../auth/passport';
import { WaitingRead } from '../../db/entities/waiting-read.entity';
import { readRows } from '../../db/read';
import { clock } from '../../lib/clock';

type Row = { id: string; number: string | null; site_name: string; since: Date | string };

const LIMIT = 200;
const BASE = `SELECT c.id, c.number, i.site_name, c.stage_changed_at AS since
  FROM claims c JOIN installations i ON i.id = c.installation_id`;

const sinceIso = (v: Date | string) =>
  (v instanceof Date ? v : new Date(`${String(v).replace(' ', 'T')}Z`)).toISOString();

/** The claims waiting on this person, by what their roles make them answer for; each query at most 200 rows. */
export async function itemsFor(ds: DataSource, user: SessionUser): Promise<Omit<WaitingItemDto, 'read'>[]> {
  const org = user.organizationId;
  const has = (r: string) => user.roles.includes(r as never);
  const out: Omit<WaitingItemDto, 'read'>[] = [];
  const add = (kind: WaitingKind, rows: Row[], link: (id: string) => string) => {
    for (const r of rows) {
      const since = sinceIso(r.since);
      out.push({
        key: `${kind}:${r.id}:${Date.parse(since)}`,
        kind,
        claimId: r.id,
        claimNumber: r.number ?? 'draft',
        siteName: r.site_name,
        since,
        link: link(r.id),
      });
    }
  };
  if (user.organization.kind === 'contractor' && has('installer')) {
    add(
      'info_requested',
      await readRows<Row>(
        ds,
        `${BASE} WHERE c.contractor_id = ? AND c.stage = 'needs_info' ORDER BY since LIMIT ${LIMIT}`,
        [org],
      ),
      (id) => `/claims/${id}/workflow`,
    );
  }
  if (user.organization.kind === 'manufacturer' && has('reviewer')) {
    add(
      'assigned_to_review',
      await readRows<Row>(
        ds,
        `${BASE} WHERE c.manufacturer_id = ? AND c.assigned_reviewer_id = ?
            AND c.stage IN ('filed', 'in_review', 'unit_received') ORDER BY since LIMIT ${LIMIT}`,
        [org, user.id],
      ),
      (id) => `/review/${id}`,
    );
    // Shipped on or before this day (in the manufacturer's zone) and still not received: overdue.
    const cutoff = addDays(calendarDayIn(clock.now(), user.organization.timeZone), -RETURN_OVERDUE_DAYS);
    add(
      'return_overdue',
      await readRows<Row>(
        ds,
        `SELECT c.id, c.number, i.site_name, ra.shipped_on AS since
           FROM return_authorizations ra
           JOIN claims c ON c.id = ra.claim_id
           JOIN installations i ON i.id = c.installation_id
          WHERE c.manufacturer_id = ? AND ra.shipped_on IS NOT NULL AND ra.received_on IS NULL
            AND ra.shipped_on <= ? ORDER BY ra.shipped_on LIMIT ${LIMIT}`,
        [org, cutoff],
      ),
      (id) => `/review/${id}`,
    );
  }
  if (user.organization.kind === 'manufacturer' && has('accountant')) {
    add(
      'memo_due',
      await readRows<Row>(
        ds,
        `${BASE} WHERE c.manufacturer_id = ? AND c.stage = 'approved' ORDER BY since LIMIT ${LIMIT}`,
        [org],
      ),
      () => '/credits',
    );
  }
  return out.sort((a, b) => a.since.localeCompare(b.since));
}

export function createWaitingService(ds: DataSource) {
  return {
    async list(user: SessionUser) {
      const items = await itemsFor(ds, user);
      const keys = items.map((i) => i.key);
      const read = keys.length
        ? new Set(
            (await ds.getRepository(WaitingRead).find({ where: { userId: user.id, itemKey: In(keys) } })).map(
              (r) => r.itemKey,
            ),
          )
        : new Set<string>();
      const withRead = items.map((i) => ({ ...i, read: read.has(i.key) }));
      return { items: withRead, unread: withRead.filter((i) => !i.read).length };
    },

    /** Marks items read; only keys that are on this person's list now count (anything else is ignored). */
    async markRead(user: SessionUser, keys: string[]) {
      const mine = new Set((await itemsFor(ds, user)).map((i) => i.key));
      const rows = [...new Set(keys)]
        .filter((k) => mine.has(k))
        .map((itemKey) => ({ userId: user.id, itemKey, readAt: clock.now() }));
      if (rows.length) await ds.getRepository(WaitingRead).upsert(rows, ['userId', 'itemKey']);
      return rows.length;
    },
  };
}
