// npm run bench:api
// On the benchmarks' own database (scripts/bench/generate-claims.ts fills it when empty): the list (50 rows, a
// filter and a sort) through the real API on 127.0.0.1 beside the raw mysql2 statements the route sends (the
// session's, then the page carrying its total), in the same run (medians and their ratio; aim: within 1.5x); then
// throughput and latency with 16 concurrent keep-alive connections for the list and a record's page (issue 15's
// aims: the claims list 600 req/s with p99 under 100 ms, the other pages 450 req/s).
// Bounded: BENCH_LOAD_SECONDS (10) per load run after BENCH_WARM_SECONDS (5) of warm-up, BENCH_ROUNDS (100) per
// median. Asserts nothing.
import os from 'node:os';
import mysql from 'mysql2/promise';
import { SESSION_SQL } from '../../server/auth/session';
import { compactClaimCounts } from '../../server/lib/claim-counts';
import { benchEmail, generate } from './generate-claims';
import { hasTable, openBenchDb, report } from './lib/bench-db';
import { cpuMeter } from './lib/cpu';
import { createBenchClient } from './lib/http-client';
import { median, runLoad } from './lib/load';
import { startServerProcess } from './lib/server-process';
import { signInBench } from './lib/sign-in';

const SECONDS = Number(process.env.BENCH_LOAD_SECONDS ?? 10);
const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 100);
const CONNECTIONS = 16;
const WARM_SECONDS = Number(process.env.BENCH_WARM_SECONDS ?? 5);

type Target = {
  name: string;
  /** The list through the API. */
  listPath: string;
  /**
   * The same page by hand, as the route sends it: the session's statement (server/auth/session.ts), then the page
   * carrying its total in one statement (readPageWithTotal, server/db/read.ts).
   */
  raw: (conn: mysql.Connection, sid: string) => Promise<unknown[]>;
  /** A record's page through the API, cycling through these ids. */
  detailPath: (id: string) => string;
  ids: string[];
};

/**
 * The claims list from the compiled server (dist-server/, plain node) beside the same list from the TypeScript
 * sources under tsx (as the server ran before the production build), both running, requests alternating.
 */
async function compareWithSources(databaseUrl: string, base: string, cookie: string, listPath: string) {
  const sources = await startServerProcess(databaseUrl, { fromSources: true });
  try {
    const compiled = createBenchClient(base, cookie);
    const tsx = createBenchClient(
      sources.base,
      await signInBench(sources.base, benchEmail('m', 0, 'reviewer')),
    );
    const compiledMs: number[] = [];
    const tsxMs: number[] = [];
    for (let i = 0; i < ROUNDS + 10; i++) {
      for (const [client, into] of [
        [compiled, compiledMs],
        [tsx, tsxMs],
      ] as const) {
        const t0 = performance.now();
        const r = await client.getJson(listPath);
        if (r.status !== 200) throw new Error(`${listPath}: ${r.status}`);
        if (i >= 10) into.push(performance.now() - t0);
      }
    }
    compiled.close();
    tsx.close();
    const a = median(compiledMs);
    const b = median(tsxMs);
    console.log(
      `claims list, compiled server (node dist-server) median ${a.toFixed(2)} ms, from sources (tsx) ${b.toFixed(2)} ms, ${(a / b).toFixed(2)}x`,
    );
    report({
      part: 'api',
      figure: 'claims list, compiled server (node dist-server/index.js), API median',
      value: a,
      unit: 'ms',
      baseline: b,
      aim: 'the same server from its sources under tsx',
    });
  } finally {
    await sources.stop();
  }
}

async function main() {
  const bench = await openBenchDb({ reset: false });
  const conn = await mysql.createConnection({ uri: bench.url, dateStrings: false });
  const [{ n }] = (await bench.ds.query('SELECT COUNT(*) AS n FROM installations')) as { n: string }[];
  if (Number(n) === 0) {
    console.log('the bench database is empty: generating (BENCH_CLAIMS claims) first');
    await generate(bench.ds, { claims: Number(process.env.BENCH_CLAIMS ?? 100_000) });
  }
  // As a running server keeps them: the claim counts' appended rows folded (server/lib/claim-counts.ts).
  await compactClaimCounts(bench.ds);
  // The API in a process of its own, as in production; the load comes from this one.
  let server = await startServerProcess(bench.url);
  const base = server.base;
  try {
    const [mfr] = (await bench.ds.query("SELECT id FROM organizations WHERE name = 'Bench Lighting 0'")) as {
      id: string;
    }[];
    const cookie = await signInBench(base, benchEmail('m', 0, 'reviewer'));
    const targets: Target[] = [];
    if (
      (await hasTable(bench.ds, 'claims')) &&
      (await fetch(`${base}/api/claims?pageSize=1`, { headers: { cookie } })).status === 200
    ) {
      targets.push(await claimsTarget(bench.ds, mfr.id));
    }
    targets.push(await installationsTarget(bench.ds, mfr.id));

    // The session id inside the signed cookie (lp.sid=s:<id>.<signature>), for the session statement by hand.
    const signed = decodeURIComponent(cookie.slice(cookie.indexOf('=') + 1));
    const sid = signed.slice(2, signed.lastIndexOf('.'));
    const client = createBenchClient(base, cookie);
    for (const tg of targets) {
      const apiMs: number[] = [];
      const rawMs: number[] = [];
      let apiRows = 0;
      let rawRows = 0;
      for (let i = 0; i < ROUNDS + 10; i++) {
        let t0 = performance.now();
        const r = await client.getJson<{ items: unknown[] }>(tg.listPath);
        const body = r.body;
        if (r.status !== 200) throw new Error(`${tg.listPath}: ${r.status} ${JSON.stringify(body)}`);
        const a = performance.now() - t0;
        t0 = performance.now();
        const rows = await tg.raw(conn, sid);
        const b = performance.now() - t0;
        if (i >= 10) {
          apiMs.push(a);
          rawMs.push(b);
        }
        apiRows = body.items.length;
        rawRows = rows.length;
      }
      const api = median(apiMs);
      const raw = median(rawMs);
      console.log(
        `${tg.name} list (${apiRows} rows through the API, ${rawRows} by hand): API median ${api.toFixed(2)} ms, raw mysql2 ${raw.toFixed(2)} ms, ${(api / raw).toFixed(2)}x (aim: within 1.5x)`,
      );
      report({
        part: 'api',
        figure: `${tg.name} list, API median (50 rows, filter + sort)`,
        value: api,
        unit: 'ms',
        baseline: raw,
        aim: 'within 1.5x of raw (session, page and total)',
      });
      report({
        part: 'api',
        figure: `${tg.name} list, raw mysql2 median (same rows)`,
        value: raw,
        unit: 'ms',
      });
    }
    client.close();
    if (targets[0]?.name === 'claims') await compareWithSources(bench.url, base, cookie, targets[0].listPath);
    await loadRuns(base, cookie, targets, 1, { server: server.pid, db: bench.db.pid });
    await server.stop();
    // The same load against a cluster with a process per core (WEB_CONCURRENCY), as production would run it.
    const workers = Number(process.env.BENCH_WORKERS ?? os.availableParallelism());
    if (workers > 1) {
      server = await startServerProcess(bench.url, { workers });
      await loadRuns(
        server.base,
        await signInBench(server.base, benchEmail('m', 0, 'reviewer')),
        targets,
        workers,
        { server: server.pid, db: bench.db.pid },
      );
    }
  } finally {
    await server.stop();
    await conn.end();
    await bench.close();
  }
}

/**
 * 16 connections on the list and on a record's page of each target, against a server of `workers` processes, with
 * the CPU each request took in the server, MariaDB and the load generator (scripts/bench/lib/cpu.ts).
 */
async function loadRuns(
  base: string,
  cookie: string,
  targets: Target[],
  workers: number,
  pids: { server: number; db: number },
) {
  const label = workers === 1 ? '1 process' : `${workers} processes`;
  for (const tg of targets) {
    for (const [what, path] of [
      ['list', () => tg.listPath],
      ['page', (n: number) => tg.detailPath(tg.ids[n % tg.ids.length])],
    ] as const) {
      // A warm-up at the same load, not counted: a freshly started process (each worker of a cluster) runs its
      // first requests before V8 has optimised them, which counted against whichever run came first. Three seconds
      // were not enough for a cluster's workers, which each see half the requests: an installation's page measured
      // 4.9 ms of CPU per request right after a three-second warm-up and 1.7 ms a minute later.
      await runLoad({ base, path, headers: { cookie }, connections: CONNECTIONS, seconds: WARM_SECONDS });
      const cpu = cpuMeter(pids);
      const res = await runLoad({
        base,
        path,
        headers: { cookie },
        connections: CONNECTIONS,
        seconds: SECONDS,
      });
      const share = cpu(res.requests, res.seconds);
      console.log(
        `${tg.name} ${what}, ${label}, ${CONNECTIONS} connections for ${res.seconds.toFixed(1)} s: ${res.perSecond.toFixed(0)} req/s, p50 ${res.p50.toFixed(1)} ms, p99 ${res.p99.toFixed(1)} ms, ${res.errors} errors of ${res.requests}; ` +
          `CPU per request: API ${share.server.toFixed(2)} ms (background threads ${share.serverBackground.toFixed(2)}), MariaDB ${share.db.toFixed(2)} ms, load generator ${share.generator.toFixed(2)} ms; host steal ${share.steal.toFixed(0)}%`,
      );
      const figure = `${tg.name} ${what}, ${label}`;
      report({
        part: 'load',
        figure: `${figure}, ${CONNECTIONS} connections`,
        value: res.perSecond,
        unit: 'req/s',
        aim: what === 'list' && tg.name === 'claims' ? '600 req/s' : '450 req/s',
      });
      report({ part: 'load', figure: `${figure}, p50`, value: res.p50, unit: 'ms' });
      report({ part: 'load', figure: `${figure}, p99`, value: res.p99, unit: 'ms', aim: 'under 100 ms' });
      report({ part: 'load', figure: `${figure}, errors`, value: res.errors, unit: `of ${res.requests}` });
      report({
        part: 'load',
        figure: `${figure}, CPU per request in the API`,
        value: share.server,
        unit: 'ms',
      });
      report({
        part: 'load',
        figure: `${figure}, CPU per request in the API's background threads`,
        value: share.serverBackground,
        unit: 'ms',
      });
      report({ part: 'load', figure: `${figure}, CPU per request in MariaDB`, value: share.db, unit: 'ms' });
      report({
        part: 'load',
        figure: `${figure}, CPU per request in the load generator`,
        value: share.generator,
        unit: 'ms',
      });
      report({ part: 'load', figure: `${figure}, host steal`, value: share.steal, unit: '%' });
    }
  }
}

/** Installations of one manufacturer's products in damp locations, newest installed first. */
async function installationsTarget(
  ds: { query: (s: string, p?: unknown[]) => Promise<unknown> },
  mfrId: string,
): Promise<Target> {
  const ids = (
    (await ds.query('SELECT id FROM installations WHERE manufacturer_id = ? LIMIT 500', [mfrId])) as {
      id: string;
    }[]
  ).map((r) => r.id);
  return {
    name: 'installations',
    listPath: '/api/installations?page=1&pageSize=50&sort=-installDate&location=damp',
    detailPath: (id) => `/api/installations/${id}`,
    ids,
    async raw(conn, sid) {
      await conn.query(SESSION_SQL, [sid]);
      const [rows] = await conn.query(
        `SELECT (SELECT COUNT(*) AS n FROM installations i WHERE i.manufacturer_id = ? AND i.location = 'damp') AS list_total_,
                i.*, p.model_number, p.name AS product_name, c.name AS contractor_name, m.name AS manufacturer_name, v.version_number, pol.name AS policy_name,
                (SELECT COUNT(*) FROM installation_units u WHERE u.installation_id = i.id) AS serial_count
           FROM installations i
           LEFT JOIN product_models p ON p.id = i.product_model_id
           LEFT JOIN organizations c ON c.id = i.contractor_id
           LEFT JOIN organizations m ON m.id = i.manufacturer_id
           LEFT JOIN warranty_policy_versions v ON v.id = i.policy_version_id
           LEFT JOIN warranty_policies pol ON pol.id = v.policy_id
          WHERE i.manufacturer_id = ? AND i.location = 'damp'
          ORDER BY i.install_date DESC, i.id DESC LIMIT 50 OFFSET 0`,
        [mfrId, mfrId],
      );
      return rows as unknown[];
    },
  };
}

/** The manufacturer's claims waiting on them in review, newest filed first (what the claims list screen asks). */
async function claimsTarget(
  ds: { query: (s: string, p?: unknown[]) => Promise<unknown> },
  mfrId: string,
): Promise<Target> {
  const ids = (
    (await ds.query("SELECT id FROM claims WHERE manufacturer_id = ? AND stage <> 'draft' LIMIT 500", [
      mfrId,
    ])) as { id: string }[]
  ).map((r) => r.id);
  return {
    name: 'claims',
    listPath: '/api/claims?page=1&pageSize=50&sort=-filedAt&stage=in_review',
    detailPath: (id) => `/api/claims/${id}`,
    ids,
    async raw(conn, sid) {
      await conn.query(SESSION_SQL, [sid]);
      // The total as the route takes it for a stage filter: the sum the claim_counts triggers keep.
      const [rows] = await conn.query(
        `SELECT (SELECT COALESCE(SUM(n), 0) AS n FROM claim_counts WHERE organization_id = ? AND stage IN ('in_review') AND stage NOT IN ('draft')) AS list_total_,
                c.id, c.number, c.stage, c.waiting_on, c.contractor_id, c.manufacturer_id, c.installation_id, c.product_model_id, c.serials, c.units,
                c.failed_on, c.filed_at, c.stage_changed_at, c.verdict, c.engine_version, c.expected_credit, c.currency, c.created_at, c.updated_at,
                c.version, co.name AS contractor_name, mo.name AS manufacturer_name, p.model_number, p.name AS product_name, p.family,
                i.site_name, i.site_city
           FROM claims c
           LEFT JOIN organizations co ON co.id = c.contractor_id
           LEFT JOIN organizations mo ON mo.id = c.manufacturer_id
           LEFT JOIN product_models p ON p.id = c.product_model_id
           LEFT JOIN installations i ON i.id = c.installation_id
          WHERE c.manufacturer_id = ? AND c.stage <> 'draft' AND c.stage IN ('in_review')
          ORDER BY c.filed_at DESC, c.id DESC LIMIT 50 OFFSET 0`,
        [mfrId, mfrId],
      );
      return rows as unknown[];
    },
  };
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
