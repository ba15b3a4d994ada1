import crypto from 'node:crypto';
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest';
import { verifyPassword } from '../../server/auth/passwords';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { Invitation } from '../../server/db/entities/invitation.entity';
import { OutboxMessage } from '../../server/db/entities/outbox-message.entity';
import { User } from '../../server/db/entities/user.entity';
import { clock } from '../../server/lib/clock';
import { hashToken } from '../../server/modules/users/users.service';
import { createOrganization, createUser, signIn, TEST_PASSWORD } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// Issue 13: password recovery by e-mail and password change.

const NEW_PASSWORD = 'amber lamps over the loading dock';
// On @zxcvbn-ts/language-common's list of commonly used passwords, and 12 characters long.
const COMMON_PASSWORD = 'qwerty123456';

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));
beforeEach(async () => {
  // The forgot-password limits count per client address, and every request here comes from 127.0.0.1.
  await t.ds.query('DELETE FROM password_reset_requests');
});
afterEach(() => clock.reset());

async function member() {
  const org = await createOrganization(t.ds, 'contractor');
  return createUser(t.ds, org, ['installer']);
}

const forgot = (email: string) => t.request().post('/api/auth/password/forgot').send({ email });
const reset = (token: string, password: string) =>
  t.request().post('/api/auth/password/reset').send({ token, password });

/** The reset link's token from the e-mail queued for this address (the link is sent after the answer). */
async function tokenMailedTo(email: string): Promise<string> {
  return vi.waitFor(
    async () => {
      const mail = await t.ds
        .getRepository(OutboxMessage)
        .findOne({ where: { to: email, template: 'password-reset' }, order: { createdAt: 'DESC' } });
      if (!mail) throw new Error(`no reset e-mail to ${email} yet`);
      return /\/reset-password\/([A-Za-z0-9_-]+)/.exec(mail.text)![1];
    },
    { timeout: 5000, interval: 50 },
  );
}

const hashOf = async (id: string) =>
  (await t.ds.getRepository(User).findOne({ where: { id }, select: { passwordHash: true } }))!.passwordHash;
const audits = (userId: string) =>
  t.ds
    .getRepository(AuditEvent)
    .find({ where: { entityId: userId }, order: { occurredAt: 'ASC' } })
    .then((rows) => rows.map((r) => r.action));

describe('forgot password', () => {
  it('answers an unknown address exactly like a known one, and mails a link only to the known one', async () => {
    const user = await member();
    const known = await forgot(user.email);
    const unknown = await forgot(`nobody-${crypto.randomBytes(4).toString('hex')}@example.test`);
    expect(known.status).toBe(202);
    expect(unknown.status).toBe(known.status);
    expect(unknown.body).toEqual(known.body);
    expect(known.body.message).toMatch(/If this address belongs to an active account/);

    const token = await tokenMailedTo(user.email);
    // Only the token's SHA-256 is stored.
    const [row] = await t.ds.query('SELECT token_hash, expires_at FROM password_resets WHERE user_id = ?', [
      user.id,
    ]);
    expect(row.token_hash).toBe(hashToken(token));
    expect(row.token_hash).not.toContain(token);
    expect(Buffer.from(token, 'base64url')).toHaveLength(32);
    expect(new Date(row.expires_at).getTime() - clock.nowMs()).toBeGreaterThan(29 * 60_000);
    expect(new Date(row.expires_at).getTime() - clock.nowMs()).toBeLessThanOrEqual(30 * 60_000);
    expect(await audits(user.id)).toContain('user.password_reset_requested');
  });

  it('mails nothing to a disabled or invited account', async () => {
    const org = await createOrganization(t.ds, 'contractor');
    const disabled = await createUser(t.ds, org, ['installer'], { status: 'disabled' });
    const invited = await createUser(t.ds, org, ['installer'], { status: 'invited' });
    expect((await forgot(disabled.email)).status).toBe(202);
    expect((await forgot(invited.email)).status).toBe(202);
    await new Promise((r) => setTimeout(r, 300));
    const sent = await t.ds
      .getRepository(OutboxMessage)
      .countBy([{ to: disabled.email }, { to: invited.email }]);
    expect(sent).toBe(0);
  });

  it('refuses a malformed address with a 400 naming the field', async () => {
    const res = await forgot('not an address');
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toBe('email');
  });

  it('limits requests per e-mail address (3 an hour), known or not, and per client address (20 an hour)', async () => {
    const user = await member();
    for (let i = 0; i < 3; i++) expect((await forgot(user.email)).status).toBe(202);
    const limited = await forgot(user.email);
    expect(limited.status).toBe(429);
    expect(limited.body.error.code).toBe('auth.too_many_resets');
    expect(limited.headers['retry-after']).toBe('3600');
    const stranger = `nobody-${crypto.randomBytes(4).toString('hex')}@example.test`;
    for (let i = 0; i < 3; i++) expect((await forgot(stranger)).status).toBe(202);
    expect((await forgot(stranger)).status).toBe(429);
    // An hour later the address may ask again.
    clock.advance(61 * 60_000);
    expect((await forgot(user.email)).status).toBe(202);
    // Per client address: 20 an hour whatever the e-mail.
    await t.ds.query('DELETE FROM password_reset_requests');
    for (let i = 0; i < 20; i++) expect((await forgot(`many-${i}-${stranger}`)).status).toBe(202);
    expect((await forgot(`one-more-${stranger}`)).status).toBe(429);
  });

  it('counts requests sent at once: no more than the limit get through', async () => {
    const user = await member();
    const answers = await Promise.all(Array.from({ length: 10 }, () => forgot(user.email)));
    expect(answers.filter((a) => a.status === 202).length).toBeLessThanOrEqual(3);
    expect(answers.every((a) => a.status === 202 || a.status === 429)).toBe(true);
  });
});

describe('reset password', () => {
  it('sets the new password, ends every session of the user, and works once', async () => {
    const user = await member();
    const phone = await signIn(t.request(), user.email);
    const laptop = await signIn(t.request(), user.email);
    expect((await phone.get('/api/auth/me')).status).toBe(200);
    const before = await hashOf(user.id);

    await forgot(user.email);
    const token = await tokenMailedTo(user.email);
    const done = await reset(token, NEW_PASSWORD);
    expect(done.status).toBe(200);
    expect(done.body).toEqual({ ok: true, email: user.email });

    expect((await phone.get('/api/auth/me')).status).toBe(401);
    expect((await laptop.get('/api/auth/me')).status).toBe(401);
    expect(await verifyPassword(await hashOf(user.id), NEW_PASSWORD)).toBe(true);
    expect(await verifyPassword(await hashOf(user.id), TEST_PASSWORD)).toBe(false);
    await signIn(t.request(), user.email, NEW_PASSWORD);

    // Single use: the same link again changes nothing.
    const again = await reset(token, 'another sentence for a password');
    expect(again.status).toBe(404);
    expect(again.body.error.code).toBe('password_reset.invalid');
    expect(await verifyPassword(await hashOf(user.id), NEW_PASSWORD)).toBe(true);
    expect(before).not.toBe(await hashOf(user.id));
    expect(await audits(user.id)).toEqual(
      expect.arrayContaining(['user.password_reset_requested', 'user.password_reset']),
    );
    const notice = await t.ds
      .getRepository(OutboxMessage)
      .findOneBy({ to: user.email, template: 'password-changed' });
    expect(notice).not.toBeNull();
  });

  it('expires the link after 30 minutes (still good at 29)', async () => {
    const a = await member();
    const b = await member();
    await forgot(a.email);
    await forgot(b.email);
    const tokenA = await tokenMailedTo(a.email);
    const tokenB = await tokenMailedTo(b.email);
    clock.advance(29 * 60_000);
    expect((await reset(tokenA, NEW_PASSWORD)).status).toBe(200);
    clock.advance(1 * 60_000 + 1);
    const late = await reset(tokenB, NEW_PASSWORD);
    expect(late.status).toBe(404);
    expect(late.body.error.code).toBe('password_reset.invalid');
    expect(await verifyPassword(await hashOf(b.id), TEST_PASSWORD)).toBe(true);
  });

  it('refuses a made-up token like a spent one', async () => {
    const res = await reset(crypto.randomBytes(32).toString('base64url'), NEW_PASSWORD);
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('password_reset.invalid');
  });

  it('refuses a common or short password, keeping the link usable', async () => {
    const user = await member();
    await forgot(user.email);
    const token = await tokenMailedTo(user.email);
    const common = await reset(token, COMMON_PASSWORD);
    expect(common.status).toBe(400);
    expect(common.body.error.details).toEqual([
      { path: 'password', message: expect.stringMatching(/commonly used passwords/) },
    ]);
    const short = await reset(token, 'short pass');
    expect(short.status).toBe(400);
    expect(short.body.error.details[0]).toMatchObject({
      path: 'password',
      message: 'Use at least 12 characters.',
    });
    expect(await verifyPassword(await hashOf(user.id), TEST_PASSWORD)).toBe(true);
    expect((await reset(token, NEW_PASSWORD)).status).toBe(200);
  });
});

describe('change password', () => {
  it('needs the current password; ends the other sessions and keeps this one', async () => {
    const user = await member();
    const here = await signIn(t.request(), user.email);
    const elsewhere = await signIn(t.request(), user.email);

    const wrong = await here
      .post('/api/auth/password/change')
      .send({ currentPassword: 'not my password', newPassword: NEW_PASSWORD });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.code).toBe('auth.wrong_password');
    expect(wrong.body.error.details[0].path).toBe('currentPassword');
    expect(await verifyPassword(await hashOf(user.id), TEST_PASSWORD)).toBe(true);
    expect((await elsewhere.get('/api/auth/me')).status).toBe(200);

    const ok = await here
      .post('/api/auth/password/change')
      .send({ currentPassword: TEST_PASSWORD, newPassword: NEW_PASSWORD });
    expect(ok.status).toBe(200);
    expect((await here.get('/api/auth/me')).status).toBe(200);
    expect((await elsewhere.get('/api/auth/me')).status).toBe(401);
    expect(await verifyPassword(await hashOf(user.id), NEW_PASSWORD)).toBe(true);
    expect(await audits(user.id)).toContain('user.password_changed');
  });

  it('refuses a common password, and one made of the e-mail address', async () => {
    const user = await member();
    const agent = await signIn(t.request(), user.email);
    const common = await agent
      .post('/api/auth/password/change')
      .send({ currentPassword: TEST_PASSWORD, newPassword: COMMON_PASSWORD.toUpperCase() });
    expect(common.status).toBe(400);
    expect(common.body.error.details).toEqual([
      { path: 'newPassword', message: expect.stringMatching(/commonly used passwords/) },
    ]);
    const mine = await agent
      .post('/api/auth/password/change')
      .send({ currentPassword: TEST_PASSWORD, newPassword: `${user.email}!` });
    expect(mine.status).toBe(400);
    expect(mine.body.error.details[0].path).toBe('newPassword');
    expect(await verifyPassword(await hashOf(user.id), TEST_PASSWORD)).toBe(true);
  });

  it('needs a session', async () => {
    const res = await t
      .request()
      .post('/api/auth/password/change')
      .send({ currentPassword: TEST_PASSWORD, newPassword: NEW_PASSWORD });
    expect(res.status).toBe(401);
  });
});

describe('accepting an invitation', () => {
  it('uses the same password rules', async () => {
    const org = await createOrganization(t.ds, 'contractor');
    const admin = await createUser(t.ds, org, ['administrator']);
    const invited = await createUser(t.ds, org, ['installer'], { status: 'invited' });
    const token = crypto.randomBytes(32).toString('base64url');
    await t.ds.getRepository(Invitation).insert({
      userId: invited.id,
      tokenHash: hashToken(token),
      expiresAt: new Date(Date.now() + 86_400_000),
      usedAt: null,
      createdById: admin.id,
    });
    const common = await t
      .request()
      .post(`/api/invitations/${token}/accept`)
      .send({ password: COMMON_PASSWORD });
    expect(common.status).toBe(400);
    expect(common.body.error.details[0]).toMatchObject({ path: 'password' });
    expect((await t.ds.getRepository(User).findOneByOrFail({ id: invited.id })).status).toBe('invited');
    const ok = await t.request().post(`/api/invitations/${token}/accept`).send({ password: NEW_PASSWORD });
    expect(ok.status).toBe(200);
  });
});
