import type { Logger as TypeOrmLogger, QueryRunner } from 'typeorm';
import type { Logger } from '../lib/logger';

/** mysql2's error carries the statement with its parameters written in (`sql`): everything but that. */
function withoutStatement(
  error: string | Error,
): { message: string; code?: string } & Record<string, unknown> {
  if (typeof error === 'string') return { message: error };
  const e = error as Error & { code?: string; errno?: number; sqlState?: string };
  return {
    type: e.name,
    message: e.message,
    code: e.code,
    errno: e.errno,
    sqlState: e.sqlState,
    stack: e.stack,
  };
}

/**
 * TypeORM's logger over the application's pino logger: a failed statement is an error, one slower than
 * `maxQueryExecutionTime` (SLOW_QUERY_MS) a warning, migrations are news; each statement itself is logged only at
 * trace. The SQL is logged, never its parameters: they carry e-mail addresses, hashes and tokens.
 */
export class PinoQueryLogger implements TypeOrmLogger {
  constructor(
    private readonly pino: Pick<Logger, 'error' | 'warn' | 'info' | 'debug' | 'trace' | 'isLevelEnabled'>,
  ) {}

  logQuery(query: string, parameters?: unknown[], _queryRunner?: QueryRunner) {
    if (this.pino.isLevelEnabled('trace'))
      this.pino.trace({ sql: query, params: parameters?.length ?? 0 }, 'query');
  }

  logQueryError(error: string | Error, query: string, parameters?: unknown[], _queryRunner?: QueryRunner) {
    const err = withoutStatement(error);
    const entry = { err, sql: query, params: parameters?.length ?? 0 };
    // A duplicate key is an answer the services give (409, or an idempotent replay), not a fault; a deadlock's
    // victim is run again (server/lib/idempotency.ts). Everything else is an error.
    if (err.code === 'ER_DUP_ENTRY') this.pino.debug(entry, 'query refused: duplicate key');
    else if (err.code === 'ER_LOCK_DEADLOCK') this.pino.warn(entry, 'query failed: deadlock');
    else this.pino.error(entry, 'query failed');
  }

  logQuerySlow(time: number, query: string, parameters?: unknown[], _queryRunner?: QueryRunner) {
    this.pino.warn({ ms: time, sql: query, params: parameters?.length ?? 0 }, 'slow query');
  }

  logSchemaBuild(message: string) {
    this.pino.info({ schema: message }, 'schema');
  }

  logMigration(message: string) {
    this.pino.info({ migration: message }, 'migration');
  }

  log(level: 'log' | 'info' | 'warn', message: unknown) {
    if (level === 'warn') this.pino.warn({ message }, 'typeorm');
    else this.pino.info({ message }, 'typeorm');
  }
}
