// npx tsx scripts/bench/seed.bench.ts
// How long `npm start` takes to load the demo scenario into an empty database: seedDemo as start.ts runs it
// (with the workflow's documents, the credits and the claims' photos), beside the baseline of the same seed
// without the photos, in the same run. Each round empties and migrates the private test MariaDB (profile "test",
// port DB_PORT + 1: do not run it beside the test suite) and stores files in a scratch folder. BENCH_ROUNDS (2).
// Prints seconds per seed and the ratio; asserts nothing.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { loadConfig } from '../../server/config/env';
import { createDataSource } from '../../server/db/data-source';
import { seedDemo } from '../../server/db/seed/demo';
import { createDiskStorage } from '../../server/lib/storage';
import { resetDatabase, startLocalDb } from '../lib/mariadb';
import { report } from './lib/bench-db';

const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 2);

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

async function main() {
  const config = loadConfig();
  const db = await startLocalDb({
    dataDir: config.dataDir,
    profile: 'test',
    port: config.dbPort + 1,
    log: () => {},
  });
  const scratch = fs.mkdtempSync(path.join(os.tmpdir(), 'lumenproof-seed-'));
  const times = { without: [] as number[], with: [] as number[] };
  try {
    for (let round = 0; round < ROUNDS; round++) {
      for (const photos of [false, true]) {
        await resetDatabase(db);
        const ds = createDataSource(db.url, { poolSize: 2 });
        await ds.initialize();
        await ds.runMigrations({ transaction: 'each' });
        const storage = createDiskStorage(path.join(scratch, `${round}-${photos}`));
        const t0 = performance.now();
        await seedDemo(ds, { credits: { storage, config }, photos });
        const s = (performance.now() - t0) / 1000;
        (photos ? times.with : times.without).push(s);
        const [{ n }] = (await ds.query('SELECT COUNT(*) AS n FROM attachments')) as { n: string }[];
        console.log(
          `round ${round + 1}: seed ${photos ? 'with photos   ' : 'without photos'} ${s.toFixed(2)} s, ${n} attachments`,
        );
        await ds.destroy();
      }
    }
  } finally {
    fs.rmSync(scratch, { recursive: true, force: true });
    await db.stop();
  }
  const base = median(times.without);
  const full = median(times.with);
  console.log(`baseline: demo seed without photos  ${base.toFixed(2)} s (median of ${ROUNDS})`);
  console.log(
    `demo seed with photos (npm start)   ${full.toFixed(2)} s (median of ${ROUNDS}), ${(full / base).toFixed(2)}x`,
  );
  report({ part: 'seed', figure: 'demo seed without photos (baseline)', value: base, unit: 's' });
  report({
    part: 'seed',
    figure: 'demo seed as npm start runs it, with photos',
    value: full,
    unit: 's',
    baseline: base,
  });
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
