import type { TestProject } from 'vitest/node';
import { loadConfig } from '../../server/config/env';
import { createDataSource } from '../../server/db/data-source';
import { resetDatabase, startLocalDb } from '../../scripts/lib/mariadb';

declare module 'vitest' {
  export interface ProvidedContext {
    databaseUrl: string;
  }
}

// The server project's tests run against a real MariaDB of their own (profile "test", port DB_PORT + 1),
// emptied and migrated once per run. Tests never touch the demo's database.
export default async function setup(project: TestProject) {
  const config = loadConfig();
  const db = await startLocalDb({
    dataDir: config.dataDir,
    profile: 'test',
    port: config.dbPort + 1,
    log: () => {},
  });
  await resetDatabase(db);
  const ds = createDataSource(db.url, { poolSize: 1 });
  await ds.initialize();
  await ds.runMigrations({ transaction: 'each' });
  await ds.destroy();
  project.provide('databaseUrl', db.url);
  return async () => {
    await db.stop();
  };
}
