// npm run bench:claim-counts
// Does the trigger-kept claim_counts table (server/lib/claim-counts.ts) still earn its complexity? On the
// benchmarks' own database (100,000 claims, scripts/bench/generate-claims.ts fills it when empty, compacted as a
// running server keeps it), the claims list's statements for the filters that read claim_counts (by stage alone,
// or none): the page (50 rows) beside its total, run side by side as the list runs them, once with the total summed
// from claim_counts and once with a plain COUNT(*) on the (organisation, stage, filed_at) index, in the same run.
// Prints the medians and the ratio plain / claim_counts per case; the claims list's budget (issue 15) is a median
// within 1.5x of its raw queries. Bounded: BENCH_ROUNDS (200) per median. Asserts nothing.
import mysql from 'mysql2/promise';
import { compactClaimCounts, stageTotal } from '../../server/lib/claim-counts';
import type { ClaimStage } from '../../shared/schemas/claims';
import { generate } from './generate-claims';
import { openBenchDb, report } from './lib/bench-db';
import { median } from './lib/load';

const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 200);
const WARM_UP = 20;
const OPEN: ClaimStage[] = ['filed', 'in_review', 'unit_received', 'return_requested', 'needs_info'];

type Case = {
  name: string;
  /** The list's WHERE clause and its parameters (as claims.service.ts writes it). */
  where: string;
  params: unknown[];
  /** The same total from claim_counts. */
  counts: { sql: string; params: unknown[] };
};

const PAGE = (
  where: string,
) => `SELECT c.id, c.number, c.stage, c.waiting_on, c.contractor_id, c.manufacturer_id, c.installation_id,
       c.product_model_id, c.serials, c.units, c.failed_on, c.filed_at, c.stage_changed_at, c.verdict, c.engine_version,
       c.expected_credit, c.currency, c.created_at, c.updated_at, c.version, co.name AS contractor_name,
       mo.name AS manufacturer_name, p.model_number, p.name AS product_name, p.family, i.site_name, i.site_city
  FROM claims c
  LEFT JOIN organizations co ON co.id = c.contractor_id
  LEFT JOIN organizations mo ON mo.id = c.manufacturer_id
  LEFT JOIN product_models p ON p.id = c.product_model_id
  LEFT JOIN installations i ON i.id = c.installation_id
 WHERE ${where}
 ORDER BY c.filed_at DESC, c.id DESC LIMIT 50 OFFSET 0`;

function cases(mfr: string, contractor: string): Case[] {
  return [
    {
      name: 'manufacturer, every stage',
      where: "c.manufacturer_id = ? AND c.stage <> 'draft'",
      params: [mfr],
      counts: stageTotal({ organizationId: mfr, stagesNotIn: ['draft'] }),
    },
    {
      name: 'manufacturer, in review',
      where: "c.manufacturer_id = ? AND c.stage <> 'draft' AND c.stage IN (?)",
      params: [mfr, ['in_review']],
      counts: stageTotal({ organizationId: mfr, stagesIn: ['in_review'], stagesNotIn: ['draft'] }),
    },
    {
      name: 'manufacturer, open',
      where: "c.manufacturer_id = ? AND c.stage <> 'draft' AND c.stage IN (?)",
      params: [mfr, OPEN],
      counts: stageTotal({ organizationId: mfr, stagesIn: OPEN, stagesNotIn: ['draft'] }),
    },
    {
      name: 'contractor, every stage',
      where: 'c.contractor_id = ?',
      params: [contractor],
      counts: stageTotal({ organizationId: contractor }),
    },
  ];
}

async function timed(fn: () => Promise<unknown>, rounds: number) {
  const ms: number[] = [];
  for (let i = 0; i < WARM_UP + rounds; i++) {
    const t0 = performance.now();
    await fn();
    if (i >= WARM_UP) ms.push(performance.now() - t0);
  }
  return median(ms);
}

async function main() {
  const bench = await openBenchDb({ reset: false });
  const pool = mysql.createPool({ uri: bench.url, connectionLimit: 4, dateStrings: false, timezone: 'Z' });
  try {
    const [{ n }] = (await bench.ds.query('SELECT COUNT(*) AS n FROM claims')) as { n: string }[];
    if (Number(n) === 0) {
      console.log('the bench database is empty: generating (BENCH_CLAIMS claims) first');
      await generate(bench.ds, { claims: Number(process.env.BENCH_CLAIMS ?? 100_000) });
    }
    // As a running server keeps them: the appended rows folded into one per organisation and stage.
    await compactClaimCounts(bench.ds);
    const [[big], [bigC]] = (await Promise.all([
      bench.ds.query(
        'SELECT manufacturer_id AS id, COUNT(*) AS n FROM claims GROUP BY manufacturer_id ORDER BY n DESC LIMIT 1',
      ),
      bench.ds.query(
        'SELECT contractor_id AS id, COUNT(*) AS n FROM claims GROUP BY contractor_id ORDER BY n DESC LIMIT 1',
      ),
    ])) as { id: string; n: string }[][];
    console.log(
      `${Number(n).toLocaleString()} claims; the largest manufacturer has ${Number(big.n).toLocaleString()}, ` +
        `the largest contractor ${Number(bigC.n).toLocaleString()}`,
    );
    for (const c of cases(big.id, bigC.id)) {
      const plainSql = `SELECT COUNT(*) AS n FROM claims c WHERE ${c.where}`;
      const [[[a]], [[b]]] = (await Promise.all([
        pool.query(c.counts.sql, c.counts.params),
        pool.query(plainSql, c.params),
      ])) as unknown as { n: string | number }[][][];
      if (Number(a.n) !== Number(b.n))
        throw new Error(`${c.name}: claim_counts says ${a.n}, COUNT(*) ${b.n}`);
      const page = () => pool.query(PAGE(c.where), c.params);
      // Interleaved rounds would share caches either way; each measure runs its own warm-up first.
      const sumOnly = await timed(() => pool.query(c.counts.sql, c.counts.params), ROUNDS);
      const countOnly = await timed(() => pool.query(plainSql, c.params), ROUNDS);
      const listSum = await timed(
        () => Promise.all([page(), pool.query(c.counts.sql, c.counts.params)]),
        ROUNDS,
      );
      const listCount = await timed(() => Promise.all([page(), pool.query(plainSql, c.params)]), ROUNDS);
      console.log(
        `${c.name} (${Number(b.n).toLocaleString()} claims): total alone ${sumOnly.toFixed(3)} ms from claim_counts, ` +
          `${countOnly.toFixed(3)} ms by COUNT(*) (${(countOnly / sumOnly).toFixed(2)}x); page + total ` +
          `${listSum.toFixed(3)} ms with claim_counts, ${listCount.toFixed(3)} ms with COUNT(*) (${(listCount / listSum).toFixed(2)}x)`,
      );
      report({
        part: 'claim-counts',
        figure: `${c.name}: page + COUNT(*) vs page + claim_counts`,
        value: listCount,
        unit: 'ms',
        baseline: listSum,
        aim: 'within 1.5x to drop claim_counts',
      });
      report({
        part: 'claim-counts',
        figure: `${c.name}: COUNT(*) alone vs claim_counts alone`,
        value: countOnly,
        unit: 'ms',
        baseline: sumOnly,
      });
    }
  } finally {
    await pool.end();
    await bench.close();
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
