import type { DataSource } from 'typeorm';
import type { ClaimStage } from '../../shared/schemas/claims';
import type { Logger } from './logger';

// Claims per organisation and stage (server/db/entities/claim-count.entity.ts): triggers append +1 and -1 rows in
// the transaction that changes a claim, and compaction folds each organisation and stage into a single row. A sum
// over these rows is exact at every moment, compacted or not.

/** The statement and parameters summing an organisation's claims at the given stages (all stages when omitted). */
export function stageTotal(opts: {
  organizationId: string;
  stagesIn?: readonly ClaimStage[];
  stagesNotIn?: readonly ClaimStage[];
}) {
  const where = ['organization_id = ?'];
  const params: unknown[] = [opts.organizationId];
  if (opts.stagesIn) {
    where.push('stage IN (?)');
    params.push(opts.stagesIn.length ? opts.stagesIn : ['']);
  }
  if (opts.stagesNotIn?.length) {
    where.push('stage NOT IN (?)');
    params.push(opts.stagesNotIn);
  }
  return { sql: `SELECT COALESCE(SUM(n), 0) AS n FROM claim_counts WHERE ${where.join(' AND ')}`, params };
}

/**
 * Folds every organisation and stage with more than one row into one row holding their sum (none when it is 0).
 * The rows it folds are read with a locking read, so a change still uncommitted is waited for rather than lost, and
 * exactly those rows are deleted; rows appended meanwhile are left for next time. One compaction at a time (a
 * named lock), in READ COMMITTED so that no gap is locked against the triggers' inserts.
 */
export async function compactClaimCounts(ds: DataSource): Promise<{ folded: number; groups: number }> {
  return ds.transaction('READ COMMITTED', async (m) => {
    const [{ got }] = (await m.query("SELECT GET_LOCK('lumenproof.claim_counts', 0) AS got")) as {
      got: number | string | null;
    }[];
    if (Number(got) !== 1) return { folded: 0, groups: 0 };
    try {
      const rows = (await m.query(
        `SELECT id, organization_id, stage, n FROM claim_counts
          WHERE (organization_id, stage) IN
                (SELECT organization_id, stage FROM claim_counts GROUP BY organization_id, stage HAVING COUNT(*) > 1)
          FOR UPDATE`,
      )) as { id: string; organization_id: string; stage: ClaimStage; n: number }[];
      if (!rows.length) return { folded: 0, groups: 0 };
      const sums = new Map<string, { org: string; stage: ClaimStage; n: number }>();
      for (const r of rows) {
        const key = `${r.organization_id}/${r.stage}`;
        const g = sums.get(key) ?? { org: r.organization_id, stage: r.stage, n: 0 };
        g.n += Number(r.n);
        sums.set(key, g);
      }
      for (let i = 0; i < rows.length; i += 1000) {
        await m.query('DELETE FROM claim_counts WHERE id IN (?)', [rows.slice(i, i + 1000).map((r) => r.id)]);
      }
      const kept = [...sums.values()].filter((g) => g.n !== 0);
      for (let i = 0; i < kept.length; i += 500) {
        const part = kept.slice(i, i + 500);
        await m.query(
          `INSERT INTO claim_counts (organization_id, stage, n) VALUES ${part.map(() => '(?, ?, ?)').join(', ')}`,
          part.flatMap((g) => [g.org, g.stage, g.n]),
        );
      }
      return { folded: rows.length, groups: sums.size };
    } finally {
      await m.query("SELECT RELEASE_LOCK('lumenproof.claim_counts')");
    }
  });
}

/** Where the counts disagree with the claims themselves (empty when they agree, as they always should). */
export async function claimCountsDrift(ds: DataSource) {
  return (await ds.query(
    `SELECT org AS organizationId, stage, SUM(counted) AS counted, SUM(actual) AS actual FROM (
       SELECT organization_id AS org, stage, n AS counted, 0 AS actual FROM claim_counts
       UNION ALL SELECT contractor_id, stage, 0, 1 FROM claims
       UNION ALL SELECT manufacturer_id, stage, 0, 1 FROM claims
     ) t GROUP BY org, stage HAVING SUM(counted) <> SUM(actual)`,
  )) as { organizationId: string; stage: ClaimStage; counted: string; actual: string }[];
}

/** Compacts now and then (every `intervalMs`, first soon after start); errors are logged, never thrown. */
export function startClaimCountsCompaction(ds: DataSource, logger: Logger, intervalMs = 60_000) {
  let running: Promise<unknown> | null = null;
  const run = () => {
    if (running) return;
    running = compactClaimCounts(ds)
      .then((r) => r.folded && logger.debug(r, 'claim counts compacted'))
      .catch((err: unknown) => logger.warn({ err }, 'claim counts compaction failed'))
      .finally(() => (running = null));
  };
  const first = setTimeout(run, 1_000);
  const timer = setInterval(run, intervalMs);
  first.unref();
  timer.unref();
  return {
    async stop() {
      clearTimeout(first);
      clearInterval(timer);
      await running;
    },
  };
}
