import http from 'node:http';
import type { AddressInfo } from 'node:net';
import supertest from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { forgetLoginFailures } from '../../server/auth/login-throttle';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { createOrganization, createUser, TEST_PASSWORD } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// Issue 13, items 1 and 2: the limits hold under parallel guesses and do not lock the account's owner out.
// TRUST_PROXY lets each test speak from addresses of its own (X-Forwarded-For), as clients behind one proxy would.
let t: TestContext;
let server: http.Server;
let base: string;
beforeAll(async () => {
  t = await createTestApp({ TRUST_PROXY: 'true' });
  server = http.createServer(t.app);
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});
afterAll(async () => {
  await new Promise<void>((r) => server?.close(() => r()));
  await closeTestApp(t);
});
beforeEach(async () => {
  await t.ds.query('DELETE FROM login_limits');
});

let lastOctet = 0;
const newAddress = () => `198.51.100.${++lastOctet}`; // RFC 5737 documentation range

function login(email: string, password: string, from: string, cookie?: string) {
  const r = supertest(base).post('/api/auth/login').set('X-Forwarded-For', from);
  if (cookie) r.set('Cookie', cookie);
  return r.send({ email, password });
}

function deviceCookie(res: { headers: Record<string, unknown> }) {
  const raw = res.headers['set-cookie'];
  const list = Array.isArray(raw) ? raw : raw ? [String(raw)] : [];
  return list.find((c: string) => c.startsWith('lp.device='))?.split(';')[0] ?? null;
}

async function account() {
  const org = await createOrganization(t.ds, 'manufacturer');
  return createUser(t.ds, org, ['accountant']);
}

describe('sign-in throttling under parallel requests', () => {
  it('judges at most 10 of 60 simultaneous wrong passwords; the rest are 429', async () => {
    const user = await account();
    const from = newAddress();
    const all = await Promise.all(
      Array.from({ length: 60 }, (_, i) => login(user.email, `wrong-${i}`, from)),
    );
    const judged = all.filter((r) => r.status === 401).length;
    const limited = all.filter((r) => r.status === 429).length;
    expect(judged).toBeGreaterThan(0);
    expect(judged).toBeLessThanOrEqual(10);
    expect(judged + limited).toBe(60);
    const failures = await t.ds
      .getRepository(AuditEvent)
      .countBy({ entityId: user.id, action: 'user.sign_in_failed' });
    expect(failures).toBe(judged);
    // One lockout row for the window, not one per refused attempt.
    const lockouts = await t.ds
      .getRepository(AuditEvent)
      .countBy({ entityId: user.id, action: 'user.locked_out' });
    expect(lockouts).toBe(1);
  });

  it('refuses the right password sent last among 200 parallel guesses', async () => {
    const user = await account();
    const from = newAddress();
    const guesses = Array.from({ length: 199 }, (_, i) => login(user.email, `wrong-${i}`, from));
    const right = login(user.email, TEST_PASSWORD, from);
    const all = await Promise.all([...guesses, right]);
    expect(all.filter((r) => r.status === 401).length).toBeLessThanOrEqual(10);
    expect(all[199].status).toBe(429);
    expect(all.some((r) => r.status === 200)).toBe(false);
  });

  it('counts no more than 10 guesses per account across many addresses', async () => {
    const user = await account();
    const all = await Promise.all(
      Array.from({ length: 40 }, (_, i) => login(user.email, `wrong-${i}`, newAddress())),
    );
    expect(all.filter((r) => r.status === 401).length).toBeLessThanOrEqual(10);
  });
});

describe('throttling does not lock the owner out', () => {
  it('lets other accounts sign in from the address that hammered one account', async () => {
    const victim = await account();
    const other = await account();
    const attacker = newAddress();
    await Promise.all(Array.from({ length: 30 }, (_, i) => login(victim.email, `wrong-${i}`, attacker)));
    expect((await login(other.email, TEST_PASSWORD, attacker)).status).toBe(200);
  });

  it('lets the owner in from another address after one address spent its guesses', async () => {
    const victim = await account();
    const attacker = newAddress();
    await Promise.all(Array.from({ length: 30 }, (_, i) => login(victim.email, `wrong-${i}`, attacker)));
    expect((await login(victim.email, TEST_PASSWORD, attacker)).status).toBe(429);
    expect((await login(victim.email, TEST_PASSWORD, newAddress())).status).toBe(200);
  });

  it('lets the owner in from a known device when the account-wide limit is spent', async () => {
    const victim = await account();
    const home = newAddress();
    const first = await login(victim.email, TEST_PASSWORD, home);
    expect(first.status).toBe(200);
    const device = deviceCookie(first);
    expect(device).toBeTruthy();
    expect(String(first.headers['set-cookie'])).toMatch(/lp\.device=[^;]+;.*HttpOnly/i);

    // Guesses from many addresses spend the account-wide allowance.
    await Promise.all(Array.from({ length: 40 }, (_, i) => login(victim.email, `wrong-${i}`, newAddress())));
    const stranger = await login(victim.email, TEST_PASSWORD, newAddress());
    expect(stranger.status).toBe(429);
    expect(Number(stranger.headers['retry-after'])).toBeGreaterThan(0);

    // The owner's browser is not subject to the account-wide lockout, from any address.
    expect((await login(victim.email, TEST_PASSWORD, newAddress(), device!)).status).toBe(200);
    // A device cookie of another account, or a forged one, counts for nothing.
    const forged = device!.slice(0, -1) + (device!.endsWith('A') ? 'B' : 'A');
    expect((await login(victim.email, TEST_PASSWORD, newAddress(), forged)).status).toBe(429);
  });

  it('gives a known device only its own 10 guesses', async () => {
    const victim = await account();
    const first = await login(victim.email, TEST_PASSWORD, newAddress());
    const device = deviceCookie(first)!;
    const all = await Promise.all(
      Array.from({ length: 30 }, (_, i) => login(victim.email, `wrong-${i}`, newAddress(), device)),
    );
    expect(all.filter((r) => r.status === 401).length).toBeLessThanOrEqual(10);
    expect(all.filter((r) => r.status === 429).length).toBeGreaterThan(0);
  });

  it('forgetLoginFailures clears the account so it signs in at once', async () => {
    const victim = await account();
    await Promise.all(Array.from({ length: 40 }, (_, i) => login(victim.email, `wrong-${i}`, newAddress())));
    const from = newAddress();
    expect((await login(victim.email, TEST_PASSWORD, from)).status).toBe(429);
    await forgetLoginFailures(victim.email.toUpperCase());
    expect((await login(victim.email, TEST_PASSWORD, from)).status).toBe(200);
  });
});
