import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { Invitation } from '../../server/db/entities/invitation.entity';
import { OutboxMessage } from '../../server/db/entities/outbox-message.entity';
import { User } from '../../server/db/entities/user.entity';
import { createOrganization, createUser, signIn } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// Issue 13, item 7: whether an e-mail address already has an account in another organisation must not show in
// the answer to an invitation. Both answer 202 with the same body; the address's owner gets an e-mail telling them
// instead of an invitation link, and their account is left as it was.
let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));

async function adminOf(kind: 'manufacturer' | 'contractor') {
  const org = await createOrganization(t.ds, kind);
  const admin = await createUser(t.ds, org, ['administrator']);
  return { org, admin, agent: await signIn(t.request(), admin.email) };
}

describe("an invitation to another organisation's address", () => {
  it('answers exactly like an invitation to a new address, and tells the owner by e-mail instead', async () => {
    const a = await adminOf('contractor');
    const elsewhere = await createOrganization(t.ds, 'manufacturer');
    const owner = await createUser(t.ds, elsewhere, ['accountant']);
    const fresh = `fresh-${Date.now()}@example.test`;

    const toNew = await a.agent
      .post('/api/users/invitations')
      .send({ email: fresh, name: 'Ravi', roles: ['installer'] });
    const toTaken = await a.agent
      .post('/api/users/invitations')
      .send({ email: owner.email, name: 'Ravi', roles: ['installer'] });
    expect(toTaken.status).toBe(toNew.status);
    expect(toNew.status).toBe(202);
    const shape = (b: { invitation: Record<string, unknown> }) => ({ ...b.invitation, email: '*' });
    expect(shape(toTaken.body)).toEqual(shape(toNew.body));
    expect(toTaken.body.invitation.email).toBe(owner.email);

    // The owner's account is untouched: same organisation, roles and status, no invitation link for it.
    const after = await t.ds.getRepository(User).findOneByOrFail({ id: owner.id });
    expect(after).toMatchObject({ organizationId: elsewhere.id, roles: ['accountant'], status: 'active' });
    expect(await t.ds.getRepository(Invitation).countBy({ userId: owner.id })).toBe(0);
    // They hear about it, without a link that could move their account.
    const mail = await t.ds.getRepository(OutboxMessage).findOneByOrFail({ to: owner.email });
    expect(mail.text).toContain(a.org.name);
    expect(mail.text).not.toMatch(/\/invitations\//);
    // The inviting organisation's record says an invitation was asked for, not what became of it.
    const audit = await t.ds
      .getRepository(AuditEvent)
      .findBy({ organizationId: a.org.id, action: 'user.invitation_requested' });
    expect(audit.map((e) => (e.after as { email: string }).email).sort()).toEqual(
      [fresh, owner.email].sort(),
    );
  });

  it('still tells an administrator that someone of their own organisation has the address', async () => {
    const a = await adminOf('manufacturer');
    const colleague = await createUser(t.ds, a.org, ['reviewer']);
    const r = await a.agent
      .post('/api/users/invitations')
      .send({ email: colleague.email, name: 'Dup', roles: ['reviewer'] });
    expect(r.status).toBe(409);
    expect(r.body.error.code).toBe('user.email_taken');
  });
});
