// npm run backup [-- OUT_DIR]: a consistent dump of the database with the attachment store and a manifest.
import path from 'node:path';
import { loadConfig } from '../server/config/env';
import { backup } from './lib/backup';
import { startLocalDb } from './lib/mariadb';

async function main() {
  const config = loadConfig();
  const out = path.resolve(
    process.argv[2] ?? path.join(config.dataDir, 'backups', new Date().toISOString().replace(/[:.]/g, '-')),
  );
  const url =
    config.databaseUrl ??
    (await startLocalDb({ dataDir: config.dataDir, profile: 'demo', port: config.dbPort, log: () => {} }))
      .url;
  const manifest = await backup({ url, storageDir: config.storage.dir, outDir: out });
  console.log(
    `Backup written to ${out}: ${Object.keys(manifest.tables).length} tables, ${Object.keys(manifest.files).length} files.`,
  );
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
