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
};

export function createDataSource(url: string, opts: DataSourceOptions = {}) {
  return new DataSource({
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
    // The logger decides what to keep; TypeORM hands it every statement.
    logging: true,
    logger: opts.logger ?? new PinoQueryLogger(createLogger('warn')),
    maxQueryExecutionTime: opts.slowQueryMs || undefined,
    extra: { connectionLimit: opts.poolSize ?? 20 },
  });
}

export type AppDataSource = DataSource;
