import type supertest from 'supertest';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { hashRecoveryCode, totpCode } from '../../server/auth/totp';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { Organization } from '../../server/db/entities/organization.entity';
import { RecoveryCode } from '../../server/db/entities/recovery-code.entity';
import { SignInChallenge } from '../../server/db/entities/sign-in-challenge.entity';
import { User } from '../../server/db/entities/user.entity';
import { clock } from '../../server/lib/clock';
import type { Role } from '../../shared/roles';
import { createOrganization, createUser, sessionCookie, signIn, TEST_PASSWORD } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// Second factor (issue 13): enrolment with a QR code and recovery codes, the sign-in step, its guess limit and
// replay refusal, the requirement by role and by organisation (enforced by the server), removal and reset.

let t: TestContext;
/** The same database with SECOND_FACTOR_FOR_ROLES on, as production mode has it. */
let strict: TestContext;
beforeAll(async () => {
  t = await createTestApp();
  strict = await createTestApp({ SECOND_FACTOR_FOR_ROLES: 'true' });
});
afterAll(async () => {
  await closeTestApp(t);
  await closeTestApp(strict);
});
afterEach(() => clock.reset());

const audits = (userId: string, action: string) =>
  t.ds.getRepository(AuditEvent).findBy({ entityId: userId, action });
const fresh = (id: string) => t.ds.getRepository(User).findOneByOrFail({ id });

async function person(kind: 'contractor' | 'manufacturer', roles: Role[], org?: Organization) {
  const o = org ?? (await createOrganization(t.ds, kind));
  const user = await createUser(t.ds, o, roles);
  return { org: o, user };
}

/** Enrols a signed-in agent; returns the secret and the recovery codes. */
async function enrol(agent: supertest.Agent) {
  const start = await agent.post('/api/auth/second-factor/enrollment').send({});
  expect(start.status).toBe(200);
  const secret = start.body.secret as string;
  const done = await agent
    .post('/api/auth/second-factor/enrollment/confirm')
    .send({ code: await totpCode(secret, clock.nowMs()) });
  expect(done.status).toBe(200);
  return { secret, recoveryCodes: done.body.recoveryCodes as string[] };
}

/** An enrolled user, with the clock moved on a step so that a new code is not a replay of the enrolment's. */
async function enrolled(
  ctx = t,
  roles: Role[] = ['installer'],
  kind: 'contractor' | 'manufacturer' = 'contractor',
) {
  const { user, org } = await person(kind, roles);
  const agent = await signIn(ctx.request(), user.email);
  const { secret, recoveryCodes } = await enrol(agent);
  clock.advance(30_000);
  return { user, org, secret, recoveryCodes, agent };
}

describe('enrolment', () => {
  it('gives a secret and a QR code, confirms with a code, then shows ten recovery codes once, stored hashed', async () => {
    const { user } = await person('contractor', ['installer']);
    const agent = await signIn(t.request(), user.email);

    const before = await agent.get('/api/auth/second-factor');
    expect(before.body).toEqual({ enrolled: false, required: false, recoveryCodesLeft: 0 });

    const start = await agent.post('/api/auth/second-factor/enrollment').send({});
    expect(start.status).toBe(200);
    expect(start.body.secret).toMatch(/^[A-Z2-7]{32}$/); // 20 bytes in base32 (RFC 4648 section 6)
    expect(start.body.otpauthUrl).toMatch(/^otpauth:\/\/totp\/Lumenproof:/);
    expect(start.body.otpauthUrl).toContain(`secret=${start.body.secret}`);
    expect(start.body.qrSvg).toMatch(/^<svg[\s\S]*<\/svg>\s*$/);
    // Nothing is stored until a code confirms the secret.
    expect((await fresh(user.id)).totpSecret).toBeNull();

    const wrong = await agent.post('/api/auth/second-factor/enrollment/confirm').send({ code: '000000' });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.code).toBe('auth.second_factor_invalid_code');
    expect((await fresh(user.id)).totpConfirmedAt).toBeNull();

    const bad = await agent.post('/api/auth/second-factor/enrollment/confirm').send({ code: 'abc' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.code).toBe('validation.failed');

    const ok = await agent
      .post('/api/auth/second-factor/enrollment/confirm')
      .send({ code: await totpCode(start.body.secret, clock.nowMs()) });
    expect(ok.status).toBe(200);
    const codes = ok.body.recoveryCodes as string[];
    expect(codes).toHaveLength(10);
    expect(new Set(codes).size).toBe(10);

    const stored = await t.ds.getRepository(RecoveryCode).findBy({ userId: user.id });
    expect(stored).toHaveLength(10);
    expect(stored.map((r) => r.codeHash).sort()).toEqual(codes.map(hashRecoveryCode).sort());
    expect(JSON.stringify(stored)).not.toContain(codes[0]);
    const u = await fresh(user.id);
    expect(u.totpSecret).toBe(start.body.secret);
    expect(u.totpConfirmedAt).not.toBeNull();
    expect(await audits(user.id, 'user.second_factor_added')).toHaveLength(1);

    const after = await agent.get('/api/auth/second-factor');
    expect(after.body).toEqual({ enrolled: true, required: false, recoveryCodesLeft: 10 });
    // A second enrolment while one is active is refused: remove the factor first.
    const again = await agent.post('/api/auth/second-factor/enrollment').send({});
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('auth.second_factor_exists');
  });

  it('refuses to confirm without an enrolment started', async () => {
    const { user } = await person('contractor', ['installer']);
    const agent = await signIn(t.request(), user.email);
    const r = await agent.post('/api/auth/second-factor/enrollment/confirm').send({ code: '123456' });
    expect(r.status).toBe(409);
    expect(r.body.error.code).toBe('auth.enrollment_not_started');
  });
});

describe('signing in with a second factor', () => {
  it('keeps the contract for users without one: the password signs in', async () => {
    const { user } = await person('contractor', ['installer']);
    const r = await t.request().post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD });
    expect(r.status).toBe(200);
    expect(r.body.user.id).toBe(user.id);
    expect(r.body.secondFactor).toBeUndefined();
  });

  it('asks for a code after the password; the code completes the sign-in; a replayed code is refused', async () => {
    const { user, secret } = await enrolled();
    const agent = t.request();
    const first = await agent.post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD });
    expect(first.status).toBe(200);
    expect(first.body).toEqual({ secondFactor: 'required' });
    expect((await agent.get('/api/auth/me')).status).toBe(401);
    const signedInBefore = (await audits(user.id, 'user.signed_in')).length;

    const code = await totpCode(secret, clock.nowMs());
    const done = await agent.post('/api/auth/login/second-factor').send({ code });
    expect(done.status).toBe(200);
    expect(done.body.user.id).toBe(user.id);
    expect((await agent.get('/api/auth/me')).status).toBe(200);
    expect(await audits(user.id, 'user.signed_in')).toHaveLength(signedInBefore + 1);
    expect(await t.ds.getRepository(SignInChallenge).countBy({ userId: user.id })).toBe(0);

    // The same code again, within its window, from another sign-in: refused (RFC 6238 section 5.2).
    const other = t.request();
    await other.post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD });
    const replay = await other.post('/api/auth/login/second-factor').send({ code });
    expect(replay.status).toBe(401);
    expect(replay.body.error.code).toBe('auth.second_factor_invalid_code');
    expect((await other.get('/api/auth/me')).status).toBe(401);
  });

  it('answers 401 when no sign-in is waiting for a code', async () => {
    const r = await t.request().post('/api/auth/login/second-factor').send({ code: '123456' });
    expect(r.status).toBe(401);
    expect(r.body.error.code).toBe('auth.second_factor_not_pending');
  });

  it('allows five wrong codes per pending sign-in, then the sign-in starts over', async () => {
    const { user, secret } = await enrolled();
    const agent = t.request();
    await agent.post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD });
    for (let i = 0; i < 5; i++) {
      const r = await agent.post('/api/auth/login/second-factor').send({ code: '000000' });
      expect(r.status).toBe(401);
      expect(r.body.error.code).toBe('auth.second_factor_invalid_code');
    }
    // Each wrong code is a failed sign-in in the audit log (the security events page shows them).
    const failures = await audits(user.id, 'user.sign_in_failed');
    expect(failures).toHaveLength(5);
    expect(failures.map((f) => f.after)).toContainEqual(
      expect.objectContaining({ reason: 'second_factor', attempt: 5 }),
    );
    const right = await agent
      .post('/api/auth/login/second-factor')
      .send({ code: await totpCode(secret, clock.nowMs()) });
    expect(right.status).toBe(401);
    expect(right.body.error.code).toBe('auth.second_factor_not_pending');
    expect((await agent.get('/api/auth/me')).status).toBe(401);

    // Starting over with the password gives five more tries.
    await agent.post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD });
    const ok = await agent
      .post('/api/auth/login/second-factor')
      .send({ code: await totpCode(secret, clock.nowMs()) });
    expect(ok.status).toBe(200);
  });

  it('counts parallel guesses atomically: at most five are judged', async () => {
    const { user } = await enrolled();
    const login = await t
      .request()
      .post('/api/auth/login')
      .send({ email: user.email, password: TEST_PASSWORD });
    const cookie = sessionCookie(login)!;
    const guesses = await Promise.all(
      Array.from({ length: 20 }, (_, i) =>
        t
          .request()
          .post('/api/auth/login/second-factor')
          .set('Cookie', cookie)
          .send({ code: String(100000 + i) }),
      ),
    );
    const judged = guesses.filter((g) => g.body.error?.code === 'auth.second_factor_invalid_code');
    expect(judged.length).toBeLessThanOrEqual(5);
    expect(guesses.every((g) => g.status === 401)).toBe(true);
  });

  it('takes each recovery code once', async () => {
    const { user, recoveryCodes } = await enrolled();
    const a = t.request();
    await a.post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD });
    const ok = await a.post('/api/auth/login/second-factor').send({ code: recoveryCodes[3].toUpperCase() });
    expect(ok.status).toBe(200);
    expect(await audits(user.id, 'user.recovery_code_used')).toHaveLength(1);
    expect((await a.get('/api/auth/second-factor')).body.recoveryCodesLeft).toBe(9);

    const b = t.request();
    await b.post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD });
    const again = await b.post('/api/auth/login/second-factor').send({ code: recoveryCodes[3] });
    expect(again.status).toBe(401);
    expect(again.body.error.code).toBe('auth.second_factor_invalid_code');
  });
});

describe('required second factor', () => {
  it('holds accountants and administrators of manufacturers at enrolment until they enrol (server-side)', async () => {
    const { user } = await person('manufacturer', ['accountant']);
    const agent = strict.request();
    const login = await agent.post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD });
    expect(login.status).toBe(200);
    expect(login.body.user.id).toBe(user.id);

    const me = await agent.get('/api/auth/me');
    expect(me.status).toBe(200);
    expect(me.body.secondFactor).toEqual({ enrolled: false, required: true });
    const blocked = await agent.get('/api/credits');
    expect(blocked.status).toBe(403);
    expect(blocked.body.error.code).toBe('auth.second_factor_enrollment_required');
    expect((await agent.get('/api/claims')).status).toBe(403);

    await enrol(agent);
    expect((await agent.get('/api/credits')).status).toBe(200);
    // Required for them: they cannot remove it.
    const remove = await agent.delete('/api/auth/second-factor').send({ password: TEST_PASSWORD });
    expect(remove.status).toBe(403);
    expect(remove.body.error.code).toBe('auth.second_factor_required');
    expect((await fresh(user.id)).totpConfirmedAt).not.toBeNull();
  });

  it('leaves it optional for the other roles', async () => {
    const { user } = await person('manufacturer', ['reviewer']);
    const agent = await signIn(strict.request(), user.email);
    expect((await agent.get('/api/auth/me')).body.secondFactor).toEqual({ enrolled: false, required: false });
    expect((await agent.get('/api/claims')).status).toBe(200);
  });

  it('is required for everyone once an administrator requires it for the organisation', async () => {
    const { org, user: admin } = await person('contractor', ['administrator']);
    const installer = await createUser(t.ds, org, ['installer']);
    const adminAgent = await signIn(t.request(), admin.email);
    const installerAgent = await signIn(t.request(), installer.email);
    expect((await installerAgent.get('/api/claims')).status).toBe(200);

    // Not for an installer to decide. (No id in the path: an administrator reaches only their own organisation.)
    const denied = await installerAgent
      .patch('/api/organizations/current/security')
      .send({ requireSecondFactor: true });
    expect(denied.status).toBe(403);
    const invalid = await adminAgent
      .patch('/api/organizations/current/security')
      .send({ requireSecondFactor: 'yes' });
    expect(invalid.status).toBe(400);
    expect((await t.ds.getRepository(Organization).findOneByOrFail({ id: org.id })).requireSecondFactor).toBe(
      false,
    );

    const read = await installerAgent.get('/api/organizations/current/security');
    expect(read.body.organization).toEqual({ id: org.id, requireSecondFactor: false });
    const set = await adminAgent
      .patch('/api/organizations/current/security')
      .send({ requireSecondFactor: true });
    expect(set.status).toBe(200);
    expect(set.body.organization).toMatchObject({ id: org.id, requireSecondFactor: true });
    const audit = await t.ds
      .getRepository(AuditEvent)
      .findBy({ entityId: org.id, action: 'organization.second_factor_policy_changed' });
    expect(audit).toHaveLength(1);

    // In demo mode too: the organisation's own rule applies everywhere.
    const blocked = await installerAgent.get('/api/claims');
    expect(blocked.status).toBe(403);
    expect(blocked.body.error.code).toBe('auth.second_factor_enrollment_required');
    // The administrator who set it is held too until they enrol.
    expect((await adminAgent.get('/api/users')).status).toBe(403);
  });
});

describe('removing and resetting a factor', () => {
  it("removes one's own factor with the password, and not without it", async () => {
    const { user, agent } = await enrolled();
    const wrong = await agent.delete('/api/auth/second-factor').send({ password: 'not the password' });
    expect(wrong.status).toBe(403);
    expect(wrong.body.error.code).toBe('auth.invalid_password');
    expect((await fresh(user.id)).totpConfirmedAt).not.toBeNull();

    const ok = await agent.delete('/api/auth/second-factor').send({ password: TEST_PASSWORD });
    expect(ok.status).toBe(204);
    const u = await fresh(user.id);
    expect(u.totpSecret).toBeNull();
    expect(u.totpConfirmedAt).toBeNull();
    expect(await t.ds.getRepository(RecoveryCode).countBy({ userId: user.id })).toBe(0);
    expect(await audits(user.id, 'user.second_factor_removed')).toHaveLength(1);
    // The password alone signs in again.
    const login = await t
      .request()
      .post('/api/auth/login')
      .send({ email: user.email, password: TEST_PASSWORD });
    expect(login.body.user.id).toBe(user.id);
  });

  it("lets an administrator reset a colleague's factor (audited), not another organisation's", async () => {
    const { user, org } = await enrolled();
    const admin = await createUser(t.ds, org, ['administrator']);
    const adminAgent = await signIn(t.request(), admin.email);
    const colleague = await createUser(t.ds, org, ['installer']);
    const colleagueAgent = await signIn(t.request(), colleague.email);

    expect((await colleagueAgent.post(`/api/users/${user.id}/second-factor/reset`).send({})).status).toBe(
      404,
    );
    const other = await person('contractor', ['administrator']);
    const foreign = await (
      await signIn(t.request(), other.user.email)
    )
      .post(`/api/users/${user.id}/second-factor/reset`)
      .send({});
    expect(foreign.status).toBe(404);
    expect((await fresh(user.id)).totpConfirmedAt).not.toBeNull();
    const self = await adminAgent.post(`/api/users/${admin.id}/second-factor/reset`).send({});
    expect(self.status).toBe(409);
    expect(self.body.error.code).toBe('user.second_factor_self_reset');

    const ok = await adminAgent.post(`/api/users/${user.id}/second-factor/reset`).send({});
    expect(ok.status).toBe(204);
    expect((await fresh(user.id)).totpSecret).toBeNull();
    expect(await t.ds.getRepository(RecoveryCode).countBy({ userId: user.id })).toBe(0);
    const [audit] = await audits(user.id, 'user.second_factor_reset');
    expect(audit).toMatchObject({ actorUserId: admin.id, organizationId: org.id });
  });
});
