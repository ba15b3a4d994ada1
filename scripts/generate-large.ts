// npm run demo:large: the demo database with about 1,000,000 installed units and 100,000 claims on top of the
// ordinary demo (loaded first when the database is empty). DATABASE_URL, or the local demo database.
import { loadConfig } from '../server/config/env';
import { createDataSource } from '../server/db/data-source';
import { seedDemo } from '../server/db/seed/demo';
import { generateLarge } from './lib/large-demo';
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
  const ds = createDataSource(url, { poolSize: 2 });
  await ds.initialize();
  try {
    await ds.runMigrations({ transaction: 'each' });
    if (await seedDemo(ds)) console.log('Loaded the demo scenario first.');
    await generateLarge(ds, { today: new Date().toISOString().slice(0, 10) });
  } finally {
    await ds.destroy();
    await stop();
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
