import type { EntityTarget, ObjectLiteral, QueryDeepPartialEntity } from 'typeorm';
import type { AppDataSource } from '../db/data-source';
import { clock } from './clock';

// The lease-and-retry loop shared by the e-mail outbox (outbox.ts) and webhook deliveries (webhooks.ts): rows
// written in the transaction of a change with status 'pending', an attempt count and a next attempt time, then
// claimed and sent by a worker. Each queue keeps only its own sending.

/** A queue row: what the loop reads and writes (columns status, attempts, next_attempt_at). */
export type QueueRow = ObjectLiteral & { id: string; attempts: number };

export const MAX_ATTEMPTS = 8;

/** 5 s, 10 s, 20 s … doubling, at most an hour between attempts. */
export const backoffMs = (attempt: number) => Math.min(60 * 60 * 1000, 5_000 * 2 ** (attempt - 1));

export type ClaimOptions = {
  batch?: number;
  /** How long a claimed row is left alone before another worker may take it (a killed sender's retry). */
  leaseMs?: number;
  /** Only these rows (a resend of chosen ones; tests that share the queue with other workers). */
  ids?: string[];
};

/**
 * Claims due rows by pushing their next attempt into the future inside a short transaction (FOR UPDATE SKIP
 * LOCKED), so several workers never send the same row at once, and a worker killed mid-send leaves the row to be
 * retried when that lease runs out. The rows come back as they were read (attempts before this one).
 */
export async function claimDue<T extends QueueRow>(
  ds: AppDataSource,
  entity: EntityTarget<T>,
  opts: ClaimOptions = {},
): Promise<T[]> {
  const leaseMs = opts.leaseMs ?? 120_000;
  return ds.transaction(async (m) => {
    const qb = m
      .createQueryBuilder(entity, 'q')
      .where('q.status = :s AND q.next_attempt_at <= :now', { s: 'pending', now: clock.now() });
    // Ids are unsigned bigints: '0' matches none when the caller asked for none.
    if (opts.ids) qb.andWhere('q.id IN (:...ids)', { ids: opts.ids.length ? opts.ids : ['0'] });
    const rows = await qb
      .orderBy('q.id', 'ASC')
      .limit(opts.batch ?? 20)
      .setLock('pessimistic_write')
      .setOnLocked('skip_locked')
      .getMany();
    if (rows.length) {
      await m
        .createQueryBuilder()
        .update(entity)
        // Every queue entity has these two columns; TypeScript cannot see that through the generic T.
        .set({
          nextAttemptAt: new Date(clock.nowMs() + leaseMs),
          attempts: () => 'attempts + 1',
        } as unknown as QueryDeepPartialEntity<T>)
        .whereInIds(rows.map((r) => r.id))
        .execute();
    }
    return rows;
  });
}

/** A failed attempt: retried after the backoff, or given up after MAX_ATTEMPTS (or at once when `giveUp`). */
export function afterFailure(attempts: number, giveUp = false) {
  return {
    status: giveUp || attempts >= MAX_ATTEMPTS ? ('failed' as const) : ('pending' as const),
    nextAttemptAt: new Date(clock.nowMs() + backoffMs(attempts)),
  };
}

/**
 * Runs `run` after `firstDelayMs`, then again `intervalMs` after each run ends (never two at once). stop() waits
 * for a run in progress, then calls `close`.
 */
export function startQueueWorker(opts: {
  run: () => Promise<unknown>;
  firstDelayMs: number;
  intervalMs?: number;
  close?: () => void;
}) {
  let stopped = false;
  let running: Promise<unknown> = Promise.resolve();
  const tick = async () => {
    if (stopped) return;
    running = opts.run();
    await running;
    if (!stopped) timer = setTimeout(tick, opts.intervalMs ?? 1000);
  };
  let timer = setTimeout(tick, opts.firstDelayMs);
  return {
    async stop() {
      stopped = true;
      clearTimeout(timer);
      await running;
      opts.close?.();
    },
  };
}
