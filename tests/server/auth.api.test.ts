import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { forgetLoginFailures, LOGIN_LIMITS } from '../../server/auth/login-throttle';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { DEMO_ACCOUNTS, DEMO_ORGANIZATIONS, DEMO_PASSWORD } from '../../server/db/seed/demo-accounts';
import { seedDemo } from '../../server/db/seed/demo';
import { createStorage } from '../../server/lib/storage';
import { clock } from '../../server/lib/clock';
import { createOrganization, createUser, sessionCookie, TEST_PASSWORD } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));
// Failed sign-ins from 127.0.0.1 count towards the per-address limit; each test starts from none.
beforeEach(async () => {
  await t.ds.query('DELETE FROM login_limits');
});

describe('sign-in and sign-out', () => {
  it('signs in, answers /me, signs out, and refuses the old cookie afterwards', async () => {
    const org = await createOrganization(t.ds, 'contractor');
    const user = await createUser(t.ds, org, ['installer']);
    const login = await t
      .request()
      .post('/api/auth/login')
      .send({ email: user.email, password: TEST_PASSWORD });
    expect(login.status).toBe(200);
    expect(login.body.user).toMatchObject({
      email: user.email,
      roles: ['installer'],
      organization: { id: org.id, kind: 'contractor' },
    });
    expect(login.body.user.passwordHash).toBeUndefined();
    const cookie = sessionCookie(login)!;
    expect(cookie).toBeTruthy();
    const setCookie = String(login.headers['set-cookie']);
    expect(setCookie).toMatch(/HttpOnly/i);
    expect(setCookie).toMatch(/SameSite=Lax/i);

    const me = await t.request().get('/api/auth/me').set('Cookie', cookie);
    expect(me.status).toBe(200);
    expect(me.body.user.id).toBe(user.id);

    const out = await t.request().post('/api/auth/logout').set('Cookie', cookie);
    expect(out.status).toBe(204);
    const after = await t.request().get('/api/auth/me').set('Cookie', cookie);
    expect(after.status).toBe(401);
    expect(after.body.error.code).toBe('auth.required');

    const audit = await t.ds
      .getRepository(AuditEvent)
      .findOneBy({ entityId: user.id, action: 'user.signed_in' });
    expect(audit).not.toBeNull();
  });

  it('gives a new session id at every sign-in (no fixation)', async () => {
    const org = await createOrganization(t.ds, 'manufacturer');
    const user = await createUser(t.ds, org, ['reviewer']);
    const agent = t.request();
    const first = await agent.post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD });
    const second = await agent.post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD });
    const a = sessionCookie(first);
    const b = sessionCookie(second);
    expect(a && b).toBeTruthy();
    expect(a).not.toBe(b);
    // The first session is gone from the store: its cookie no longer signs anyone in.
    expect((await t.request().get('/api/auth/me').set('Cookie', a!)).status).toBe(401);
    expect((await t.request().get('/api/auth/me').set('Cookie', b!)).status).toBe(200);
  });

  it('answers an unknown e-mail exactly like a wrong password', async () => {
    const org = await createOrganization(t.ds, 'contractor');
    const user = await createUser(t.ds, org, ['installer']);
    const wrong = await t
      .request()
      .post('/api/auth/login')
      .send({ email: user.email, password: 'not the password' });
    const unknown = await t
      .request()
      .post('/api/auth/login')
      .send({ email: 'nobody-here@example.test', password: 'whatever' });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(unknown.body).toEqual(wrong.body);
  });

  it('limits sign-ins per account and address: the 6th try in 15 minutes is a 429, even with the right password', async () => {
    const org = await createOrganization(t.ds, 'contractor');
    const user = await createUser(t.ds, org, ['installer']);
    for (let i = 0; i < LOGIN_LIMITS.accountAddress.points; i++) {
      const r = await t
        .request()
        .post('/api/auth/login')
        .send({ email: user.email, password: `wrong-${i}` });
      expect(r.status).toBe(401);
    }
    const limited = await t
      .request()
      .post('/api/auth/login')
      .send({ email: user.email, password: TEST_PASSWORD });
    expect(limited.status).toBe(429);
    expect(limited.body.error.code).toBe('auth.too_many_attempts');
    const retryAfter = Number(limited.headers['retry-after']);
    expect(retryAfter).toBeGreaterThan(0);
    expect(retryAfter).toBeLessThanOrEqual(15 * 60);
    // An operator's unlock (or a password reset) clears the account's counters.
    await forgetLoginFailures(user.email);
    const ok = await t.request().post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD });
    expect(ok.status).toBe(200);
  });

  it('limits failed sign-ins per address across accounts', async () => {
    for (let i = 0; i < LOGIN_LIMITS.address.points; i++) {
      await t
        .request()
        .post('/api/auth/login')
        .send({ email: `spray-${i}@example.test`, password: 'guess' });
    }
    const org = await createOrganization(t.ds, 'contractor');
    const user = await createUser(t.ds, org, ['installer']);
    const r = await t.request().post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD });
    expect(r.status).toBe(429);
  });

  it('refuses disabled and invited accounts', async () => {
    const org = await createOrganization(t.ds, 'contractor');
    const disabled = await createUser(t.ds, org, ['installer'], { status: 'disabled' });
    const r = await t
      .request()
      .post('/api/auth/login')
      .send({ email: disabled.email, password: TEST_PASSWORD });
    expect(r.status).toBe(401);
  });

  it('ends a session idle for more than 30 minutes, and any session after 8 hours', async () => {
    const org = await createOrganization(t.ds, 'contractor');
    const user = await createUser(t.ds, org, ['installer']);
    const agent = t.request();
    await agent.post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD });
    clock.advance(29 * 60 * 1000);
    expect((await agent.get('/api/auth/me')).status).toBe(200);
    clock.advance(31 * 60 * 1000);
    const idle = await agent.get('/api/auth/me');
    expect(idle.status).toBe(401);
    expect(idle.body.error.code).toBe('auth.session_expired');

    clock.reset();
    const busy = t.request();
    await busy.post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD });
    for (let h = 0; h < 16; h++) {
      clock.advance(29 * 60 * 1000); // active all day, never idle for 30 minutes
      expect((await busy.get('/api/auth/me')).status).toBe(200);
    }
    clock.advance(29 * 60 * 1000); // 8 h 13 min after sign-in
    expect((await busy.get('/api/auth/me')).status).toBe(401);
  });

  it('writes the session row at most once a minute while the session is in use, not on every request', async () => {
    const org = await createOrganization(t.ds, 'contractor');
    const user = await createUser(t.ds, org, ['installer']);
    const agent = t.request();
    const login = await agent.post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD });
    const sid = decodeURIComponent(sessionCookie(login)!.split('=')[1]).replace(/^s:/, '').split('.')[0];
    const row = async () =>
      (
        (await t.ds.query('SELECT data, expires FROM sessions WHERE session_id = ?', [sid])) as {
          data: string;
          expires: number;
        }[]
      )[0];
    const signedIn = await row();
    for (let i = 0; i < 5; i++) {
      const r = await agent.get('/api/auth/me');
      expect(r.status).toBe(200);
      expect(r.headers['set-cookie']).toBeUndefined(); // nothing changed, nothing to send
      clock.advance(10 * 1000);
    }
    expect(await row()).toEqual(signedIn);
    clock.advance(15 * 1000); // 65 s after sign-in: the last activity is recorded again
    const later = await agent.get('/api/auth/me');
    expect(later.status).toBe(200);
    expect(later.headers['set-cookie']?.[0]).toMatch(/^lp\.sid=.*Expires=/i);
    const moved = await row();
    expect(JSON.parse(moved.data).lastSeenAt).toBeGreaterThanOrEqual(
      JSON.parse(signedIn.data).lastSeenAt + 65_000,
    );
    clock.reset();
  });
});

describe('the demo accounts', () => {
  it('each signs in and /me tells its role and organisation kind', async () => {
    await seedDemo(t.ds, {
      onlyIfEmpty: false,
      credits: { storage: createStorage(t.config), config: t.config },
    });
    for (const account of DEMO_ACCOUNTS) {
      const agent = t.request();
      const login = await agent
        .post('/api/auth/login')
        .send({ email: account.email, password: DEMO_PASSWORD });
      expect(login.status, account.email).toBe(200);
      const me = await agent.get('/api/auth/me');
      const org = DEMO_ORGANIZATIONS.find((o) => o.key === account.org)!;
      expect(me.body.user).toMatchObject({
        email: account.email,
        roles: account.roles,
        organization: { name: org.name, kind: org.kind, timeZone: org.timeZone, locale: org.locale },
      });
    }
  }, 120_000); // loading the whole demo (its letters and memos too) on a busy machine
});

describe('the API spine', () => {
  it('answers 401 without a session on every protected route', async () => {
    for (const [method, path] of [
      ['get', '/api/auth/me'],
      ['get', '/api/users'],
      ['post', '/api/users/invitations'],
      ['patch', '/api/users/00000000-0000-4000-8000-000000000000'],
    ] as const) {
      const r = await t.request()[method](path).send({});
      expect(r.status, `${method} ${path}`).toBe(401);
      expect(r.body.error.code).toBe('auth.required');
    }
  });

  it('answers health without a session', async () => {
    const r = await t.request().get('/api/health');
    expect(r.status).toBe(200);
    expect(r.body).toEqual({ ok: true, db: 'up' });
  });

  it('refuses a state-changing request from a foreign origin or marked cross-site with 403', async () => {
    const org = await createOrganization(t.ds, 'contractor');
    const user = await createUser(t.ds, org, ['installer']);
    const foreign = await t
      .request()
      .post('/api/auth/login')
      .set('Origin', 'https://evil.example')
      .send({ email: user.email, password: TEST_PASSWORD });
    expect(foreign.status).toBe(403);
    expect(foreign.body.error.code).toBe('request.cross_origin');
    const crossSite = await t
      .request()
      .post('/api/auth/login')
      .set('Sec-Fetch-Site', 'cross-site')
      .send({ email: user.email, password: TEST_PASSWORD });
    expect(crossSite.status).toBe(403);
    // The same request with our own origin, or from a script with neither header, works.
    const own = await t
      .request()
      .post('/api/auth/login')
      .set('Origin', 'http://127.0.0.1:3000')
      .send({ email: user.email, password: TEST_PASSWORD });
    expect(own.status).toBe(200);
    const script = await t
      .request()
      .post('/api/auth/login')
      .send({ email: user.email, password: TEST_PASSWORD });
    expect(script.status).toBe(200);
  });

  it('answers malformed JSON with 400 and the error shape, never a 500 or a stack', async () => {
    const r = await t
      .request()
      .post('/api/auth/login')
      .set('Content-Type', 'application/json')
      .send('{"email": "a@b.test", ');
    expect(r.status).toBe(400);
    expect(r.body).toEqual({ error: { code: 'request.malformed_json', message: expect.any(String) } });
    expect(JSON.stringify(r.body)).not.toMatch(/at .*\.ts:\d+/);
  });

  it('lists each bad field with its path on invalid input', async () => {
    const r = await t
      .request()
      .post('/api/auth/login')
      .send({ email: 'not-an-email', password: '', extra: 1 });
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('validation.failed');
    const paths = r.body.error.details.map((d: { path: string }) => d.path);
    expect(paths).toEqual(expect.arrayContaining(['email', 'password']));
  });

  it('refuses a body that is not JSON with 415, and a huge one with 413', async () => {
    const form = await t.request().post('/api/auth/login').type('form').send('email=a@b.test&password=x');
    expect(form.status).toBe(415);
    const huge = await t
      .request()
      .post('/api/auth/login')
      .send({ email: 'a@b.test', password: 'x'.repeat(600_000) });
    expect(huge.status).toBe(413);
  });

  it('sends security headers, errors included', async () => {
    for (const path of ['/api/health', '/api/auth/me', '/api/nowhere']) {
      const r = await t.request().get(path);
      expect(r.headers['content-security-policy']).toContain("default-src 'self'");
      expect(r.headers['content-security-policy']).toContain("frame-ancestors 'none'");
      expect(r.headers['x-content-type-options']).toBe('nosniff');
      expect(r.headers['x-powered-by']).toBeUndefined();
      expect(r.headers['x-request-id']).toMatch(/^[0-9a-f-]{36}$/);
    }
  });
});
