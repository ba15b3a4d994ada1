import { loadConfig } from '../../../server/config/env';
import { createDataSource } from '../../../server/db/data-source';
import { resetDatabase, startLocalDb } from '../../lib/mariadb';

// The benchmarks' private MariaDB (profile "bench", port DB_PORT + 4): never the demo's or the tests' data.
export async function openBenchDb(opts: { reset: boolean }) {
  const config = loadConfig();
  const db = await startLocalDb({
    dataDir: config.dataDir,
    profile: 'bench',
    port: config.dbPort + 4,
    log: () => {},
  });
  if (opts.reset) await resetDatabase(db);
  const ds = createDataSource(db.url, { poolSize: 10 });
  await ds.initialize();
  await ds.runMigrations({ transaction: 'each' });
  return {
    db,
    ds,
    url: db.url,
    async close() {
      await ds.destroy();
      await db.stop();
    },
  };
}

export async function hasTable(
  ds: { query: (sql: string, p?: unknown[]) => Promise<unknown> },
  name: string,
) {
  const rows = (await ds.query(
    'SELECT COUNT(*) AS n FROM information_schema.tables WHERE table_schema = DATABASE() AND table_name = ?',
    [name],
  )) as { n: string }[];
  return Number(rows[0].n) > 0;
}

/** One machine-readable line per figure, which scripts/bench/index.ts collects into its table. */
export function report(r: {
  part: string;
  figure: string;
  value: number;
  unit: string;
  baseline?: number;
  aim?: string;
}) {
  const ratio = r.baseline ? r.value / r.baseline : undefined;
  process.stdout.write(`BENCH ${JSON.stringify({ ...r, ratio })}\n`);
}
