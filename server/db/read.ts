import { QueryFailedError, type DataSource } from 'typeorm';

/**
 * Runs one read statement straight on TypeORM's own mysql2 pool: the same connections and the same type handling
 * (UTC dates, decimals and big numbers as strings), without a query runner or the query builder around it. The
 * hot lists read this way: for a 50-row page and its count, TypeORM's query builder and query runner cost more time
 * in Node than MariaDB took to answer both. Writes and transactions stay with TypeORM.
 *
 * Placeholders are `?`, filled in by mysql2's escaping; an array fills an `IN (?)` list. With `dateStrings`, DATE
 * and DATETIME columns arrive as MariaDB writes them (`2026-12-02`, `2026-12-02 05:41:59.123`, UTC as stored): a
 * list that only prints them skips making a Date of each (see isoOfDateTime).
 */
export function readRows<T>(
  ds: DataSource,
  sql: string,
  params: unknown[] = [],
  opts: { dateStrings?: boolean } = {},
): Promise<T[]> {
  // Through TypeORM's logger, so that tests counting a route's statements see these too.
  ds.logger.logQuery(sql, params);
  const { pool } = ds.driver as unknown as {
    pool: {
      query(
        o: { sql: string; values: unknown[]; dateStrings?: boolean },
        cb: (err: Error | null, rows: unknown) => void,
      ): void;
    };
  };
  return new Promise((resolve, reject) =>
    pool.query({ sql, values: params, dateStrings: opts.dateStrings }, (err, rows) =>
      err ? reject(new QueryFailedError(sql, params, err)) : resolve(rows as T[]),
    ),
  );
}

/** The conditions of a WHERE clause and their parameters, in order. */
export class Conditions {
  private readonly parts: string[] = [];
  readonly params: unknown[] = [];

  /** Adds a condition (its `?` placeholders take the values given, in order). */
  and(condition: string, ...params: unknown[]) {
    this.parts.push(condition);
    this.params.push(...params);
    return this;
  }

  get sql() {
    return this.parts.length ? `WHERE ${this.parts.join(' AND ')}` : '';
  }
}

/** A DATETIME(3) as MariaDB writes it (UTC, as the app stores it) in ISO 8601, as Date.toISOString would give it. */
export const isoOfDateTime = (v: string) => `${v.slice(0, 10)}T${v.slice(11, 23)}Z`;
