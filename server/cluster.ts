import cluster, { type Worker } from 'node:cluster';
import fs from 'node:fs';
import path from 'node:path';

// Serving with several processes: node:cluster forks `count` workers (server/worker.ts) that share the port, so
// the API uses every core. Everything a request needs lives in MariaDB (sessions, rate limits, the outbox), so any
// worker can answer any request. The outbox worker runs in the first process only. A worker that dies is replaced.

export type Cluster = { url: string; stop: () => Promise<void> };

export async function startCluster(opts: {
  count: number;
  databaseUrl: string;
  env?: NodeJS.ProcessEnv;
  log?: (line: string) => void;
}): Promise<Cluster> {
  const log = opts.log ?? ((l: string) => console.log(l));
  // worker.js beside a compiled server (dist-server/), worker.ts beside the sources.
  const exec = ['worker.js', 'worker.ts']
    .map((f) => path.join(import.meta.dirname, f))
    .find((f) => fs.existsSync(f))!;
  cluster.setupPrimary({ exec, execArgv: process.execArgv });
  let stopping = false;
  const live = new Set<Worker>();

  const fork = (index: number) =>
    new Promise<string>((resolve, reject) => {
      const w = cluster.fork({
        ...process.env,
        ...opts.env,
        DATABASE_URL: opts.databaseUrl,
        // One process sends the e-mail; the others only write the outbox rows.
        ...(index === 0 ? {} : { OUTBOX_WORKER: 'false' }),
      });
      live.add(w);
      let listening = false;
      w.on('message', (m: { type?: string; url?: string }) => {
        if (m?.type === 'listening' && m.url) {
          listening = true;
          resolve(m.url);
        }
      });
      w.once('exit', (code, signal) => {
        live.delete(w);
        if (stopping) return;
        // One that never started (bad configuration, port taken) is an error, not something to retry forever.
        if (!listening)
          return reject(new Error(`worker ${index} exited (${signal ?? code}) before it listened`));
        log(`Worker ${index} stopped (${signal ?? code}); starting another.`);
        void fork(index).catch((err: Error) => log(err.message));
      });
    });

  const urls = await Promise.all(Array.from({ length: opts.count }, (_, i) => fork(i)));
  return {
    url: urls[0],
    async stop() {
      stopping = true;
      await Promise.all(
        [...live].map(
          (w) =>
            new Promise<void>((resolve) => {
              if (w.isDead()) return resolve();
              w.once('exit', () => resolve());
              w.process.kill('SIGTERM');
            }),
        ),
      );
    },
  };
}
