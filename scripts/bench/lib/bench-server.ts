// The API as a process of its own for the load benchmarks, so that the load generator and the server do not share
// one event loop (as in production, where the clients are elsewhere). Started by scripts/bench/lib/server-process.ts
// with BENCH_DATABASE_URL; prints "LISTENING <port>" once it accepts connections and stops on SIGTERM.
import type { AddressInfo } from 'node:net';
import { createApp } from '../../../server/app';
import { loadConfig } from '../../../server/config/env';
import { createDataSource } from '../../../server/db/data-source';
import { createLogger } from '../../../server/lib/logger';

async function main() {
  const url = process.env.BENCH_DATABASE_URL;
  if (!url) throw new Error('BENCH_DATABASE_URL is required');
  const config = loadConfig({
    NODE_ENV: 'production',
    APP_MODE: 'production',
    SESSION_SECRET: 'bench-only-session-secret-of-32-characters-or-more',
    LOG_LEVEL: 'silent',
    DATA_DIR: '.data/bench',
    OUTBOX_WORKER: 'false',
  });
  const ds = createDataSource(url, { poolSize: 10 });
  await ds.initialize();
  const app = createApp({
    config,
    ds,
    logger: createLogger((process.env.BENCH_LOG_LEVEL as 'silent') ?? 'silent'),
    databaseUrl: url,
  });
  const server = app.listen(0, '127.0.0.1', (err?: Error) => {
    if (err) throw err;
    process.stdout.write(`LISTENING ${(server.address() as AddressInfo).port}\n`);
  });
  process.on('SIGTERM', () => {
    server.close(() => void Promise.resolve(app.close()).then(() => ds.destroy()).then(() => process.exit(0)));
  });
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
