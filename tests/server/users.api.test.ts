import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { OutboxMessage } from '../../server/db/entities/outbox-message.entity';
import { User } from '../../server/db/entities/user.entity';
import { createOrganization, createUser, signIn, TEST_PASSWORD } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));

async function adminOf(kind: 'contractor' | 'manufacturer') {
  const org = await createOrganization(t.ds, kind);
  const admin = await createUser(t.ds, org, ['administrator']);
  const agent = await signIn(t.request(), admin.email);
  return { org, admin, agent };
}

describe('administration of users', () => {
  it("lists only the administrator's own organisation", async () => {
    const a = await adminOf('contractor');
    const b = await adminOf('contractor');
    const mine = await createUser(t.ds, a.org, ['installer']);
    await createUser(t.ds, b.org, ['installer']);
    const r = await a.agent.get('/api/users?pageSize=50');
    expect(r.status).toBe(200);
    expect(r.body).toMatchObject({ total: 2, page: 1, pageSize: 50 });
    expect(r.body.items.map((u: { id: string }) => u.id).sort()).toEqual([a.admin.id, mine.id].sort());
    expect(r.body.items[0].passwordHash).toBeUndefined();
  });

  it("answers 404 for another organisation's user, exactly like a missing one, and changes nothing", async () => {
    const a = await adminOf('contractor');
    const b = await adminOf('manufacturer');
    const foreign = await createUser(t.ds, b.org, ['reviewer']);
    const read = await a.agent.get(`/api/users/${foreign.id}`);
    const missing = await a.agent.get('/api/users/00000000-0000-4000-8000-000000000000');
    expect(read.status).toBe(404);
    expect(read.body).toEqual(missing.body);
    const patch = await a.agent.patch(`/api/users/${foreign.id}`).send({ status: 'disabled' });
    expect(patch.status).toBe(404);
    expect((await t.ds.getRepository(User).findOneByOrFail({ id: foreign.id })).status).toBe('active');
  });

  it('refuses people who are not administrators with 403', async () => {
    const org = await createOrganization(t.ds, 'contractor');
    const installer = await createUser(t.ds, org, ['installer']);
    const colleague = await createUser(t.ds, org, ['installer']);
    const agent = await signIn(t.request(), installer.email);
    expect((await agent.get('/api/users')).status).toBe(403);
    expect(
      (
        await agent
          .post('/api/users/invitations')
          .send({ email: 'x@example.test', name: 'X', roles: ['installer'] })
      ).status,
    ).toBe(403);
    // A colleague's record is not theirs to read: 404. Their own record they may read, not promote: 403.
    expect((await agent.patch(`/api/users/${colleague.id}`).send({ roles: ['administrator'] })).status).toBe(
      404,
    );
    expect((await agent.patch(`/api/users/${installer.id}`).send({ roles: ['administrator'] })).status).toBe(
      403,
    );
    expect((await t.ds.getRepository(User).findOneByOrFail({ id: installer.id })).roles).toEqual([
      'installer',
    ]);
    expect((await t.ds.getRepository(User).findOneByOrFail({ id: colleague.id })).roles).toEqual([
      'installer',
    ]);
  });

  it('invites by e-mail with a one-time link that sets the password', async () => {
    const a = await adminOf('manufacturer');
    const email = `new-reviewer-${Date.now()}@example.test`;
    const r = await a.agent
      .post('/api/users/invitations')
      .send({ email: email.toUpperCase(), name: 'Nia Reviewer', roles: ['reviewer'] });
    expect(r.status).toBe(202);
    expect(r.body.invitation).toEqual({ email, name: 'Nia Reviewer', roles: ['reviewer'] });
    const invited = await t.ds.getRepository(User).findOneByOrFail({ email });
    expect(invited).toMatchObject({ status: 'invited', roles: ['reviewer'], organizationId: a.org.id });

    const mail = await t.ds.getRepository(OutboxMessage).findOneByOrFail({ to: email });
    expect(mail.status).toBe('pending');
    const token = /\/invitations\/([A-Za-z0-9_-]+)/.exec(mail.text)![1];

    const info = await t.request().get(`/api/invitations/${token}`);
    expect(info.status).toBe(200);
    expect(info.body.invitation).toMatchObject({ email, organization: { name: a.org.name } });

    const short = await t.request().post(`/api/invitations/${token}/accept`).send({ password: 'short' });
    expect(short.status).toBe(400);
    const accepted = await t
      .request()
      .post(`/api/invitations/${token}/accept`)
      .send({ password: 'a long enough password' });
    expect(accepted.status).toBe(200);
    const again = await t
      .request()
      .post(`/api/invitations/${token}/accept`)
      .send({ password: 'another long password' });
    expect(again.status).toBe(404);

    await signIn(t.request(), email, 'a long enough password');
    const audit = await t.ds
      .getRepository(AuditEvent)
      .find({ where: { entityId: invited.id }, order: { id: 'ASC' } });
    expect(audit.map((e) => e.action)).toEqual(['user.invited', 'user.joined', 'user.signed_in']);
  });

  it('refuses an invitation for an e-mail already in use, and roles that do not fit the organisation', async () => {
    const a = await adminOf('contractor');
    const taken = await a.agent
      .post('/api/users/invitations')
      .send({ email: a.admin.email, name: 'Dup', roles: ['installer'] });
    expect(taken.status).toBe(409);
    expect(taken.body.error.code).toBe('user.email_taken');
    const wrongRole = await a.agent
      .post('/api/users/invitations')
      .send({ email: 'r@example.test', name: 'R', roles: ['reviewer'] });
    expect(wrongRole.status).toBe(400);
    expect(wrongRole.body.error.details[0].path).toBe('roles');
    expect(await t.ds.getRepository(User).existsBy({ email: 'r@example.test' })).toBe(false);
  });

  it('changes roles, with an audit row holding before and after', async () => {
    const a = await adminOf('manufacturer');
    const u = await createUser(t.ds, a.org, ['reviewer']);
    const r = await a.agent.patch(`/api/users/${u.id}`).send({ roles: ['reviewer', 'accountant'] });
    expect(r.status).toBe(200);
    expect(r.body.user.roles).toEqual(['reviewer', 'accountant']);
    const audit = await t.ds
      .getRepository(AuditEvent)
      .findOneByOrFail({ entityId: u.id, action: 'user.updated' });
    expect(audit.before).toMatchObject({ roles: ['reviewer'] });
    expect(audit.after).toMatchObject({ roles: ['reviewer', 'accountant'] });
    expect(audit.actorUserId).toBe(a.admin.id);
  });

  it('keeps an administrator from locking themself out', async () => {
    const a = await adminOf('contractor');
    // Their own roles are another administrator's to change (four eyes), demotion included.
    const demote = await a.agent.patch(`/api/users/${a.admin.id}`).send({ roles: ['installer'] });
    expect(demote.status).toBe(403);
    expect(demote.body.error.code).toBe('user.own_roles');
    expect((await a.agent.patch(`/api/users/${a.admin.id}`).send({ status: 'disabled' })).status).toBe(403);
  });

  it("ends a disabled user's sessions at once", async () => {
    const a = await adminOf('contractor');
    const u = await createUser(t.ds, a.org, ['installer']);
    const theirs = await signIn(t.request(), u.email);
    expect((await theirs.get('/api/auth/me')).status).toBe(200);
    const r = await a.agent.patch(`/api/users/${u.id}`).send({ status: 'disabled' });
    expect(r.status).toBe(200);
    expect((await theirs.get('/api/auth/me')).status).toBe(401);
    expect(
      (await t.request().post('/api/auth/login').send({ email: u.email, password: TEST_PASSWORD })).status,
    ).toBe(401);
    const [{ n }] = await t.ds.query('SELECT COUNT(*) AS n FROM sessions WHERE data LIKE ?', [
      `%"user":"${u.id}"%`,
    ]);
    expect(Number(n)).toBe(0);
  });

  it('rejects unknown fields in the body (strict schemas)', async () => {
    const a = await adminOf('contractor');
    const u = await createUser(t.ds, a.org, ['installer']);
    const r = await a.agent.patch(`/api/users/${u.id}`).send({ roles: ['installer'], organizationId: 'x' });
    expect(r.status).toBe(400);
  });

  it('keeps the audit log append-only in the database itself', async () => {
    const a = await adminOf('contractor');
    const row = await t.ds.getRepository(AuditEvent).findOneByOrFail({ entityId: a.admin.id });
    await expect(
      t.ds.query('UPDATE audit_events SET action = ? WHERE id = ?', ['tampered', row.id]),
    ).rejects.toThrow(/append-only/);
    await expect(t.ds.query('DELETE FROM audit_events WHERE id = ?', [row.id])).rejects.toThrow(
      /append-only/,
    );
  });
});
