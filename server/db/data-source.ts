import 'reflect-metadata';
import { DataSource, type Logger as TypeOrmLogger } from 'typeorm';
import { TransactionObjectsSubscriber } from '../lib/transaction-objects';
import { entities } from './entities';
import { migrations } from './migrations';

export type QueryCounter = { count: number; queries: string[] };

// Counts the queries a piece of code runs (tests assert list endpoints run a fixed number).
class CountingLogger implements TypeOrmLogger {
  counter: QueryCounter | null = null;
  logQuery(query: string) {
    if (this.counter) {
      this.counter.count += 1;
      this.counter.queries.push(query);
    }
  }
  logQueryError() {}
  logQuerySlow() {}
  logSchemaBuild() {}
  logMigration() {}
  log() {}
}

export function createDataSource(url: string, opts: { poolSize?: number } = {}) {
  const logger = new CountingLogger();
  const ds = new DataSource({
    type: 'mariadb',
    url,
    entities,
    migrations,
    // Deletes the stored objects of a transaction that rolls back (server/lib/transaction-objects.ts).
    subscribers: [TransactionObjectsSubscriber],
    synchronize: false,
    migrationsRun: false,
    migrationsTransactionMode: 'each',
    charset: 'utf8mb4_unicode_ci',
    timezone: 'Z',
    dateStrings: false,
    supportBigNumbers: true,
    bigNumberStrings: true,
    poolSize: opts.poolSize ?? 20,
    logging: true,
    logger,
    extra: { connectionLimit: opts.poolSize ?? 20 },
  });
  return Object.assign(ds, {
    /** Runs fn and returns how many SQL statements it sent. */
    async countQueries<T>(fn: () => Promise<T>): Promise<{ result: T; counter: QueryCounter }> {
      const counter: QueryCounter = { count: 0, queries: [] };
      logger.counter = counter;
      try {
        return { result: await fn(), counter };
      } finally {
        logger.counter = null;
      }
    },
  });
}

export type AppDataSource = ReturnType<typeof createDataSource>;
