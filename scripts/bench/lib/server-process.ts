import { spawn } from 'node:child_process';
import path from 'node:path';
import { freePort, waitForHealth } from '../../lib/free-port';
import { buildServerIfNeeded, SERVER_OUT_DIR } from '../../lib/build-server';

/** BENCH_NODE_ARGS, e.g. `--cpu-prof --cpu-prof-dir=.data/profiles`, for the compiled server's node. */
const nodeArgs = () => (process.env.BENCH_NODE_ARGS ?? '').split(/\s+/).filter(Boolean);

/**
 * The API as production runs it (the compiled server, `node dist-server/index.js`, built first when needed;
 * NODE_ENV=production) in a process of its own, so that the load generator and the server do not share an event
 * loop; `workers` > 1 serves with a cluster (WEB_CONCURRENCY). `fromSources` runs server/index.ts under tsx instead,
 * as before the production build.
 */
export async function startServerProcess(
  databaseUrl: string,
  opts: { workers?: number; fromSources?: boolean } = {},
) {
  const port = await freePort();
  if (!opts.fromSources) await buildServerIfNeeded();
  const [command, args] = opts.fromSources
    ? [path.resolve('node_modules/.bin/tsx'), [path.resolve('server/index.ts')]]
    : [process.execPath, [...nodeArgs(), path.resolve(SERVER_OUT_DIR, 'index.js')]];
  const child = spawn(command, args, {
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
    /** The server's process (with WEB_CONCURRENCY > 1 the cluster's primary, its workers its children). */
    pid: child.pid!,
    stop: () =>
      new Promise<void>((resolve) => {
        if (child.exitCode !== null) return resolve();
        child.once('exit', () => resolve());
        child.kill('SIGTERM');
      }),
  };
}
