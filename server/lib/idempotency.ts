import type { EntityManager } from 'typeorm';
import type { AppDataSource } from '../db/data-source';
import { IdempotencyKey } from '../db/entities/idempotency-key.entity';
import { canonicalJson, sha256Hex } from './pdf/hash';
import { clock } from './clock';
import { AppError } from './errors';

// Idempotent actions (issuing a credit memo): the first request with a key acts and stores its answer; the same
// key again replays that answer; the same key with another request is refused. The key's row is inserted FIRST
// in the action's own transaction, so a second request with the same key waits on the unique index until the
// first commits (then it replays) or rolls back (then it acts itself). Only successful answers are stored: a
// refusal (409, 404 …) stores nothing, so a retry is judged afresh.

export type IdempotentRequest = {
  key: string;
  userId: string;
  route: string;
  method: string;
  path: string;
  body: unknown;
};
export type IdempotentAnswer = { status: number; body: unknown; replayed: boolean };

export const REPLAY_HEADER = 'Idempotent-Replayed';

export function requestHash(r: Pick<IdempotentRequest, 'method' | 'path' | 'body'>) {
  return sha256Hex(`${r.method.toUpperCase()}\n${r.path}\n${canonicalJson(r.body ?? {})}`);
}

const errno = (err: unknown) => {
  const e = err as { errno?: number; driverError?: { errno?: number } };
  return e.driverError?.errno ?? e.errno;
};
/** ER_DUP_ENTRY on the key's unique index: another request with this key committed first. */
const isKeyTaken = (err: unknown) =>
  errno(err) === 1062 && String((err as Error).message).includes('uq_idempotency_keys');
/** ER_LOCK_DEADLOCK: InnoDB chose this transaction as the victim; it was rolled back whole and may run again. */
export const isDeadlock = (err: unknown) => errno(err) === 1213;

const reused = () =>
  new AppError(
    422,
    'idempotency.key_reused',
    'This Idempotency-Key was already used for a different request. Use a new key for a new request.',
  );

export async function runIdempotent(
  ds: AppDataSource,
  req: IdempotentRequest,
  act: (m: EntityManager) => Promise<{ status: number; body: unknown }>,
): Promise<IdempotentAnswer> {
  const hash = requestHash(req);
  const where = { userId: req.userId, route: req.route, key: req.key };
  for (let attempt = 1; ; attempt++) {
    const done = await ds.getRepository(IdempotencyKey).findOne({ where });
    if (done) {
      if (done.requestHash !== hash) throw reused();
      return { status: done.responseStatus ?? 200, body: done.responseBody, replayed: true };
    }
    try {
      return await ds.transaction(async (m) => {
        await m.insert(IdempotencyKey, {
          ...where,
          requestHash: hash,
          status: 'pending',
          createdAt: clock.now(),
        });
        const answer = await act(m);
        await m.update(IdempotencyKey, where, {
          status: 'done',
          responseStatus: answer.status,
          responseBody: answer.body as never,
        });
        return { ...answer, replayed: false };
      });
    } catch (err) {
      if ((isKeyTaken(err) || isDeadlock(err)) && attempt < 8) continue;
      throw err;
    }
  }
}

/** Runs a transaction again when InnoDB picks it as a deadlock victim (it was rolled back whole). */
export async function retryOnDeadlock<T>(fn: () => Promise<T>, attempts = 8): Promise<T> {
  for (let i = 1; ; i++) {
    try {
      return await fn();
    } catch (err) {
      if (!isDeadlock(err) || i >= attempts) throw err;
    }
  }
}

/**
 * How long an answer stays replayable under its key. A retry later than this is judged afresh, which is safe: a
 * claim already credited refuses a second memo (409) whatever the key, and a second draft is only a draft.
 */
export const IDEMPOTENCY_KEY_DAYS = 30;

/** Deletes keys older than IDEMPOTENCY_KEY_DAYS (by the server's clock), in batches; returns how many went. */
export async function purgeIdempotencyKeys(ds: AppDataSource, now: Date = clock.now()): Promise<number> {
  const before = new Date(now.getTime() - IDEMPOTENCY_KEY_DAYS * 86_400_000);
  let total = 0;
  for (;;) {
    const r = (await ds.query('DELETE FROM idempotency_keys WHERE created_at < ? LIMIT 5000', [before])) as {
      affectedRows: number;
    };
    total += r.affectedRows;
    if (r.affectedRows < 5000) return total;
  }
}

/** Purges old keys at start and then daily (a timer that does not keep the process alive). */
export function startIdempotencyKeyPurge(
  ds: AppDataSource,
  logger: { error: (o: object, m: string) => void },
) {
  const run = () =>
    void purgeIdempotencyKeys(ds).catch((err: unknown) =>
      logger.error({ err }, 'could not purge old idempotency keys'),
    );
  run();
  const timer = setInterval(run, 24 * 60 * 60 * 1000);
  timer.unref();
  return { stop: () => clearInterval(timer) };
}
