// npm run migration:generate -- Name
// Applies the committed migrations to a fresh scratch database, asks TypeORM for the difference between the
// entities and that schema, and writes it as a new migration (then rewrites the migrations index).
import fs from 'node:fs';
import path from 'node:path';
import { loadConfig } from '../server/config/env';
import { createDataSource } from '../server/db/data-source';
import { resetDatabase, startLocalDb } from './lib/mariadb';
import { writeMigrationsIndex } from './lib/migrations-index';

const name = (process.argv[2] ?? '').replace(/[^A-Za-z0-9]/g, '');
if (!name) {
  console.error('usage: npm run migration:generate -- Name');
  process.exit(2);
}
const dir = path.resolve('server/db/migrations');

async function main() {
  const config = loadConfig();
  const db = await startLocalDb({
    dataDir: config.dataDir,
    profile: 'test',
    port: config.dbPort + 1,
    log: () => {},
  });
  await resetDatabase(db);
  const ds = createDataSource(db.url);
  await ds.initialize();
  await ds.runMigrations();
  const sql = await ds.driver.createSchemaBuilder().log();
  await ds.destroy();
  await db.stop();
  if (sql.upQueries.length === 0) {
    console.log('No changes: the entities match the migrations.');
    return;
  }
  const ts = Date.now();
  const esc = (q: string) => q.replace(/\\/g, '\\\\').replace(/`/g, '\\`').replace(/\$\{/g, '\\${');
  const up = sql.upQueries.map((q) => `    await queryRunner.query(\`${esc(q.query)}\`);`).join('\n');
  const down = sql.downQueries
    .map((q) => `    await queryRunner.query(\`${esc(q.query)}\`);`)
    .reverse()
    .join('\n');
  const file = `import type { MigrationInterface, QueryRunner } from 'typeorm';

export class ${name}${ts} implements MigrationInterface {
  name = '${name}${ts}';

  public async up(queryRunner: QueryRunner): Promise<void> {
${up}
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
${down}
  }
}
`;
  fs.writeFileSync(path.join(dir, `${ts}-${name}.ts`), file);
  writeMigrationsIndex();
  console.log(`Wrote server/db/migrations/${ts}-${name}.ts`);
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
