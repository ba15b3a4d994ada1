import cluster from 'node:cluster';
import type { Server } from 'node:http';
import { createApp } from './app';
import { startCluster } from './cluster';
import { loadConfig, type AppConfig } from './config/env';
import { createDataSource } from './db/data-source';
import { withReadRouting } from './db/read';
import { PinoQueryLogger } from './db/query-logger';
import { createLogger } from './lib/logger';
import { projectPath } from './lib/paths';
import { startOutboxWorker } from './lib/outbox';
import { startWebhookWorker } from './lib/webhooks';
import { createStorage } from './lib/storage';
import { startStorageSweeper } from './lib/storage-sweep';
import { startIdempotencyKeyPurge } from './lib/idempotency';
import { startClaimCountsCompaction } from './lib/claim-counts';
import { startWaitingMail } from './modules/waiting/waiting-mail';

export async function startServer(config: AppConfig, databaseUrl: string) {
  const logger = createLogger(config.logLevel);
  // Failed and slow statements go to the log (server/db/query-logger.ts).
  const ds = createDataSource(databaseUrl, {
    logger: new PinoQueryLogger(logger.child({ component: 'db' })),
    slowQueryMs: config.slowQueryMs,
    replicaUrls: config.databaseReplicaUrls,
  });
  await ds.initialize();
  const pending = await ds.showMigrations();
  if (pending)
    throw new Error('The database has migrations still to run: run `npm run migrate` (npm start does it).');
  const storage = createStorage(config);
  const app = createApp({ config, ds, logger, databaseUrl, clientDir: projectPath('dist'), storage });
  // Background work decides what to send or delete from what it reads, so it reads the primary, never a replica
  // that may be behind: the routing set here holds in every timer these start (AsyncLocalStorage).
  const onPrimary = <T>(fn: () => T) => withReadRouting(true, fn);
  // E-mail attachments (letters, packing slips) are read from the same storage the documents were written to.
  const worker = config.outboxWorker
    ? onPrimary(() =>
        startOutboxWorker(ds, config, logger, { loadAttachment: (a) => storage.getBuffer(a.storageKey) }),
      )
    : null;
  // Webhook deliveries: from the same process that sends e-mail (the first of a cluster).
  const webhooks =
    config.outboxWorker && config.webhookWorker
      ? onPrimary(() => startWebhookWorker(ds, logger, { strict: config.mode === 'production' }))
      : null;
  // Objects a killed process wrote without committing their rows: swept now and then periodically.
  const sweeper = onPrimary(() => startStorageSweeper(ds, storage, logger, config.storage.sweep));
  // Idempotency keys are kept IDEMPOTENCY_KEY_DAYS, then purged daily.
  const keyPurge = onPrimary(() => startIdempotencyKeyPurge(ds, logger));
  // The claim counts' appended rows folded into one per organisation and stage, every minute.
  const counts = onPrimary(() => startClaimCountsCompaction(ds, logger));
  // "What waits on me" by e-mail: at once or a daily summary, as each person chose.
  const waitingMail = onPrimary(() =>
    startWaitingMail(
      ds,
      {
        secret: config.sessionSecret,
        publicUrl: (p: string) =>
          new URL(p, config.publicUrl ?? `http://${config.host}:${config.port}`).toString(),
      },
      logger,
    ),
  );

  const server: Server = await new Promise((resolve, reject) => {
    // Express 5 passes the listen error (EADDRINUSE and the like) to the callback.
    const s = app.listen(config.port, config.host, (err?: Error) => (err ? reject(err) : resolve(s)));
  });
  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : config.port;
  logger.info({ port }, 'Lumenproof listening');

  return {
    port,
    url: `http://${config.host}:${port}`,
    async stop() {
      await new Promise<void>((resolve) => server.close(() => resolve()));
      server.closeAllConnections?.();
      await worker?.stop();
      await webhooks?.stop();
      await sweeper.stop();
      keyPurge.stop();
      waitingMail.stop();
      await counts.stop();
      await app.close();
      await ds.destroy();
    },
  };
}

// Run directly (production, `node dist-server/index.js`): DATABASE_URL must point at a migrated database. Never in
// a cluster's worker, whose compiled worker.js holds this module too.
if (import.meta.url === `file://${process.argv[1]}` && !cluster.isWorker) {
  const config = loadConfig();
  if (!config.databaseUrl) {
    console.error(
      'DATABASE_URL is required to run server/index.ts directly; `npm start` manages a local database.',
    );
    process.exit(2);
  }
  const databaseUrl = config.databaseUrl;
  // The signal handlers come first: a SIGTERM while workers are still starting stops them once they are up.
  let stopRequested = false;
  let stop = () => {
    stopRequested = true;
  };
  process.on('SIGINT', () => stop());
  process.on('SIGTERM', () => stop());
  (config.workers > 1
    ? startCluster({ count: config.workers, databaseUrl })
    : startServer(config, databaseUrl)
  )
    .then((srv) => {
      stop = () => void srv.stop().then(() => process.exit(0));
      if (stopRequested) stop();
      // To `npm start`, which runs this compiled (dist-server/index.js) as a child process.
      process.send?.({ type: 'listening', url: srv.url });
    })
    .catch((err) => {
      console.error(err instanceof Error ? err.message : err);
      process.exit(1);
    });
}
