import type { AppDataSource } from '../db/data-source';
import { clock } from './clock';
import type { Logger } from './logger';
import type { Storage, StoredObject } from './storage';

// The cure for objects a transaction wrote and then never committed a row for (the process was killed between
// the write and the commit; a rollback in-process deletes its own, server/lib/transaction-objects.ts): list the
// store, and delete each object that no row names and that is older than a grace period. The grace period is
// what keeps an upload in flight safe (written, its row not yet committed), so it must outlast the longest
// transaction by far: an hour by default.
//
// Order matters: an object is listed first and its references are looked up after, so a row committed before
// the look-up always counts.

/** Every column that holds a storage key. tests/server/storage-sweep.test.ts fails on a new `*_key` column. */
export const STORAGE_KEY_COLUMNS = [
  { table: 'attachments', column: 'storage_key' },
  { table: 'attachments', column: 'thumbnail_key' },
  { table: 'claim_documents', column: 'storage_key' },
  { table: 'credit_memos', column: 'pdf_storage_key' },
] as const;

/** `*_key` columns that are not storage keys. */
export const NOT_STORAGE_KEY_COLUMNS = [
  { table: 'idempotency_keys', column: 'idem_key' },
  // Sign-in limit counters (rate-limiter-flexible's key) and the "what waits on me" item read marks.
  { table: 'login_limits', column: 'key' },
  { table: 'waiting_reads', column: 'item_key' },
] as const;

/** E-mail attachments waiting in the outbox name their objects inside a JSON array. */
const OUTBOX_REFERENCES = `SELECT jt.k AS k FROM outbox_messages o,
  JSON_TABLE(o.attachments, '$[*]' COLUMNS (k VARCHAR(160) PATH '$.storageKey')) AS jt
  WHERE o.attachments IS NOT NULL AND jt.k IN`;

export const DEFAULT_SWEEP_GRACE_MS = 60 * 60_000;

export type SweepOptions = {
  /** Objects modified less than this long ago (by clock.now()) are never removed. */
  graceMs?: number;
  /** Only objects under this key prefix. */
  prefix?: string;
  /** Report what would go, delete nothing. */
  dryRun?: boolean;
  batchSize?: number;
  logger?: Pick<Logger, 'info' | 'warn' | 'error'>;
};

export type SweepResult = {
  /** Objects listed. */
  listed: number;
  /** Listed objects inside the grace period, left alone whatever they are. */
  fresh: number;
  /** Old enough, and named by a row. */
  referenced: number;
  /** Removed (or, in a dry run, that would be). */
  removed: string[];
  /** Could not be removed this time (the next sweep tries again). */
  failed: string[];
  /** Another sweep held the lock, so this one did nothing. */
  skipped: boolean;
  /** Disk only: temporary files of writes a crash cut off, removed. */
  temporaries: string[];
};

const placeholders = (n: number) => `(${Array.from({ length: n }, () => '?').join(',')})`;

/** Which of these keys a row names. */
export async function referencedKeys(ds: AppDataSource, keys: string[]): Promise<Set<string>> {
  const found = new Set<string>();
  if (!keys.length) return found;
  for (const { table, column } of STORAGE_KEY_COLUMNS) {
    const rows = (await ds.query(
      `SELECT ${column} AS k FROM ${table} WHERE ${column} IN ${placeholders(keys.length)}`,
      keys,
    )) as { k: string }[];
    for (const r of rows) found.add(r.k);
  }
  // Only what the tables above did not name (usually nothing) is looked for in the outbox.
  const rest = keys.filter((k) => !found.has(k));
  if (rest.length) {
    const rows = (await ds.query(`${OUTBOX_REFERENCES} ${placeholders(rest.length)}`, rest)) as {
      k: string;
    }[];
    for (const r of rows) found.add(r.k);
  }
  return found;
}

const LOCK = 'lp_storage_sweep';

export async function sweepStorage(
  ds: AppDataSource,
  storage: Storage,
  opts: SweepOptions = {},
): Promise<SweepResult> {
  const graceMs = opts.graceMs ?? DEFAULT_SWEEP_GRACE_MS;
  if (!(graceMs >= 0)) throw new Error('The grace period cannot be negative.');
  const batchSize = opts.batchSize ?? 500;
  const result: SweepResult = {
    listed: 0,
    fresh: 0,
    referenced: 0,
    removed: [],
    failed: [],
    skipped: false,
    temporaries: [],
  };

  // One sweep at a time across every server on this database: two would only do the same work twice.
  const qr = ds.createQueryRunner();
  await qr.connect();
  try {
    const [row] = (await qr.query('SELECT GET_LOCK(?, 0) AS got', [LOCK])) as {
      got: number | string | null;
    }[];
    if (Number(row?.got) !== 1) return { ...result, skipped: true };
    try {
      const cutoff = clock.nowMs() - graceMs;
      let batch: StoredObject[] = [];
      const settle = async () => {
        const named = await referencedKeys(
          ds,
          batch.map((o) => o.key),
        );
        for (const o of batch) {
          if (named.has(o.key)) {
            result.referenced++;
            continue;
          }
          if (opts.dryRun) {
            result.removed.push(o.key);
            continue;
          }
          try {
            await storage.delete(o.key);
            result.removed.push(o.key);
          } catch (err) {
            result.failed.push(o.key);
            opts.logger?.warn({ err, key: o.key }, 'could not remove an unreferenced stored object');
          }
        }
        batch = [];
      };
      for await (const o of storage.list(opts.prefix)) {
        result.listed++;
        if (o.lastModified.getTime() > cutoff) {
          result.fresh++;
          continue;
        }
        batch.push(o);
        if (batch.length >= batchSize) await settle();
      }
      if (batch.length) await settle();
      // A temporary file is never named by a row; one older than the grace period is a write that died.
      if (!opts.dryRun && !opts.prefix && storage.removeStaleTemporaries)
        result.temporaries = await storage.removeStaleTemporaries(new Date(cutoff));
    } finally {
      await qr.query('DO RELEASE_LOCK(?)', [LOCK]).catch(() => undefined);
    }
  } finally {
    await qr.release();
  }
  if (result.removed.length || result.failed.length || result.temporaries.length) {
    opts.logger?.info(
      {
        listed: result.listed,
        removed: result.removed.length,
        failed: result.failed.length,
        temporaries: result.temporaries.length,
        dryRun: opts.dryRun ?? false,
      },
      'storage sweep removed unreferenced objects',
    );
  }
  return result;
}

/**
 * Sweeps once now and then every intervalMs (0: only now), on a timer that does not keep the process alive.
 * stop() waits for a sweep in progress, so that the database can be closed after it.
 */
export function startStorageSweeper(
  ds: AppDataSource,
  storage: Storage,
  logger: Pick<Logger, 'info' | 'warn' | 'error'>,
  opts: { graceMs: number; intervalMs: number },
) {
  let running: Promise<SweepResult | null> | null = null;
  let stopped = false;
  let last: SweepResult | null = null;
  const run = () => {
    if (stopped) return Promise.resolve(null);
    if (running) return running;
    running = sweepStorage(ds, storage, { graceMs: opts.graceMs, logger })
      .then((r) => (last = r))
      .catch((err: unknown) => {
        logger.error({ err }, 'the storage sweep failed; it runs again at the next interval');
        return null;
      })
      .finally(() => {
        running = null;
      });
    return running;
  };
  const first = run();
  const timer = opts.intervalMs > 0 ? setInterval(() => void run(), opts.intervalMs) : null;
  timer?.unref();
  return {
    /** The sweep started at start-up. */
    first,
    runNow: run,
    get last() {
      return last;
    },
    async stop() {
      stopped = true;
      if (timer) clearInterval(timer);
      await running;
    },
  };
}
