import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { clock } from '../../server/lib/clock';
import { SECURITY_EVENT_ACTIONS } from '../../shared/schemas/security';
import { createOrganization, createUser, signIn } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// The security events page (issue 13): the organisation's sign-ins, failures, lockouts, resets, factor and role
// changes, for its administrators only, newest first, paged, filtered by person and kind.

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));

async function world() {
  const org = await createOrganization(t.ds, 'manufacturer');
  const admin = await createUser(t.ds, org, ['administrator']);
  const reviewer = await createUser(t.ds, org, ['reviewer']);
  const adminAgent = await signIn(t.request(), admin.email);
  return { org, admin, reviewer, adminAgent };
}

describe('security events', () => {
  it("lists the organisation's security events newest first, with who and from where", async () => {
    const { org, admin, reviewer, adminAgent } = await world();
    clock.advance(1000);
    await signIn(t.request(), reviewer.email);
    clock.advance(1000);
    // A role change is a security event; a rename is not.
    expect(
      (await adminAgent.patch(`/api/users/${reviewer.id}`).send({ roles: ['reviewer', 'accountant'] }))
        .status,
    ).toBe(200);
    clock.advance(1000);
    expect(
      (await adminAgent.patch(`/api/users/${reviewer.id}`).send({ name: 'Renamed Person' })).status,
    ).toBe(200);
    // What the other branches write (sign-in failures, lockouts, resets) shows too.
    await t.ds.getRepository(AuditEvent).insert({
      occurredAt: new Date(clock.nowMs() + 1000),
      actorUserId: null,
      organizationId: org.id,
      action: 'user.sign_in_failed',
      entityType: 'User',
      entityId: reviewer.id,
      before: null,
      after: { ip: '203.0.113.7' } as never,
      requestId: null,
    });
    // Another organisation's events never show.
    const other = await world();
    await signIn(t.request(), other.reviewer.email);

    const r = await adminAgent.get('/api/security-events');
    clock.reset();
    expect(r.status).toBe(200);
    expect(r.body.total).toBe(4);
    expect(r.body.items.map((e: { action: string }) => e.action)).toEqual([
      'user.sign_in_failed',
      'user.roles_changed',
      'user.signed_in',
      'user.signed_in',
    ]);
    const [failed, roles, signIn2, signIn1] = r.body.items;
    expect(failed).toMatchObject({ subject: { id: reviewer.id, email: reviewer.email }, ip: '203.0.113.7' });
    expect(roles).toMatchObject({ subject: { id: reviewer.id }, actor: { id: admin.id } });
    expect(signIn2.subject.id).toBe(reviewer.id);
    expect(signIn2.actor).toBeNull();
    expect(signIn1.subject.id).toBe(admin.id);
    expect(signIn1.ip).toMatch(/127\.0\.0\.1/);
  });

  it('pages and filters by person and kind', async () => {
    const { admin, reviewer, adminAgent } = await world();
    for (let i = 0; i < 3; i++) await signIn(t.request(), reviewer.email);

    const page = await adminAgent.get('/api/security-events?pageSize=2&page=2');
    expect(page.body).toMatchObject({ total: 4, page: 2, pageSize: 2 });
    expect(page.body.items).toHaveLength(2);

    const byPerson = await adminAgent.get(`/api/security-events?userId=${admin.id}`);
    expect(byPerson.body.total).toBe(1);
    expect(byPerson.body.items[0].subject.id).toBe(admin.id);

    const byKind = await adminAgent.get('/api/security-events?action=user.signed_in');
    expect(byKind.body.total).toBe(4);
    const none = await adminAgent.get('/api/security-events?action=user.locked_out');
    expect(none.body).toMatchObject({ total: 0, items: [] });

    const bad = await adminAgent.get('/api/security-events?action=claim.filed');
    expect(bad.status).toBe(400);
    expect((await adminAgent.get('/api/security-events?userId=nope')).status).toBe(400);
  });

  it('is for administrators only', async () => {
    const { reviewer } = await world();
    const agent = await signIn(t.request(), reviewer.email);
    const r = await agent.get('/api/security-events');
    expect(r.status).toBe(403);
    expect((await t.request().get('/api/security-events')).status).toBe(401);
  });

  it('offers the actions the sign-in and password work writes, so they show once merged', () => {
    for (const action of [
      'user.sign_in_failed',
      'user.locked_out',
      'user.password_reset_requested',
      'user.password_reset',
      'user.password_changed',
      'user.second_factor_added',
      'user.second_factor_removed',
      'user.roles_changed',
    ])
      expect(SECURITY_EVENT_ACTIONS).toContain(action);
  });
});
