import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { Organization } from '../../server/db/entities/organization.entity';
import { In } from 'typeorm';
import { OutboxMessage } from '../../server/db/entities/outbox-message.entity';
import { claimWorld, createDraft, daysAgo, goodClaimFields } from '../support/claim-factories';
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
    const r = await agent.get('/api/organizations/current');
    expect(r.status).toBe(200);
    expect(r.body.organization).toEqual({
      id: org.id,
      name: org.name,
      kind: 'contractor',
      timeZone: 'UTC',
      locale: 'en-US',
      creditSecondApprovalAbove: null,
    });
  });

  it('lets its administrator set them, audits the change, and the next request sees it', async () => {
    const org = await createOrganization(t.ds, 'manufacturer');
    const admin = await createUser(t.ds, org, ['administrator']);
    const agent = await signIn(t.request(), admin.email);
    const r = await agent
      .patch('/api/organizations/current')
      .send({ timeZone: 'America/Chicago', locale: 'en-CA' });
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
      const r = await agent.patch('/api/organizations/current').send(body);
      expect(r.status, JSON.stringify(body)).toBe(400);
      expect(r.body.error.code).toBe('validation.failed');
    }
    expect(await zoneOf(org.id)).toBe('UTC');
  });

  it("refuses a contractor's second-approval amount whole: the zone sent with it is not changed", async () => {
    const org = await createOrganization(t.ds, 'contractor');
    const admin = await createUser(t.ds, org, ['administrator']);
    const agent = await signIn(t.request(), admin.email);
    const r = await agent
      .patch('/api/organizations/current')
      .send({ timeZone: 'Europe/Berlin', creditSecondApprovalAbove: '5000.00' });
    expect(r.status).toBe(403);
    const row = await t.ds.getRepository(Organization).findOneByOrFail({ id: org.id });
    expect([row.timeZone, row.creditSecondApprovalAbove]).toEqual(['UTC', null]);
  });

  it('sets the zone and the second-approval amount in one request, each audited under its own action', async () => {
    const org = await createOrganization(t.ds, 'manufacturer');
    const admin = await createUser(t.ds, org, ['administrator']);
    const agent = await signIn(t.request(), admin.email);
    const r = await agent
      .patch('/api/organizations/current')
      .send({ timeZone: 'America/Denver', creditSecondApprovalAbove: '2500' });
    expect(r.status).toBe(200);
    expect(r.body.organization).toMatchObject({
      timeZone: 'America/Denver',
      creditSecondApprovalAbove: '2500.00',
    });
    const actions = (await t.ds.getRepository(AuditEvent).findBy({ entityId: org.id })).map((a) => a.action);
    expect(actions.sort()).toEqual(['organization.settings_changed', 'organization.updated']);
  });

  it('refuses members who are not administrators with 403 and changes nothing', async () => {
    const org = await createOrganization(t.ds, 'manufacturer');
    const reviewer = await createUser(t.ds, org, ['reviewer']);
    const agent = await signIn(t.request(), reviewer.email);
    const r = await agent.patch('/api/organizations/current').send({ timeZone: 'Europe/Berlin' });
    expect(r.status).toBe(403);
    expect(await zoneOf(org.id)).toBe('UTC');
  });
});

const MONTHS = 'January February March April May June July August September October November December'.split(
  ' ',
);

describe('e-mails write dates for their recipient', () => {
  it("gives each side the failure date in its own organisation's locale, never a day off", async () => {
    const w = await claimWorld(t);
    await t.ds
      .getRepository(Organization)
      .update({ id: w.mfrA.id }, { locale: 'en-GB', timeZone: 'Pacific/Kiritimati' });
    await t.ds.getRepository(Organization).update({ id: w.conX.id }, { timeZone: 'Pacific/Honolulu' });
    const failedOn = daysAgo(10);
    const draft = await createDraft(
      w.installer.agent,
      w.installation.id,
      goodClaimFields(w.installation.serials[0], { failedOn }),
    );
    expect((await w.installer.agent.post(`/api/claims/${draft.id}/file`).send({})).status).toBe(200);
    const [y, m, d] = failedOn.split('-').map(Number);
    const mails = await t.ds
      .getRepository(OutboxMessage)
      .find({ where: { to: In([w.reviewer.user.email, w.installer.user.email]) } });
    const byTemplate = Object.fromEntries(mails.map((x) => [x.template, x.text]));
    // CLDR long dates: en-GB "d MMMM y", en (US) "MMMM d, y"; the zones (UTC+14, UTC-10) must not move the day
    expect(byTemplate['claim-filed-manufacturer']).toContain(`Failed on: ${d} ${MONTHS[m - 1]} ${y}`);
    expect(byTemplate['claim-filed-confirmation']).toContain(`Failed on: ${MONTHS[m - 1]} ${d}, ${y}`);
  });
});
