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
  const stop = async () => {
    await server.stop();
    await smtp.close();
    await db.stop();
    process.exit(0);
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
