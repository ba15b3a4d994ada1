import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { inject } from 'vitest';
import type { AppDataSource } from '../../server/db/data-source';
import { TEST_PASSWORD } from './factories';

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- response bodies of every shape, read by the tests
export type Json = Record<string, any>;

// The API server as a child process (tests/support/crash-server.ts) on the test database, optionally armed at
// one named crash point (server/lib/crash-point.ts), where it announces itself on stdout and waits to be killed.

export type CrashServer = {
  child: ChildProcess;
  base: string;
  /** Resolves when the armed crash point is reached, with the connection whose transaction is open there. */
  reached: Promise<{ crashPoint: string; connectionId: number | null }>;
  kill: () => Promise<void>;
};

const children = new Set<ChildProcess>();

export function startCrashServer(env: Record<string, string> = {}): Promise<CrashServer> {
  const child = spawn(process.execPath, ['--import', 'tsx', path.resolve('tests/support/crash-server.ts')], {
    env: {
      ...process.env,
      NODE_ENV: 'test',
      APP_MODE: 'demo',
      LOG_LEVEL: 'silent',
      DATABASE_URL: inject('databaseUrl'),
      DATA_DIR: '.data/test-run',
      PUBLIC_URL: 'http://127.0.0.1:3000',
      OUTBOX_WORKER: 'false',
      ...env,
    },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  children.add(child);
  let out = '';
  let onReached: (v: { crashPoint: string; connectionId: number | null }) => void = () => undefined;
  const reached = new Promise<{ crashPoint: string; connectionId: number | null }>((r) => (onReached = r));
  const kill = async () => {
    if (child.exitCode !== null || child.signalCode !== null) return;
    const exited = new Promise((r) => child.once('exit', r));
    child.kill('SIGKILL');
    await exited;
    children.delete(child);
  };
  return new Promise((resolve, reject) => {
    child.stdout!.on('data', (d: Buffer) => {
      out += d.toString();
      for (const line of out.split('\n').filter((l) => l.startsWith('{'))) {
        const msg = JSON.parse(line) as { port?: number; crashPoint?: string; connectionId?: number | null };
        if (msg.port) resolve({ child, base: `http://127.0.0.1:${msg.port}`, reached, kill });
        if (msg.crashPoint) onReached({ crashPoint: msg.crashPoint, connectionId: msg.connectionId ?? null });
      }
      out = out.slice(out.lastIndexOf('\n') + 1);
    });
    child.once('exit', (code) => reject(new Error(`the server exited early (${code})`)));
  });
}

/** Kills every server a test started and did not kill itself. */
export async function killAllCrashServers() {
  for (const c of children) if (c.exitCode === null && c.signalCode === null) c.kill('SIGKILL');
  children.clear();
}

export async function until(what: string, fn: () => Promise<boolean>, ms = 20_000) {
  const end = Date.now() + ms;
  while (Date.now() < end) {
    if (await fn()) return;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`timed out waiting for ${what}`);
}

/** Waits until the database has noticed the dead connection and rolled its transaction back. */
export async function connectionGone(ds: AppDataSource, connectionId: number | null) {
  if (connectionId === null) return;
  await until(`connection ${connectionId} to close`, async () => {
    const rows = (await ds.query('SELECT COUNT(*) AS n FROM information_schema.PROCESSLIST WHERE ID = ?', [
      connectionId,
    ])) as { n: string }[];
    return Number(rows[0].n) === 0;
  });
}

export async function httpSignIn(base: string, email: string, password = TEST_PASSWORD) {
  const r = await fetch(`${base}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password }),
  });
  if (r.status !== 200) throw new Error(`sign-in of ${email}: ${r.status} ${await r.text()}`);
  return r.headers
    .getSetCookie()
    .find((c) => c.startsWith('lp.sid='))!
    .split(';')[0];
}

export async function httpJson(
  base: string,
  cookie: string,
  method: string,
  url: string,
  body?: unknown,
  headers: Record<string, string> = {},
) {
  const r = await fetch(`${base}${url}`, {
    method,
    headers: { cookie, ...(body === undefined ? {} : { 'content-type': 'application/json' }), ...headers },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  const text = await r.text();
  return { status: r.status, headers: r.headers, body: text ? (JSON.parse(text) as Json) : null };
}

/** Every stored object under a disk storage folder, as storage keys. */
export function storedKeys(storageDir: string): string[] {
  const out: string[] = [];
  const walk = (dir: string, prefix: string) => {
    if (!fs.existsSync(dir)) return;
    for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
      if (e.isDirectory()) walk(path.join(dir, e.name), `${prefix}${e.name}/`);
      else out.push(`${prefix}${e.name}`);
    }
  };
  walk(storageDir, '');
  return out.sort();
}
