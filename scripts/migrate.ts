// npm run migrate: applies pending migrations to DATABASE_URL, or to the local demo database.
import { loadConfig } from '../server/config/env';
import { createDataSource } from '../server/db/data-source';
import { startLocalDb } from './lib/mariadb';

async function main() {
  const config = loadConfig();
  let url = config.databaseUrl;
  let stop = async () => {};
  if (!url) {
    const db = await startLocalDb({ dataDir: config.dataDir, profile: 'demo', port: config.dbPort });
    url = db.url;
    stop = db.stop;
  }
  const ds = createDataSource(url, { poolSize: 1 });
  await ds.initialize();
  const ran = await ds.runMigrations({ transaction: 'each' });
  console.log(ran.length ? ran.map((m) => `applied ${m.name}`).join('\n') : 'Nothing to migrate.');
  await ds.destroy();
  await stop();
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
