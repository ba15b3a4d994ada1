import type { Readable } from 'node:stream';
import {
  EventSubscriber,
  type EntityManager,
  type EntitySubscriberInterface,
  type QueryRunner,
  type TransactionCommitEvent,
  type TransactionRollbackEvent,
} from 'typeorm';
import type { Storage } from './storage';

// Objects written for a transaction that is still open (a letter, a packing slip, a memo PDF): the row that
// names the object commits with the transaction, so the object has to be written first, and a rollback would
// leave it unreferenced. putForTransaction remembers the key against the transaction's connection; the
// subscriber below deletes it when that transaction (or the savepoint it was written under) rolls back, and
// forgets it when the transaction commits. A process killed mid-transaction deletes nothing: the storage sweep
// (server/lib/storage-sweep.ts) removes what that leaves.

type Written = { storage: Storage; key: string; depth: number };
const pending = new WeakMap<QueryRunner, Written[]>();

/** How many transactions deep the connection is (savepoints count); TypeORM keeps it protected. */
const depthOf = (qr: QueryRunner) =>
  (qr as unknown as { transactionDepth?: number }).transactionDepth ?? (qr.isTransactionActive ? 1 : 0);

export async function putForTransaction(
  m: EntityManager,
  storage: Storage,
  key: string,
  body: Buffer | Readable,
  contentType: string,
): Promise<void> {
  const qr = m.queryRunner;
  if (!qr?.isTransactionActive)
    throw new Error('putForTransaction needs the manager of an open transaction.');
  const list = pending.get(qr) ?? [];
  // Noted before the write: a write that fails halfway is removed with the rest (deleting nothing is no error).
  list.push({ storage, key, depth: depthOf(qr) });
  pending.set(qr, list);
  await storage.put(key, body, contentType);
}

/** Keys written for a transaction of this connection that is still open (tests look). */
export function pendingObjectKeys(qr: QueryRunner): string[] {
  return (pending.get(qr) ?? []).map((w) => w.key);
}

// Registered in server/db/data-source.ts; TypeORM takes only classes marked as subscribers.
@EventSubscriber()
export class TransactionObjectsSubscriber implements EntitySubscriberInterface {
  async afterTransactionRollback(event: TransactionRollbackEvent) {
    const qr = event.queryRunner;
    const list = pending.get(qr);
    if (!list) return;
    // transactionDepth is already the depth after the rollback: what was written deeper is undone.
    const depth = depthOf(qr);
    const undone = list.filter((w) => w.depth > depth);
    const kept = list.filter((w) => w.depth <= depth);
    if (kept.length) pending.set(qr, kept);
    else pending.delete(qr);
    for (const w of undone) {
      // A delete that fails here leaves the object to the sweep; the rollback itself has already happened.
      await w.storage.delete(w.key).catch(() => undefined);
    }
  }

  afterTransactionCommit(event: TransactionCommitEvent) {
    const qr = event.queryRunner;
    const list = pending.get(qr);
    if (!list) return;
    const depth = depthOf(qr);
    if (depth === 0) pending.delete(qr);
    // A released savepoint hands its objects to the transaction around it.
    else for (const w of list) w.depth = Math.min(w.depth, depth);
  }
}
