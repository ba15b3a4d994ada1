// The server the browser tests drive: the built client on a database of its own (profile "e2e", port
// DB_PORT + 2), emptied, migrated and loaded with the demo scenario, with a fake SMTP server beside it.
import fs from 'node:fs';
import path from 'node:path';
import { loadConfig } from '../server/config/env';
import { createDataSource } from '../server/db/data-source';
import { seedDemo } from '../server/db/seed/demo';
import { createStorage } from '../server/lib/storage';
import { startServer } from '../server/index';
import { startFakeSmtp } from './fake-smtp';
import { e2eServerPidFile, stopStaleProfiles } from './lib/db-processes';
import { resetDatabase, startLocalDb } from './lib/mariadb';

async function main() {
  const base = loadConfig();
  fs.rmSync(path.join(base.dataDir, 'e2e', 'mailbox'), { recursive: true, force: true });
  // The database is emptied below, so the files of the last run (the demo's photos among them) belong to nothing.
  fs.rmSync(path.join(base.dataDir, 'e2e', 'uploads'), { recursive: true, force: true });
  const smtp = await startFakeSmtp({ port: 0, dir: path.join(base.dataDir, 'e2e', 'mailbox') });
  const config = loadConfig({
    ...process.env,
    NODE_ENV: 'test',
    APP_MODE: 'demo',
    PORT: String(base.port + 10),
    SMTP_PORT: String(smtp.port),
    MAILBOX_DIR: path.join(base.dataDir, 'e2e', 'mailbox'),
    STORAGE_DIR: path.join(base.dataDir, 'e2e', 'uploads'),
    LOG_LEVEL: 'warn',
  });
  // A server left by a killed run would be reused and so never stopped by this one: stop it first.
  await stopStaleProfiles(config.dataDir, ['e2e']);
  const db = await startLocalDb({
    dataDir: config.dataDir,
    profile: 'e2e',
    port: config.dbPort + 2,
    log: () => {},
  });
  await resetDatabase(db);
  const ds = createDataSource(db.url, { poolSize: 1 });
  await ds.initialize();
  await ds.runMigrations({ transaction: 'each' });
  await seedDemo(ds, { credits: { storage: createStorage(config), config } });
  await ds.destroy();
  const server = await startServer(config, db.url);
  console.log(`e2e server on ${server.url}`);
  // Playwright runs its global teardown before it ends this process: the teardown ends it by this pid first.
  const pidFile = e2eServerPidFile(config.dataDir);
  fs.writeFileSync(pidFile, String(process.pid));
  // The global teardown (or Playwright, gracefulShutdown in playwright.config.ts) ends this process with SIGTERM;
  // the database was started detached, in a process group of its own, so it is stopped here. The teardown
  // stops it too, should this process not get the chance.
  let stopping = false;
  const stop = async () => {
    if (stopping) return;
    stopping = true;
    try {
      await server.stop();
      await smtp.close();
    } finally {
      await db.stop();
      fs.rmSync(pidFile, { force: true });
      process.exit(0);
    }
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
