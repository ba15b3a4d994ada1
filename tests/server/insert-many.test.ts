import crypto from 'node:crypto';
import { In, type EntityManager } from 'typeorm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Organization } from '../../server/db/entities/organization.entity';
import { insertMany } from '../../server/db/insert-many';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// insertMany (server/db/insert-many.ts) sends each multi-row statement before it builds the next, so that Node
// builds one while MariaDB inserts the one before. Still: every row written, progress in order, and a failing
// statement fails the whole call with its own error, with nothing left unhandled behind it.

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));

const orgRows = (n: number, tag: string) =>
  Array.from({ length: n }, (_, i) => ({
    id: crypto.randomUUID(),
    name: `Insert-many ${tag} ${i}`,
    kind: 'contractor' as const,
  }));

/** The manager with its statements timed: when each was asked for and when it answered, on one clock. */
function timed(m: EntityManager) {
  let tick = 0;
  const calls: { asked: number; answered?: number }[] = [];
  const query = m.query.bind(m);
  return {
    calls,
    manager: Object.assign(Object.create(m) as EntityManager, {
      query: (sql: string, params?: unknown[]) => {
        const call: { asked: number; answered?: number } = { asked: tick++ };
        calls.push(call);
        return query(sql, params).then((r: unknown) => {
          call.answered = tick++;
          return r;
        });
      },
    }),
  };
}

describe('insertMany', () => {
  it('writes every row, reports progress in order, and has the next statement on its way before one answers', async () => {
    const tag = crypto.randomUUID().slice(0, 8);
    const rows = orgRows(9_000, tag);
    const progress: number[] = [];
    let calls: { asked: number; answered?: number }[] = [];
    await t.ds.transaction(async (m) => {
      const spy = timed(m);
      calls = spy.calls;
      await insertMany(spy.manager, Organization, rows, 2_000, (n) => progress.push(n));
    });
    expect(progress).toEqual([2_000, 4_000, 6_000, 8_000, 9_000]);
    expect(calls).toHaveLength(5);
    // The second statement was asked for while the first was still running in MariaDB.
    expect(calls[1].asked).toBeLessThan(calls[0].answered!);
    expect(await t.ds.getRepository(Organization).countBy({ id: In(rows.map((r) => r.id)) })).toBe(9_000);
  });

  it("fails with the failing statement's own error, and its transaction writes nothing", async () => {
    const tag = crypto.randomUUID().slice(0, 8);
    const rows = orgRows(2_400, tag);
    // A duplicate name in the third statement of five; the statements after it are already on their way.
    rows[1_100] = { ...rows[1_100], name: rows[3].name };
    const progress: number[] = [];
    await expect(
      t.ds.transaction((m) => insertMany(m, Organization, rows, 500, (n) => progress.push(n))),
    ).rejects.toMatchObject({ driverError: { code: 'ER_DUP_ENTRY' } });
    expect(progress).toEqual([500, 1_000]);
    expect(await t.ds.getRepository(Organization).countBy({ id: In(rows.map((r) => r.id)) })).toBe(0);
  });
});
