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

export type DataSourceOptions = {
  poolSize?: number;
  /**
   * Read replicas of `url` (DATABASE_REPLICA_URLS). With any, TypeORM's own `replication` setting opens a pool
   * cluster: MASTER for `url` and SLAVEn for each replica. Only readRows(…, { from: 'replica' }) and its default
   * read from a replica (server/db/read.ts); everything else TypeORM runs, the query builder's reads included
   * (`defaultMode: 'master'`), stays on the primary.
   */
  replicaUrls?: string[];
};

export function createDataSource(url: string, opts: DataSourceOptions = {}) {
  const logger = new CountingLogger();
  const replicas = opts.replicaUrls ?? [];
  const ds = new DataSource({
    type: 'mariadb',
    ...(replicas.length
      ? {
          replication: {
            master: { url },
            slaves: replicas.map((u) => ({ url: u })),
            defaultMode: 'master' as const,
            selector: 'RR' as const,
            // A replica that refuses connections is left out for a while, then tried again; meanwhile its reads
            // go to another replica or to the primary (readRows).
            canRetry: true,
            removeNodeErrorCount: 1,
            restoreNodeTimeout: 5_000,
          },
          // A replica host that is down without refusing (no answer at all) would hold each read mysql2's
          // default 10 s before the primary is asked; 5 s is still far beyond a healthy connect.
          connectTimeout: 5_000,
        }
      : { url }),
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
