// npm run restore -- BACKUP_DIR: loads a backup into a fresh private MariaDB (profile "restore", port
// DB_PORT + 3) and storage folder, proves it against the manifest (table checksums, file hashes) and runs a
// smoke test on the restored data. Add --into-url URL to restore into another, empty database instead.
import fs from 'node:fs';
import path from 'node:path';
import { createApp } from '../server/app';
import { loadConfig } from '../server/config/env';
import { createDataSource } from '../server/db/data-source';
import { createLogger } from '../server/lib/logger';
import { restore } from './lib/backup';
import { resetDatabase, startLocalDb } from './lib/mariadb';

async function main() {
  const [dir, flag, intoUrl] = process.argv.slice(2);
  if (!dir) {
    console.error('usage: npm run restore -- BACKUP_DIR [--into-url mysql://...]');
    process.exit(2);
  }
  const config = loadConfig();
  let url = flag === '--into-url' ? intoUrl : undefined;
  let stop = async () => {};
  const storageDir = path.join(config.dataDir, 'restore', 'uploads');
  if (!url) {
    const db = await startLocalDb({
      dataDir: config.dataDir,
      profile: 'restore',
      port: config.dbPort + 3,
      log: () => {},
    });
    await resetDatabase(db);
    url = db.url;
    stop = db.stop;
  }
  fs.rmSync(storageDir, { recursive: true, force: true });
  fs.mkdirSync(storageDir, { recursive: true });
  const report = await restore({ backupDir: path.resolve(dir), url, storageDir });
  console.log(`Restored ${report.tables} tables and ${report.files} files.`);
  for (const m of report.mismatches) console.log(`  MISMATCH ${m}`);

  // Smoke test: the app answers on the restored data.
  const ds = createDataSource(url, { poolSize: 1 });
  await ds.initialize();
  const pending = await ds.showMigrations();
  const app = createApp({
    config: { ...config, mode: 'production' },
    ds,
    logger: createLogger('silent'),
    databaseUrl: url,
  });
  const server = app.listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  const port = (server.address() as { port: number }).port;
  const health = await fetch(`http://127.0.0.1:${port}/api/health`).then((r) => r.json());
  server.close();
  await app.close();
  await ds.destroy();
  await stop();
  const ok = report.ok && !pending && health.ok === true;
  console.log(
    ok ? 'Restore proven: checksums, files and smoke test all good.' : 'Restore FAILED its checks.',
  );
  process.exit(ok ? 0 : 1);
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
