import mysql from 'mysql2/promise';
import supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config/env';
import { createDataSource } from '../../server/db/data-source';
import { readRows, withReadRouting } from '../../server/db/read';
import { clock } from '../../server/lib/clock';
import { createLogger } from '../../server/lib/logger';
import { dbServersOf, stopStaleProfiles } from '../../scripts/lib/db-processes';
import {
  replicaSets,
  resetDatabase,
  startLocalReplicaSet,
  stopLocalDb,
  stopLocalReplicaSet,
  type LocalDb,
  type LocalReplicaSet,
} from '../../scripts/lib/mariadb';
import { claimWorld, createDraft, goodClaimFields } from '../support/claim-factories';
import { StatementCounter } from '../support/statement-counter';
import { closeTestApp, type TestContext } from '../support/test-app';

// Issue 15 item 1: the app against a real primary and a real read replica (profile test-replica: Debian's
// MariaDB, GTID replication, the replica read-only), as a server with DATABASE_REPLICA_URLS runs it.
const env = loadConfig();
const ports = replicaSets(env.dbPort)['test-replica'];
const RYW_SECONDS = 10;
let set: LocalReplicaSet;
let t: TestContext;

const root = (db: LocalDb) =>
  mysql.createConnection({ socketPath: db.socket, user: 'root', password: '', multipleStatements: true });

async function onRoot<T>(db: LocalDb, fn: (c: mysql.Connection) => Promise<T>) {
  const c = await root(db);
  try {
    return await fn(c);
  } finally {
    await c.end();
  }
}

/** Waits until the replica has applied everything the primary has committed so far (MASTER_GTID_WAIT). */
async function replicated(timeoutSeconds = 20) {
  const pos = await onRoot(set.primary, async (c) => {
    const [[r]] = (await c.query('SELECT @@gtid_binlog_pos AS pos')) as unknown as [{ pos: string }[]];
    return r.pos;
  });
  const waited = await onRoot(set.replica, async (c) => {
    const [[r]] = (await c.query('SELECT MASTER_GTID_WAIT(?, ?) AS w', [pos, timeoutSeconds])) as unknown as [
      { w: number }[],
    ];
    return Number(r.w);
  });
  if (waited !== 0) throw new Error(`the replica did not reach ${pos} in ${timeoutSeconds} s`);
}

/** The replica keeps receiving the binary log but applies none of it until resumed. */
const pauseApplying = () => onRoot(set.replica, (c) => c.query('STOP SLAVE SQL_THREAD'));
const resumeApplying = () => onRoot(set.replica, (c) => c.query('START SLAVE SQL_THREAD'));

/** A client whose own last write is older than the read-your-writes window. */
const pastOwnWrites = () => clock.advance((RYW_SECONDS + 1) * 1000);

beforeAll(async () => {
  await stopStaleProfiles(env.dataDir, ['repl-test', 'repl-test-replica']);
  set = await startLocalReplicaSet({ dataDir: env.dataDir, ...ports, log: () => {} });
  await resetDatabase(set.primary);
  const migrate = createDataSource(set.primary.url, { poolSize: 1 });
  await migrate.initialize();
  await migrate.runMigrations({ transaction: 'each' });
  await migrate.destroy();
  await replicated();

  const config = loadConfig({
    NODE_ENV: 'test',
    APP_MODE: 'demo',
    LOG_LEVEL: 'silent',
    PUBLIC_URL: 'http://127.0.0.1:3000',
    DATA_DIR: '.data/test-run',
    DATABASE_URL: set.primary.url,
    DATABASE_REPLICA_URLS: set.replica.url,
    READ_YOUR_WRITES_SECONDS: String(RYW_SECONDS),
  });
  const statements = new StatementCounter();
  const ds = createDataSource(set.primary.url, {
    poolSize: 5,
    replicaUrls: config.databaseReplicaUrls,
    logger: statements,
  });
  await ds.initialize();
  const app = createApp({ config, ds, logger: createLogger('silent'), databaseUrl: set.primary.url });
  t = { app, ds, config, request: () => supertest.agent(app), countQueries: (fn) => statements.count(fn) };
}, 120_000);

afterAll(async () => {
  await closeTestApp(t);
  // Both by their pid files: the set restarted mid-test did not start the primary, so its stop() would leave it.
  await stopLocalReplicaSet(env.dataDir, 'repl-test');
});

const serverId = async (from?: 'primary' | 'replica') =>
  Number((await readRows<{ id: number }>(t.ds, 'SELECT @@server_id AS id', [], { from }))[0].id);

describe('the servers', () => {
  it('run as two processes with their own data directories, which the leftover check finds', () => {
    const mine = dbServersOf(env.dataDir).filter((p) => p.profile.startsWith('repl-test'));
    expect(mine.map((p) => p.profile).sort()).toEqual(['repl-test', 'repl-test-replica']);
    expect(new Set(mine.map((p) => p.datadir)).size).toBe(2);
  });

  it('replicate by GTID into a read-only replica the application account cannot write', async () => {
    const status = await onRoot(set.replica, async (c) => {
      const [[s]] = (await c.query('SHOW SLAVE STATUS')) as unknown as [Record<string, string>[]];
      const [[v]] = (await c.query('SELECT @@read_only AS ro')) as unknown as [{ ro: number }[]];
      return { ...s, ro: v.ro };
    });
    expect(status).toMatchObject({
      Using_Gtid: 'Slave_Pos',
      Slave_IO_Running: 'Yes',
      Slave_SQL_Running: 'Yes',
      ro: 1,
    });
    const app = await mysql.createConnection(set.replica.url);
    try {
      await expect(app.query("INSERT INTO audit_events (action) VALUES ('x')")).rejects.toThrow();
    } finally {
      await app.end();
    }
  });
});

describe('where readRows reads', () => {
  it('a replica by default, the primary when asked or when the request is held to it', async () => {
    expect(await serverId()).toBe(3);
    expect(await serverId('replica')).toBe(3);
    expect(await serverId('primary')).toBe(1);
    expect(await withReadRouting(true, () => serverId())).toBe(1);
    expect(await withReadRouting(false, () => serverId())).toBe(3);
  });

  it('keeps mysql2 dateStrings per read on a replica, and counts each read once', async () => {
    const sql = "SELECT CAST('2026-12-02 05:41:59.123' AS DATETIME(3)) AS at";
    const { result, counter } = await t.countQueries(async () => [
      await readRows<{ at: unknown }>(t.ds, sql, [], { dateStrings: true }),
      await readRows<{ at: unknown }>(t.ds, sql),
    ]);
    expect(result[0][0].at).toBe('2026-12-02 05:41:59.123');
    // timezone 'Z': a DATETIME is read as UTC
    expect((result[1][0].at as Date).toISOString()).toBe('2026-12-02T05:41:59.123Z');
    expect(counter.count).toBe(2);
  });
});

describe('a claim filed with a replica beside the primary', () => {
  it('is on its own page at once, in its filer’s list at once, and in others’ lists once replicated', async () => {
    const w = await claimWorld(t);
    await replicated();
    await pauseApplying();
    let id = '';
    try {
      const draft = await createDraft(
        w.installer.agent,
        w.installation.id,
        goodClaimFields(w.installation.serials[0]),
      );
      const filed = await w.installer.agent.post(`/api/claims/${draft.id}/file`).send({});
      expect(filed.status).toBe(200);
      id = draft.id;
      pastOwnWrites();
      // Its page reads the primary: the reviewer who follows the link at once finds it.
      const page = await w.reviewer.agent.get(`/api/claims/${draft.id}`);
      expect(page.status).toBe(200);
      expect(page.body.claim.stage).toBe('filed');
      // The lists read the replica, which has not applied the filing yet.
      const before = await w.reviewer.agent.get('/api/claims');
      expect(before.status).toBe(200);
      expect(before.body.items.map((c: { id: string }) => c.id)).not.toContain(draft.id);
      // The filer wrote a moment ago (within the window): their reads go to the primary.
      clock.reset();
      const own = await w.installer.agent.get('/api/claims');
      expect(own.body.items.map((c: { id: string }) => c.id)).toContain(draft.id);
    } finally {
      await resumeApplying();
    }
    await replicated();
    pastOwnWrites();
    const after = await w.reviewer.agent.get('/api/claims');
    expect(after.body.items.map((c: { id: string }) => c.id)).toContain(id);
  });
});

const idsOf = (r: { body: { items: { id: string }[] } }) => r.body.items.map((c) => c.id);

describe('a replica that stops', () => {
  it('fails no request: its reads go to the primary, and it is used again once it is back', async () => {
    const w = await claimWorld(t);
    const first = await createDraft(
      w.installer.agent,
      w.installation.id,
      goodClaimFields(w.installation.serials[0]),
    );
    expect((await w.installer.agent.post(`/api/claims/${first.id}/file`).send({})).status).toBe(200);
    await replicated();

    await stopLocalDb(env.dataDir, 'repl-test-replica');
    try {
      pastOwnWrites();
      for (let i = 0; i < 5; i++) {
        const list = await w.reviewer.agent.get('/api/claims');
        expect(list.status).toBe(200);
        expect(idsOf(list)).toContain(first.id);
      }
      expect(await serverId()).toBe(1);
      // Writes go on, and what they write is read (from the primary) by people who did not write it.
      const second = await createDraft(w.installer.agent, w.installation.id, {
        ...goodClaimFields(w.installation.serials[1] ?? w.installation.serials[0]),
        narrative: 'Filed while the replica was down.',
      });
      expect((await w.installer.agent.post(`/api/claims/${second.id}/file`).send({})).status).toBe(200);
      pastOwnWrites();
      const list = await w.reviewer.agent.get('/api/claims');
      expect(list.status).toBe(200);
      expect(idsOf(list)).toContain(second.id);
      expect((await w.reviewer.agent.get(`/api/claims/${second.id}`)).status).toBe(200);
    } finally {
      // Back from where it stopped: it catches up from its own GTID position.
      set = await startLocalReplicaSet({ dataDir: env.dataDir, ...ports, log: () => {} });
    }
    await replicated();
    // The pool cluster tries a replica left out again after restoreNodeTimeout (5 s).
    await new Promise((r) => setTimeout(r, 5_500));
    expect(await serverId()).toBe(3);
  }, 60_000);
});
