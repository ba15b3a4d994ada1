import { AsyncLocalStorage } from 'node:async_hooks';
import { QueryFailedError, type DataSource } from 'typeorm';

/** Where a read goes: a replica (the default where one is configured) or the primary. */
export type ReadFrom = 'replica' | 'primary';

export type ReadOptions = {
  /**
   * DATE and DATETIME columns as MariaDB writes them (`2026-12-02`, `2026-12-02 05:41:59.123`, UTC as stored):
   * a list that only prints them skips making a Date of each (see isoOfDateTime).
   */
  dateStrings?: boolean;
  /**
   * `replica` (the default): a replica when DATABASE_REPLICA_URLS names any, unless the request is held to the
   * primary (its client wrote a moment ago: readYourWrites in server/middleware/read-your-writes.ts); the primary
   * when there is no replica or none answers. `primary`: always the primary, for a read that must see every
   * committed write at once (a record just named in a link, a check before a write).
   */
  from?: ReadFrom;
  /**
   * mysql2's row parser: `compiled` (the default), generated for the statement's columns, about twice as fast per
   * row, for lists; `interpreted` for a single wide record (a claim or an installation with all it joins), whose
   * compiled parser is as slow to read one row and costly for V8 to optimise (server/db/data-source.ts).
   */
  parser?: 'compiled' | 'interpreted';
  /**
   * Sent as a server-side prepared statement (mysql2's execute), which MariaDB parses and resolves once per pooled
   * connection: for a statement whose text never changes and takes MariaDB longer to prepare than to run (a
   * record read with all it joins). Never for a statement built from a request's filters, whose every variant
   * would stay prepared on every connection.
   */
  prepared?: boolean;
};

// The request's routing: set by the read-your-writes middleware, read by every readRows under it.
const routing = new AsyncLocalStorage<{ primary: boolean }>();

/** Runs fn with the reads inside it sent to the primary (`primary`) or routed as each asks. */
export function withReadRouting<T>(primary: boolean, fn: () => T): T {
  return routing.run({ primary }, fn);
}

/** Whether reads here go to the primary whatever they ask (a request right after its client's write). */
export const heldToPrimary = () => routing.getStore()?.primary ?? false;

type Run = (
  o: { sql: string; values: unknown[]; dateStrings?: boolean; disableEval: boolean },
  cb: (err: (Error & { fatal?: boolean; errno?: number }) | null, rows: unknown) => void,
) => void;
type CallbackConnection = { query: Run; execute: Run };

// Errors after which a replica's read is asked of the primary instead: no replica reachable, a connection lost
// mid-query, or a table or column the replica has not received yet (a migration still replicating).
const RETRY_ON_PRIMARY_CODES = new Set([
  'POOL_NONEONLINE',
  'POOL_NOEXIST',
  'POOL_CLOSED',
  'ECONNREFUSED',
  'ECONNRESET',
  'ETIMEDOUT',
  'EPIPE',
  'PROTOCOL_CONNECTION_LOST',
]);
const RETRY_ON_PRIMARY_ERRNOS = new Set([1146 /* ER_NO_SUCH_TABLE */, 1054 /* ER_BAD_FIELD_ERROR */]);

function retryOnPrimary(err: unknown) {
  const e = (err instanceof QueryFailedError ? err.driverError : err) as {
    code?: string;
    errno?: number;
    fatal?: boolean;
  };
  return Boolean(
    e && (e.fatal || RETRY_ON_PRIMARY_CODES.has(e.code ?? '') || RETRY_ON_PRIMARY_ERRNOS.has(e.errno ?? 0)),
  );
}

async function runOn<T>(
  ds: DataSource,
  mode: 'master' | 'slave',
  sql: string,
  params: unknown[],
  opts: ReadOptions,
): Promise<T[]> {
  // TypeORM's public query runner picks the pool (the primary's, or a replica's from its pool cluster); its
  // connection takes mysql2's per-query options, so `dateStrings` and the row parser stay per-read choices.
  const qr = ds.createQueryRunner(mode);
  try {
    const conn = (await qr.connect()) as CallbackConnection;
    return await new Promise<T[]>((resolve, reject) =>
      conn[opts.prepared ? 'execute' : 'query'](
        { sql, values: params, dateStrings: opts.dateStrings, disableEval: opts.parser === 'interpreted' },
        (err, rows) => (err ? reject(new QueryFailedError(sql, params, err)) : resolve(rows as T[])),
      ),
    );
  } finally {
    await qr.release();
  }
}

/**
 * Runs one read statement through TypeORM's public query runner, with the same connections and type handling as
 * the rest of the app (UTC dates, decimals and big numbers as strings) but without the query builder or
 * hydration: for a 50-row page and its count, those cost more time in Node than MariaDB took to answer both.
 * Writes and transactions stay with TypeORM, on the primary.
 *
 * Placeholders are `?`, filled in by mysql2's escaping; an array fills an `IN (?)` list. With replicas
 * configured, the read goes to one of them unless `from: 'primary'` or the request is held to the primary; a
 * replica that cannot answer (down, or behind on the schema) sends the read to the primary, so a dead replica
 * never fails a request.
 */
export async function readRows<T>(
  ds: DataSource,
  sql: string,
  params: unknown[] = [],
  opts: ReadOptions = {},
): Promise<T[]> {
  // The binary protocol writes a DATETIME(3) with no fraction without its `.000`, which isoOfDateTime counts on.
  if (opts.prepared && opts.dateStrings)
    throw new Error(
      'readRows: a prepared statement cannot read dateStrings (the binary protocol drops ".000").',
    );
  // Through TypeORM's logger, so that tests counting a route's statements see these too.
  ds.logger.logQuery(sql, params);
  if (ds.driver.isReplicated && opts.from !== 'primary' && !heldToPrimary()) {
    try {
      return await runOn<T>(ds, 'slave', sql, params, opts);
    } catch (err) {
      if (!retryOnPrimary(err)) throw err;
    }
  }
  return runOn<T>(ds, 'master', sql, params, opts);
}

/** A list's total: a statement answering one row with the count in `n`. */
export type TotalQuery = { sql: string; params: unknown[] };

/**
 * A list's page and its total in one statement: the total rides on every row as a scalar subquery of the select
 * list, which MariaDB runs once (it refers to nothing outside itself). One statement instead of two side by side
 * saves a round trip and a pooled connection per list request. A page past the end has no row to carry the total,
 * so only then is the total asked on its own.
 *
 * `select` is the page's column list and `rest` everything after it (FROM … LIMIT ? OFFSET ?), `params` the
 * values of `rest`'s placeholders; `modifiers` go right after SELECT (STRAIGHT_JOIN).
 */
export async function readPageWithTotal<T>(
  ds: DataSource,
  page: { modifiers?: string; select: string; rest: string; params: unknown[] },
  total: TotalQuery,
  opts: ReadOptions = {},
): Promise<{ rows: T[]; total: number }> {
  const rows = await readRows<T & { list_total_: string | number }>(
    ds,
    `SELECT ${page.modifiers ?? ''} (${total.sql}) AS list_total_, ${page.select} ${page.rest}`,
    [...total.params, ...page.params],
    opts,
  );
  if (rows.length) return { rows, total: Number(rows[0].list_total_) };
  const [counted] = await readRows<{ n: string | number }>(ds, total.sql, total.params, opts);
  return { rows, total: Number(counted?.n ?? 0) };
}

/**
 * The primary's mysql2 pool (callback API), in both modes: TypeORM's own pool without replicas, the pool
 * cluster's MASTER node with them. For libraries that take a pool (rate-limiter-flexible's storeType 'pool').
 */
export function primaryPool(ds: DataSource): unknown {
  const driver = ds.driver as unknown as {
    pool?: unknown;
    poolCluster?: { of(pattern: string): unknown };
  };
  return driver.poolCluster ? driver.poolCluster.of('MASTER') : driver.pool;
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
