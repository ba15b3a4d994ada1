import type { DataSource } from 'typeorm';
import {
  AGEING_BUCKETS,
  AGEING_STAGES,
  bucketOf,
  type AgeingClaimDto,
  type AgeingDto,
  type AgeingRowDto,
  type AgeingStage,
  type StageTargets,
} from '../../../shared/schemas/ageing';
import { Organization } from '../../db/entities/organization.entity';
import { readRows } from '../../db/read';
import { recordAudit, type Actor } from '../../lib/audit';
import { clock } from '../../lib/clock';

const DAY_MS = 86_400_000;

type Row = {
  id: string;
  number: string | null;
  stage: AgeingStage;
  stage_changed_at: Date;
  reviewer_id: string | null;
  reviewer: string | null;
};

const emptyRow = (): AgeingRowDto => ({
  counts: Object.fromEntries(AGEING_BUCKETS.map((b) => [b, 0])) as AgeingRowDto['counts'],
  total: 0,
  overTarget: 0,
});

export function createAgeingService(ds: DataSource) {
  return {
    async view(manufacturerId: string): Promise<AgeingDto> {
      const org = await ds.getRepository(Organization).findOneByOrFail({ id: manufacturerId });
      const targets: StageTargets = org.stageTargets ?? {};
      const rows = await readRows<Row>(
        ds,
        `SELECT c.id, c.number, c.stage, c.stage_changed_at, c.assigned_reviewer_id AS reviewer_id, u.name AS reviewer
           FROM claims c LEFT JOIN users u ON u.id = c.assigned_reviewer_id
          WHERE c.manufacturer_id = ? AND c.stage IN (?)`,
        [manufacturerId, AGEING_STAGES],
      );
      const now = clock.nowMs();
      const byStage = new Map(AGEING_STAGES.map((s) => [s, emptyRow()]));
      const byReviewer = new Map<string, { reviewerId: string | null; reviewer: string } & AgeingRowDto>();
      const overdue: AgeingClaimDto[] = [];
      for (const r of rows) {
        // Whole days waited in the stage, counted from when the claim entered it.
        const days = Math.max(0, Math.floor((now - new Date(r.stage_changed_at).getTime()) / DAY_MS));
        const target = targets[r.stage];
        const over = target !== undefined && days > target;
        const key = r.reviewer_id ?? 'nobody';
        let rev = byReviewer.get(key);
        if (!rev) {
          rev = { reviewerId: r.reviewer_id, reviewer: r.reviewer ?? 'Nobody yet', ...emptyRow() };
          byReviewer.set(key, rev);
        }
        for (const row of [byStage.get(r.stage)!, rev]) {
          row.counts[bucketOf(days)]++;
          row.total++;
          if (over) row.overTarget++;
        }
        if (over)
          overdue.push({
            id: r.id,
            number: r.number ?? 'draft',
            stage: r.stage,
            days,
            reviewer: r.reviewer,
            overTarget: true,
          });
      }
      return {
        targets,
        byStage: AGEING_STAGES.map((stage) => ({
          stage,
          target: targets[stage] ?? null,
          ...byStage.get(stage)!,
        })),
        byReviewer: [...byReviewer.values()].sort((a, b) => a.reviewer.localeCompare(b.reviewer)),
        overdue: overdue.sort((a, b) => b.days - a.days).slice(0, 500),
      };
    },

    async setTargets(manufacturerId: string, targets: StageTargets, actor: Actor) {
      await ds.transaction(async (m) => {
        const before = (await m.findOneByOrFail(Organization, { id: manufacturerId })).stageTargets;
        await m.update(Organization, { id: manufacturerId }, { stageTargets: targets });
        await recordAudit(m, actor, {
          action: 'organization.stage_targets_set',
          entityType: 'Organization',
          entityId: manufacturerId,
          before: { stageTargets: before },
          after: { stageTargets: targets },
        });
      });
    },
  };
}

const cell = (v: string | number) => {
  const s = String(v);
  // RFC 4180 quoting; a leading formula character is neutralised (OWASP CSV injection).
  const safe = /^[=+\-@]/.test(s) ? `'${s}` : s;
  return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
};

/** The view as CSV: the stage table, the reviewer table, then the claims past target. */
export function ageingCsv(v: AgeingDto): string {
  const lines: (string | number)[][] = [
    ['section', 'name', 'target_days', ...AGEING_BUCKETS.map((b) => `days_${b}`), 'total', 'over_target'],
    ...v.byStage.map((s) => [
      'stage',
      s.stage,
      s.target ?? '',
      ...AGEING_BUCKETS.map((b) => s.counts[b]),
      s.total,
      s.overTarget,
    ]),
    ...v.byReviewer.map((r) => [
      'reviewer',
      r.reviewer,
      '',
      ...AGEING_BUCKETS.map((b) => r.counts[b]),
      r.total,
      r.overTarget,
    ]),
    [],
    ['claim', 'stage', 'days_waiting', 'reviewer'],
    ...v.overdue.map((c) => [c.number, c.stage, c.days, c.reviewer ?? '']),
  ];
  return lines.map((l) => l.map(cell).join(',')).join('\r\n') + '\r\n';
}
