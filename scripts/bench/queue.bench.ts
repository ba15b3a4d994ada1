// npm run bench:queue (also a part of npm run bench)
// On the benchmarks' own database (scripts/bench/generate-claims.ts fills it when empty: 100,000 claims): the
// reviewer's queue, GET /api/review/queue (50 rows, filters and a sort; then the same with a search), through the
// real API on 127.0.0.1 beside the raw mysql2 queries returning the same rows and total, in the same run. Prints
// the medians and their ratio (aim: the API within 2x of raw), checks that both return the same rows, and prints
// the database's plan for each page query. Bounded: BENCH_ROUNDS (100) per median. Asserts nothing.
import type { AddressInfo } from 'node:net';
import mysql from 'mysql2/promise';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config/env';
import { createLogger } from '../../server/lib/logger';
import { benchEmail, generate } from './generate-claims';
import { openBenchDb, report } from './lib/bench-db';
import { createBenchClient } from './lib/http-client';
import { median } from './lib/load';
import { signInBench } from './lib/sign-in';

const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 100);
const WARM_UP = 10;

type Case = {
  name: string;
  path: string;
  /** The same page by hand: the WHERE clause and its parameters after the manufacturer's id. */
  where: string;
  params: unknown[];
  order: string;
  /** The count needs the joins only when the search reaches into them (as the route does). */
  countJoins: boolean;
};

const FROM =
  'FROM claims c JOIN organizations o ON o.id = c.contractor_id JOIN product_models p ON p.id = c.product_model_id ' +
  'JOIN installations i ON i.id = c.installation_id LEFT JOIN users u ON u.id = c.assigned_reviewer_id';
const COLUMNS =
  'c.id, c.number, c.stage, c.waiting_on, c.contractor_id, o.name AS contractor_name, p.id AS product_id, p.model_number, ' +
  'p.name AS product_name, i.site_name, c.units, JSON_LENGTH(c.serials) AS serial_count, c.filed_at, c.stage_changed_at, c.verdict, c.expected_credit, ' +
  'c.currency, c.assigned_reviewer_id AS assignee_id, u.name AS assignee_name, c.version';

function cases(): Case[] {
  const open = ['filed', 'in_review', 'unit_received', 'return_requested', 'needs_info'];
  const stageIn = `c.stage IN (${open.map(() => '?').join(', ')})`;
  // Searches (server/lib/claim-search.ts): by hand, the same FULLTEXT and LOCATE conditions on the claims alone.
  const term = 'site 4321';
  const serial = 'SN-4242';
  return [
    {
      name: 'queue, open stages + verdict, waiting longest first',
      path: `/api/review/queue?page=1&pageSize=50&stage=${open.join(',')}&verdict=review&sort=stageChangedAt`,
      where: `${stageIn} AND c.verdict = ?`,
      params: [...open, 'review'],
      order: 'c.stage_changed_at ASC, c.id ASC',
      countJoins: false,
    },
    {
      name: 'queue, open stages + amount, largest first, with a search',
      path: `/api/review/queue?page=1&pageSize=50&stage=${open.join(',')}&minAmount=70.00&sort=-amount&q=${encodeURIComponent(term)}`,
      where:
        `${stageIn} AND c.expected_credit >= ? AND (MATCH(c.search_text) AGAINST (? IN BOOLEAN MODE) AND ` +
        'LOCATE(?, c.search_text) > 0 AND LOCATE(?, c.search_text) > 0)',
      params: [...open, '70.00', '+4321*', 'site', '4321'],
      order: 'c.expected_credit DESC, c.id DESC',
      countJoins: false,
    },
    {
      name: 'queue, a serial searched, newest first',
      path: `/api/review/queue?page=1&pageSize=50&sort=-filedAt&q=${encodeURIComponent(serial)}`,
      where: '(MATCH(c.search_text) AGAINST (? IN BOOLEAN MODE) AND LOCATE(?, c.search_text) > 0)',
      params: ['+4242*', serial],
      order: 'c.filed_at DESC, c.id DESC',
      countJoins: false,
    },
  ];
}

async function main() {
  const bench = await openBenchDb({ reset: false });
  const conn = await mysql.createConnection({ uri: bench.url, dateStrings: false });
  const [{ n }] = (await bench.ds.query('SELECT COUNT(*) AS n FROM claims')) as { n: string }[];
  if (Number(n) === 0) {
    console.log('the bench database is empty: generating (BENCH_CLAIMS claims) first');
    await generate(bench.ds, { claims: Number(process.env.BENCH_CLAIMS ?? 100_000) });
  }
  const config = loadConfig({
    NODE_ENV: 'test',
    APP_MODE: 'production',
    LOG_LEVEL: 'silent',
    DATA_DIR: '.data/bench',
    OUTBOX_WORKER: 'false',
  });
  const app = createApp({
    config,
    ds: bench.ds,
    logger: createLogger(process.env.BENCH_LOG ?? 'silent'),
    databaseUrl: bench.url,
  });
  const server = app.listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  let client: ReturnType<typeof createBenchClient> | undefined;
  try {
    const [mfr] = (await bench.ds.query("SELECT id FROM organizations WHERE name = 'Bench Lighting 0'")) as {
      id: string;
    }[];
    const [{ total }] = (await bench.ds.query(
      "SELECT COUNT(*) AS total FROM claims WHERE manufacturer_id = ? AND stage <> 'draft'",
      [mfr.id],
    )) as { total: string }[];
    console.log(
      `${Number(n).toLocaleString()} claims, ${Number(total).toLocaleString()} of them on this reviewer's desk`,
    );
    const cookie = await signInBench(base, benchEmail('m', 0, 'reviewer'));
    client = createBenchClient(base, cookie);

    // What any signed-in request costs here (session from MariaDB, user, abilities): the floor under the queue.
    const meMs: number[] = [];
    for (let i = 0; i < ROUNDS + WARM_UP; i++) {
      const t0 = performance.now();
      await client.getJson('/api/auth/me');
      if (i >= WARM_UP) meMs.push(performance.now() - t0);
    }
    const me = median(meMs);
    console.log(`GET /api/auth/me (a signed-in request that reads nothing else): median ${me.toFixed(2)} ms`);
    report({
      part: 'queue',
      figure: 'signed-in request floor (GET /api/auth/me), median',
      value: me,
      unit: 'ms',
    });

    for (const tc of cases()) {
      const where = `c.manufacturer_id = ? AND c.stage <> 'draft' AND ${tc.where}`;
      const params = [mfr.id, ...tc.params];
      const pageSql = `SELECT STRAIGHT_JOIN ${COLUMNS} ${FROM} WHERE ${where} ORDER BY ${tc.order} LIMIT 50 OFFSET 0`;
      const countSql = `SELECT STRAIGHT_JOIN COUNT(*) AS n ${tc.countJoins ? FROM : 'FROM claims c'} WHERE ${where}`;
      // As the route sends it: one statement, the page carrying its total (readPageWithTotal, server/db/read.ts).
      const oneSql = `SELECT STRAIGHT_JOIN (${countSql}) AS list_total_, ${COLUMNS} ${FROM} WHERE ${where} ORDER BY ${tc.order} LIMIT 50 OFFSET 0`;
      const raw = async () => {
        const [rows] = await conn.query(oneSql, [...params, ...params]);
        const list = rows as { id: string; list_total_: string }[];
        return { ids: list.map((r) => r.id), total: Number(list[0]?.list_total_ ?? 0) };
      };
      const apiMs: number[] = [];
      const rawMs: number[] = [];
      let same = true;
      let shown = { rows: 0, total: 0 };
      for (let i = 0; i < ROUNDS + WARM_UP; i++) {
        let t0 = performance.now();
        const r = await client.getJson<{ items: { id: string }[]; total: number }>(tc.path);
        const body = r.body;
        if (r.status !== 200) throw new Error(`${tc.path}: ${r.status} ${JSON.stringify(body)}`);
        const a = performance.now() - t0;
        t0 = performance.now();
        const byHand = await raw();
        const b = performance.now() - t0;
        if (i >= WARM_UP) {
          apiMs.push(a);
          rawMs.push(b);
        }
        same &&= body.total === byHand.total && body.items.map((x) => x.id).join() === byHand.ids.join();
        shown = { rows: body.items.length, total: body.total };
      }
      const api = median(apiMs);
      const rawMedian = median(rawMs);
      console.log(
        `${tc.name}: ${shown.rows} rows of ${shown.total.toLocaleString()} (${same ? 'the same rows and total by hand' : 'DIFFERENT rows by hand'}); ` +
          `API median ${api.toFixed(2)} ms, raw mysql2 ${rawMedian.toFixed(2)} ms, ${(api / rawMedian).toFixed(2)}x (aim: within 2x)`,
      );
      const [plan] = await conn.query(`EXPLAIN ${pageSql}`, params);
      for (const p of plan as {
        table: string;
        type: string;
        key: string | null;
        rows: number;
        Extra: string;
      }[])
        console.log(`  plan: ${p.table} ${p.type} key=${p.key ?? '-'} rows=${p.rows} ${p.Extra ?? ''}`);
      const [countPlan] = await conn.query(`EXPLAIN ${countSql}`, params);
      for (const p of countPlan as {
        table: string;
        type: string;
        key: string | null;
        rows: number;
        Extra: string;
      }[])
        console.log(`  count plan: ${p.table} ${p.type} key=${p.key ?? '-'} rows=${p.rows} ${p.Extra ?? ''}`);
      report({
        part: 'queue',
        figure: `${tc.name}, API median`,
        value: api,
        unit: 'ms',
        baseline: rawMedian,
        aim: 'within 2x of raw',
      });
      report({
        part: 'queue',
        figure: `${tc.name}, raw mysql2 median (same rows)`,
        value: rawMedian,
        unit: 'ms',
      });
      if (!same)
        report({ part: 'queue', figure: `${tc.name}: rows differ from the raw query`, value: NaN, unit: '' });
    }
  } finally {
    client?.close();
    await new Promise((r) => server.close(r));
    await app.close();
    await conn.end();
    await bench.close();
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
