import http from 'node:http';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { createOrganization, createUser, signIn } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// The sessions page (issue 13): one's own signed-in sessions with device, address and times; ending one, or all
// the others. Sessions live in MariaDB (express-mysql-session), so ending one deletes its row.

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));

const FIREFOX_ANDROID = 'Mozilla/5.0 (Android 14; Mobile; rv:128.0) Gecko/128.0 Firefox/128.0';
const CHROME_WINDOWS =
  'Mozilla/5.0 (Windows NT 10.0; Win64; x64) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/131.0.0.0 Safari/537.36';

async function member() {
  const org = await createOrganization(t.ds, 'contractor');
  return createUser(t.ds, org, ['installer']);
}
const signedIn = async (email: string, ua: string) => signIn(t.request().set('User-Agent', ua), email);

describe('sessions', () => {
  it("lists one's own sessions with device, address and times, this one first and marked", async () => {
    const user = await member();
    const phone = await signedIn(user.email, FIREFOX_ANDROID);
    const desk = await signedIn(user.email, CHROME_WINDOWS);
    const stranger = await member();
    await signedIn(stranger.email, CHROME_WINDOWS);

    const r = await desk.get('/api/auth/sessions');
    expect(r.status).toBe(200);
    expect(r.body.items).toHaveLength(2);
    const [mine, other] = r.body.items;
    expect(mine).toMatchObject({ current: true, device: 'Chrome 131 on Windows 10' });
    expect(other).toMatchObject({ current: false, device: 'Firefox 128 on Android' });
    for (const s of r.body.items) {
      expect(s.id).toMatch(/^[0-9a-f]{32}$/);
      expect(s.ip).toMatch(/127\.0\.0\.1/);
      expect(Date.parse(s.signedInAt)).not.toBeNaN();
      expect(Date.parse(s.lastSeenAt)).not.toBeNaN();
    }
    // The cookie's session id never leaves the server.
    expect(JSON.stringify(r.body)).not.toContain('s:');
    expect((await phone.get('/api/auth/me')).status).toBe(200);
  });

  it("ends a single other session, and only one of one's own", async () => {
    const user = await member();
    const phone = await signedIn(user.email, FIREFOX_ANDROID);
    const desk = await signedIn(user.email, CHROME_WINDOWS);
    const list = (await desk.get('/api/auth/sessions')).body.items as { id: string; current: boolean }[];
    const phoneId = list.find((s) => !s.current)!.id;
    const deskId = list.find((s) => s.current)!.id;

    // Another person cannot end it: not theirs, so not found.
    const stranger = await signedIn((await member()).email, CHROME_WINDOWS);
    expect((await stranger.delete(`/api/auth/sessions/${phoneId}`)).status).toBe(404);
    expect((await phone.get('/api/auth/me')).status).toBe(200);
    // This session is ended by signing out, not here.
    const self = await desk.delete(`/api/auth/sessions/${deskId}`);
    expect(self.status).toBe(409);
    expect(self.body.error.code).toBe('session.current');

    const r = await desk.delete(`/api/auth/sessions/${phoneId}`);
    expect(r.status).toBe(204);
    expect((await phone.get('/api/auth/me')).status).toBe(401);
    expect((await desk.get('/api/auth/me')).status).toBe(200);
    expect((await desk.delete(`/api/auth/sessions/${phoneId}`)).status).toBe(404);
    expect((await desk.delete('/api/auth/sessions/not-an-id')).status).toBe(404);
  });

  it('signs out everywhere else, audited', async () => {
    const user = await member();
    const a = await signedIn(user.email, FIREFOX_ANDROID);
    const b = await signedIn(user.email, FIREFOX_ANDROID);
    const keep = await signedIn(user.email, CHROME_WINDOWS);
    const colleague = await member();
    const theirs = await signedIn(colleague.email, CHROME_WINDOWS);

    const r = await keep.post('/api/auth/sessions/sign-out-others').send({});
    expect(r.status).toBe(200);
    expect(r.body).toEqual({ ended: 2 });
    expect((await a.get('/api/auth/me')).status).toBe(401);
    expect((await b.get('/api/auth/me')).status).toBe(401);
    expect((await keep.get('/api/auth/me')).status).toBe(200);
    expect((await theirs.get('/api/auth/me')).status).toBe(200);
    expect((await keep.get('/api/auth/sessions')).body.items).toHaveLength(1);
    const audit = await t.ds
      .getRepository(AuditEvent)
      .findBy({ entityId: user.id, action: 'user.sessions_ended' });
    expect(audit).toHaveLength(1);
    expect(audit[0].after).toMatchObject({ ended: 2 });
  });

  it('answers a signed-in request in one write, the session kept as it was', async () => {
    // express-session holds back an answer's last byte for a store that has a touch, and writes it once the touch
    // has answered: two writes (and two packets) for every signed-in answer. Our store has no touch
    // (server/auth/session.ts), so the answer goes out whole from res.end.
    const user = await member();
    const agent = await signedIn(user.email, CHROME_WINDOWS);
    const write = vi.spyOn(http.ServerResponse.prototype, 'write');
    try {
      const me = await agent.get('/api/auth/me');
      expect(me.status).toBe(200);
      expect(me.body.user.email).toBe(user.email);
      expect(write).not.toHaveBeenCalled();
    } finally {
      write.mockRestore();
    }
    expect((await agent.get('/api/auth/sessions')).status).toBe(200);
  });

  it('answers 401 without a session', async () => {
    expect((await t.request().get('/api/auth/sessions')).status).toBe(401);
    expect((await t.request().post('/api/auth/sessions/sign-out-others').send({})).status).toBe(401);
  });
});
