import { execFileSync, spawn } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { inject } from 'vitest';
import { freePort, waitForHealth } from '../../scripts/lib/free-port';
import { createOrganization, createUser, TEST_PASSWORD } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// WEB_CONCURRENCY=2: server/index.ts as production starts it, serving from two worker processes on one port.
// Sessions live in MariaDB, so a signed-in user is recognised by whichever worker answers.

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));

// The primary's node children: the workers (the TypeScript loader's esbuild service is a child too, not counted).
const childrenOf = (pid: number) => {
  let pids: string[];
  try {
    pids = execFileSync('pgrep', ['-P', String(pid)], { encoding: 'utf8' })
      .trim()
      .split('\n')
      .filter(Boolean);
  } catch {
    return []; // pgrep exits 1 when there are none
  }
  return pids.filter((p) => {
    try {
      return fs.readFileSync(`/proc/${p}/comm`, 'utf8').trim() === 'node';
    } catch {
      return false; // already gone
    }
  });
};

it('serves from two worker processes sharing the port, and stops them all on SIGTERM', async () => {
  const org = await createOrganization(t.ds, 'contractor');
  const user = await createUser(t.ds, org, ['installer']);
  const port = await freePort();
  const primary = spawn(process.execPath, ['--import', 'tsx', path.resolve('server/index.ts')], {
    env: {
      ...process.env,
      NODE_ENV: 'test',
      APP_MODE: 'production',
      LOG_LEVEL: 'silent',
      DATABASE_URL: inject('databaseUrl'),
      DATA_DIR: '.data/test-run',
      HOST: '127.0.0.1',
      PORT: String(port),
      WEB_CONCURRENCY: '2',
      OUTBOX_WORKER: 'false',
    },
    stdio: ['ignore', 'inherit', 'inherit'],
  });
  const exited = new Promise<number | null>((r) => primary.once('exit', (code) => r(code)));
  try {
    const base = `http://127.0.0.1:${port}`;
    await waitForHealth(base);
    expect(childrenOf(primary.pid!)).toHaveLength(2);

    const login = await fetch(`${base}/api/auth/login`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ email: user.email, password: TEST_PASSWORD }),
    });
    expect(login.status).toBe(200);
    const cookie = login.headers
      .getSetCookie()
      .find((c) => c.startsWith('lp.sid='))!
      .split(';')[0];
    // Connections are handed to the workers in turn: new connections, so both workers answer some of these.
    const answers = await Promise.all(
      Array.from({ length: 8 }, () =>
        fetch(`${base}/api/auth/me`, { headers: { cookie, connection: 'close' } }).then((r) => r.status),
      ),
    );
    expect(answers).toEqual(Array(8).fill(200));
  } finally {
    const workers = childrenOf(primary.pid!);
    primary.kill('SIGTERM');
    expect(await exited).toBe(0);
    // Gone (a moment after the primary: a child of the loader may outlive it by a few milliseconds).
    const alive = (pid: string) => {
      try {
        process.kill(Number(pid), 0);
        return true;
      } catch {
        return false;
      }
    };
    for (let i = 0; i < 50 && workers.some(alive); i++) await new Promise((r) => setTimeout(r, 100));
    expect(workers.filter(alive)).toEqual([]);
  }
}, 90_000);
