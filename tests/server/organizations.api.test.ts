import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { Organization } from '../../server/db/entities/organization.entity';
import { createOrganization, createUser, signIn } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));

const zoneOf = async (id: string) =>
  (await t.ds.getRepository(Organization).findOneByOrFail({ id })).timeZone;

describe("the organisation's time zone and locale", () => {
  it('starts at UTC and en-US, and every member sees it in /me', async () => {
    const org = await createOrganization(t.ds, 'contractor');
    const installer = await createUser(t.ds, org, ['installer']);
    const agent = await signIn(t.request(), installer.email);
    const me = await agent.get('/api/auth/me');
    expect(me.body.user.organization).toMatchObject({ id: org.id, timeZone: 'UTC', locale: 'en-US' });
    const r = await agent.get('/api/organization');
    expect(r.status).toBe(200);
    expect(r.body.organization).toEqual({
      id: org.id,
      name: org.name,
      kind: 'contractor',
      timeZone: 'UTC',
      locale: 'en-US',
    });
  });

  it('lets its administrator set them, audits the change, and the next request sees it', async () => {
    const org = await createOrganization(t.ds, 'manufacturer');
    const admin = await createUser(t.ds, org, ['administrator']);
    const agent = await signIn(t.request(), admin.email);
    const r = await agent.patch('/api/organization').send({ timeZone: 'America/Chicago', locale: 'en-CA' });
    expect(r.status).toBe(200);
    expect(r.body.organization).toMatchObject({ timeZone: 'America/Chicago', locale: 'en-CA' });
    const row = await t.ds.getRepository(Organization).findOneByOrFail({ id: org.id });
    expect([row.timeZone, row.locale]).toEqual(['America/Chicago', 'en-CA']);
    const me = await agent.get('/api/auth/me');
    expect(me.body.user.organization).toMatchObject({ timeZone: 'America/Chicago', locale: 'en-CA' });
    const audit = await t.ds
      .getRepository(AuditEvent)
      .findOneByOrFail({ entityId: org.id, action: 'organization.updated' });
    expect(audit.after).toEqual({ timeZone: 'America/Chicago', locale: 'en-CA' });
  });

  it('refuses an unknown zone or locale with a clear error and changes nothing', async () => {
    const org = await createOrganization(t.ds, 'contractor');
    const admin = await createUser(t.ds, org, ['administrator']);
    const agent = await signIn(t.request(), admin.email);
    for (const body of [{ timeZone: 'Mars/Olympus_Mons' }, { locale: 'not a locale' }, {}, { name: 'x' }]) {
      const r = await agent.patch('/api/organization').send(body);
      expect(r.status, JSON.stringify(body)).toBe(400);
      expect(r.body.error.code).toBe('validation.failed');
    }
    expect(await zoneOf(org.id)).toBe('UTC');
  });

  it('refuses members who are not administrators with 403 and changes nothing', async () => {
    const org = await createOrganization(t.ds, 'manufacturer');
    const reviewer = await createUser(t.ds, org, ['reviewer']);
    const agent = await signIn(t.request(), reviewer.email);
    const r = await agent.patch('/api/organization').send({ timeZone: 'Europe/Berlin' });
    expect(r.status).toBe(403);
    expect(await zoneOf(org.id)).toBe('UTC');
  });
});
