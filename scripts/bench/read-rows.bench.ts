// npm run bench:read-rows: readRows before and after it moved onto TypeORM's public query runner (issue 15
// item 1), on the replication tests' primary and replica (profile test-replica, ports DB_PORT + 7 and + 8).
// Baseline, same run: the old readRows (a query straight on TypeORM's internal ds.driver.pool). A 50-row page
// shaped like the claims list (uuids, text, a decimal, three DATETIME(3) read with dateStrings), then `SELECT 1`,
// which shows the fixed cost per call. Calls per second at 8 in flight and this process's CPU time per call (the
// Node-side cost, steadier than wall time on a shared machine), medians of 7 interleaved rounds, with the ratio
// to the baseline. Prints; asserts nothing.
import { QueryFailedError, type DataSource } from 'typeorm';
import { loadConfig } from '../../server/config/env';
import { createDataSource } from '../../server/db/data-source';
import { readRows } from '../../server/db/read';
import { replicaSets, resetDatabase, startLocalReplicaSet } from '../lib/mariadb';

function oldReadRows<T>(
  ds: DataSource,
  sql: string,
  params: unknown[] = [],
  opts: { dateStrings?: boolean } = {},
) {
  ds.logger.logQuery(sql, params);
  const { pool } = ds.driver as unknown as {
    pool: {
      query(
        o: { sql: string; values: unknown[]; dateStrings?: boolean },
        cb: (err: Error | null, rows: unknown) => void,
      ): void;
    };
  };
  return new Promise<T[]>((resolve, reject) =>
    pool.query({ sql, values: params, dateStrings: opts.dateStrings }, (err, rows) =>
      err ? reject(new QueryFailedError(sql, params, err)) : resolve(rows as T[]),
    ),
  );
}

const CALLS = 600;
const IN_FLIGHT = 8;
const ROUNDS = 7;

/** Calls per second with IN_FLIGHT at once, and this process's CPU time per call (µs): the Node-side cost. */
async function rate(fn: () => Promise<unknown>) {
  let next = 0;
  const cpu = process.cpuUsage();
  const started = process.hrtime.bigint();
  await Promise.all(
    Array.from({ length: IN_FLIGHT }, async () => {
      while (next++ < CALLS) await fn();
    }),
  );
  const seconds = Number(process.hrtime.bigint() - started) / 1e9;
  const used = process.cpuUsage(cpu);
  return { perSecond: CALLS / seconds, cpuMicros: (used.user + used.system) / CALLS };
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

async function main() {
  const config = loadConfig();
  const set = await startLocalReplicaSet({
    dataDir: config.dataDir,
    ...replicaSets(config.dbPort)['test-replica'],
    log: () => {},
  });
  const plain = createDataSource(set.primary.url, { poolSize: 10 });
  const replicated = createDataSource(set.primary.url, { poolSize: 10, replicaUrls: [set.replica.url] });
  try {
    await resetDatabase(set.primary);
    await plain.initialize();
    await replicated.initialize();
    await plain.query(`CREATE TABLE bench_rows (
      id CHAR(36) PRIMARY KEY, number VARCHAR(20), site VARCHAR(120), stage VARCHAR(20), amount DECIMAL(12,2),
      created_at DATETIME(3), updated_at DATETIME(3), filed_at DATETIME(3), KEY (created_at))`);
    for (let b = 0; b < 10; b++) {
      const values = Array.from({ length: 500 }, (_, i) => {
        const n = b * 500 + i;
        return [
          crypto.randomUUID(),
          `LP-26-${String(n).padStart(6, '0')}`,
          `Site ${n} warehouse, east row`,
          'filed',
          (n * 1.25).toFixed(2),
          new Date(Date.UTC(2026, 0, 1) + n * 60_000),
          new Date(Date.UTC(2026, 0, 2) + n * 60_000),
          new Date(Date.UTC(2026, 0, 3) + n * 60_000),
        ];
      });
      await plain.query('INSERT INTO bench_rows VALUES ?', [values]);
    }
    // Let the replica apply the table before reading it there.
    const [{ pos }] = (await plain.query('SELECT @@gtid_binlog_pos AS pos')) as { pos: string }[];
    const [waited] = await readRows<{ w: number }>(replicated, 'SELECT MASTER_GTID_WAIT(?, 60) AS w', [pos]);
    if (Number(waited.w) !== 0) throw new Error('The replica did not catch up.');

    const page = 'SELECT * FROM bench_rows ORDER BY created_at DESC LIMIT ? OFFSET ?';
    const params = () => [50, Math.floor(Math.random() * 10) * 50];
    const variants: [string, Record<string, () => Promise<unknown>>][] = [
      [
        '50-row page, dateStrings',
        {
          'old readRows (ds.driver.pool)': () => oldReadRows(plain, page, params(), { dateStrings: true }),
          'readRows, no replicas': () => readRows(plain, page, params(), { dateStrings: true }),
          'readRows from a replica': () => readRows(replicated, page, params(), { dateStrings: true }),
          'readRows, replicas, from primary': () =>
            readRows(replicated, page, params(), { dateStrings: true, from: 'primary' }),
        },
      ],
      [
        'SELECT 1',
        {
          'old readRows (ds.driver.pool)': () => oldReadRows(plain, 'SELECT 1'),
          'readRows, no replicas': () => readRows(plain, 'SELECT 1'),
          'readRows from a replica': () => readRows(replicated, 'SELECT 1'),
          'readRows, replicas, from primary': () => readRows(replicated, 'SELECT 1', [], { from: 'primary' }),
        },
      ],
    ];
    for (const [title, fns] of variants) {
      for (const fn of Object.values(fns)) await rate(fn); // warm-up
      const rates: Record<string, number[]> = {};
      const cpu: Record<string, number[]> = {};
      for (let r = 0; r < ROUNDS; r++)
        for (const [name, fn] of Object.entries(fns)) {
          const m = await rate(fn);
          (rates[name] ??= []).push(m.perSecond);
          (cpu[name] ??= []).push(m.cpuMicros);
        }
      const base = 'old readRows (ds.driver.pool)';
      console.log(
        `\n${title}: calls/s at ${IN_FLIGHT} in flight and Node CPU µs per call, medians of ${ROUNDS} interleaved rounds`,
      );
      for (const name of Object.keys(rates))
        console.log(
          `  ${name.padEnd(34)} ${median(rates[name]).toFixed(0).padStart(7)}/s x${(median(rates[name]) / median(rates[base])).toFixed(2)}` +
            `   ${median(cpu[name]).toFixed(0).padStart(5)} µs x${(median(cpu[name]) / median(cpu[base])).toFixed(2)}`,
        );
    }
  } finally {
    if (plain.isInitialized) await plain.destroy();
    if (replicated.isInitialized) await replicated.destroy();
    await set.stop();
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
