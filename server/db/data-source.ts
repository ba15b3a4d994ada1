import 'reflect-metadata';
import { DataSource, type Logger as TypeOrmLogger } from 'typeorm';
import { createLogger } from '../lib/logger';
import { TransactionObjectsSubscriber } from '../lib/transaction-objects';
import { entities } from './entities';
import { migrations } from './migrations';
import { PinoQueryLogger } from './query-logger';

export type DataSourceOptions = {
  poolSize?: number;
  /**
   * Where TypeORM reports statements, failures and slow statements: the server passes its pino logger wrapped in a
   * PinoQueryLogger; tests pass their statement counter (tests/support/statement-counter.ts). Without one,
   * failures and slow statements go to a pino logger at warn.
   */
  logger?: TypeOrmLogger;
  /** A statement slower than this many milliseconds is logged as slow (SLOW_QUERY_MS); 0 logs none. */
  slowQueryMs?: number;
  /**
   * Read replicas of `url` (DATABASE_REPLICA_URLS). With any, TypeORM's own `replication` setting opens a pool
   * cluster: MASTER for `url` and SLAVEn for each replica. Only readRows(…, { from: 'replica' }) and its default
   * read from a replica (server/db/read.ts); everything else TypeORM runs, the query builder's reads included
   * (`defaultMode: 'master'`), stays on the primary.
   */
  replicaUrls?: string[];
};

export function createDataSource(url: string, opts: DataSourceOptions = {}) {
  const replicas = opts.replicaUrls ?? [];
  return new DataSource({
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
    // The logger decides what to keep; TypeORM hands it every statement.
    logging: true,
    logger: opts.logger ?? new PinoQueryLogger(createLogger('warn')),
    maxQueryExecutionTime: opts.slowQueryMs || undefined,
    extra: {
      connectionLimit: opts.poolSize ?? 20,
      // mysql2 compiles a row parser for each new shape of result (`new Function`). On Node 20's V8, optimising
      // the one for a claim's record (about 140 columns) sent TurboFan's escape analysis into a loop that held a
      // background thread at a full core for minutes: under load it cost as much CPU as the requests themselves,
      // and a second process doubled it. The interpreted parser reads a single row as fast; readRows asks for
      // the compiled one for lists, where it is about twice as fast per row (server/db/read.ts).
      disableEval: true,
    },
  });
}

export type AppDataSource = DataSource;
