import type { Logger as TypeOrmLogger } from 'typeorm';

export type QueryCounter = { count: number; queries: string[] };

/**
 * The tests' TypeORM logger: counts the statements a piece of code sends (list endpoints must run a fixed number
 * whatever the page size). readRows reports its statements to the same logger (server/db/read.ts).
 */
export class StatementCounter implements TypeOrmLogger {
  private counter: QueryCounter | null = null;

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

  /** Runs fn and returns how many SQL statements it sent. */
  async count<T>(fn: () => Promise<T>): Promise<{ result: T; counter: QueryCounter }> {
    const counter: QueryCounter = { count: 0, queries: [] };
    this.counter = counter;
    try {
      return { result: await fn(), counter };
    } finally {
      this.counter = null;
    }
  }
}
