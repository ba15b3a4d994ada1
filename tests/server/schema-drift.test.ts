import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest';
import { createDataSource, type AppDataSource } from '../../server/db/data-source';

// The entities are the schema's description in code and the migrations are what the database really holds.
// If the two drift apart, `npm run migration:generate` writes noise (or misses a real change), so any drift
// fails here: the global setup migrated the test database, and TypeORM's own diff must find nothing to do.
describe('entities and migrations', () => {
  let ds: AppDataSource;
  beforeAll(async () => {
    ds = createDataSource(inject('databaseUrl'), { poolSize: 1 });
    await ds.initialize();
  });
  afterAll(async () => {
    await ds?.destroy();
  });

  it('describe the same schema: a generated migration would be empty', async () => {
    const sql = await ds.driver.createSchemaBuilder().log();
    expect(sql.upQueries.map((q) => q.query)).toEqual([]);
  });
});
