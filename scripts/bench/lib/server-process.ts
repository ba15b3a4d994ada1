import { spawn } from 'node:child_process';
import path from 'node:path';
import { freePort, waitForHealth } from '../../lib/free-port';

/**
 * The API as production runs it (server/index.ts, NODE_ENV=production) in a process of its own, so that the load
 * generator and the server do not share an event loop; `workers` > 1 serves with a cluster (WEB_CONCURRENCY).
 */
export async function startServerProcess(databaseUrl: string, opts: { workers?: number } = {}) {
  const port = await freePort();
  const child = spawn(path.resolve('node_modules/.bin/tsx'), [path.resolve('server/index.ts')], {
    env: {
      ...process.env,
      NODE_ENV: 'production',
      APP_MODE: 'production',
      SESSION_SECRET: 'bench-only-session-secret-of-32-characters-or-more',
      DATABASE_URL: databaseUrl,
      PORT: String(port),
      HOST: '127.0.0.1',
      WEB_CONCURRENCY: String(opts.workers ?? 1),
      LOG_LEVEL: process.env.BENCH_LOG_LEVEL ?? 'silent',
      DATA_DIR: '.data/bench',
      OUTBOX_WORKER: 'false',
    },
    stdio: ['ignore', 'inherit', 'inherit'],
  });
  const base = `http://127.0.0.1:${port}`;
  const exited = new Promise<never>((_, reject) =>
    child.once('exit', (code) => reject(new Error(`the server exited (${code}) before it answered`))),
  );
  await Promise.race([waitForHealth(base), exited]);
  exited.catch(() => {});
  return {
    base,
    stop: () =>
      new Promise<void>((resolve) => {
        if (child.exitCode !== null) return resolve();
        child.once('exit', () => resolve());
        child.kill('SIGTERM');
      }),
  };
}
