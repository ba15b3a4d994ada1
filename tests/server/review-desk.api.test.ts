import type supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Organization } from '../../server/db/entities/organization.entity';
import type { User } from '../../server/db/entities/user.entity';
import { createOrganization, createUser, signIn } from '../support/factories';
import { createClaimAt, createReviewWorld } from '../support/review-factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// The names behind the review desk's pickers: GET /api/review/contractors (the queue's contractor filter) and
// GET /api/review/reviewers (whom the review screen can hand a claim to).

let t: TestContext;
let manufacturer: Organization;
let filing: Organization;
let draftOnly: Organization;
let elsewhere: Organization;
let reviewer: User;
let colleague: User;
let disabled: User;
let accountant: User;
let foreignReviewer: User;
let asReviewer: supertest.Agent;
let asAdmin: supertest.Agent;

beforeAll(async () => {
  t = await createTestApp();
  manufacturer = await createOrganization(t.ds, 'manufacturer');
  const other = await createOrganization(t.ds, 'manufacturer');
  filing = await createOrganization(t.ds, 'contractor', `Aa Desk Electric ${Date.now()}`);
  draftOnly = await createOrganization(t.ds, 'contractor');
  elsewhere = await createOrganization(t.ds, 'contractor');
  await createClaimAt(t.ds, await createReviewWorld(t.ds, filing, manufacturer), 'filed');
  await createClaimAt(t.ds, await createReviewWorld(t.ds, draftOnly, manufacturer), 'draft');
  await createClaimAt(t.ds, await createReviewWorld(t.ds, elsewhere, other), 'in_review');
  reviewer = await createUser(t.ds, manufacturer, ['reviewer'], { name: 'Desk Reviewer B' });
  colleague = await createUser(t.ds, manufacturer, ['reviewer', 'accountant'], { name: 'Desk Reviewer A' });
  disabled = await createUser(t.ds, manufacturer, ['reviewer'], { status: 'disabled' });
  accountant = await createUser(t.ds, manufacturer, ['accountant']);
  foreignReviewer = await createUser(t.ds, other, ['reviewer']);
  const admin = await createUser(t.ds, manufacturer, ['administrator']);
  asReviewer = await signIn(t.request(), reviewer.email);
  asAdmin = await signIn(t.request(), admin.email);
});
afterAll(() => closeTestApp(t));

describe('GET /api/review/contractors', () => {
  it('names only the contractors with filed claims on this manufacturer, for its reviewers and administrators', async () => {
    for (const agent of [asReviewer, asAdmin]) {
      const res = await agent.get('/api/review/contractors').expect(200);
      expect(res.body).toEqual({ items: [{ id: filing.id, name: filing.name }], more: false });
    }
    const found = await asReviewer.get('/api/review/contractors').query({ q: 'Desk Electric' }).expect(200);
    expect(found.body.items.map((o: { id: string }) => o.id)).toEqual([filing.id]);
    const none = await asReviewer
      .get('/api/review/contractors')
      .query({ q: 'no such contractor' })
      .expect(200);
    expect(none.body.items).toEqual([]);
  });

  it('refuses an unknown parameter, and those who do not review', async () => {
    const bad = await asReviewer
      .get('/api/review/contractors')
      .query({ manufacturerId: elsewhere.id })
      .expect(400);
    expect(bad.body.error.code).toBe('validation.failed');
    await (await signIn(t.request(), accountant.email)).get('/api/review/contractors').expect(403);
    const installer = await createUser(t.ds, filing, ['installer', 'administrator']);
    await (await signIn(t.request(), installer.email)).get('/api/review/contractors').expect(403);
  });
});

describe('GET /api/review/reviewers', () => {
  it("lists the active reviewers of the reviewer's own manufacturer, by name, with id and name only", async () => {
    const res = await asReviewer.get('/api/review/reviewers').expect(200);
    expect(res.body).toEqual({
      items: [
        { id: colleague.id, name: 'Desk Reviewer A' },
        { id: reviewer.id, name: 'Desk Reviewer B' },
      ],
    });
    const ids = res.body.items.map((u: { id: string }) => u.id);
    expect(ids).not.toContain(disabled.id);
    expect(ids).not.toContain(accountant.id);
    expect(ids).not.toContain(foreignReviewer.id);
  });

  it('refuses a parameter, and anyone who cannot assign claims', async () => {
    await asReviewer.get('/api/review/reviewers').query({ organizationId: manufacturer.id }).expect(400);
    await asAdmin.get('/api/review/reviewers').expect(403);
    await (await signIn(t.request(), accountant.email)).get('/api/review/reviewers').expect(403);
    await t.request().get('/api/review/reviewers').expect(401);
  });
});

describe('GET /api/review/queue', () => {
  it('runs the session read and one statement whatever the page size, and never shows a draft or another manufacturer', async () => {
    const w = await createReviewWorld(t.ds, filing, manufacturer);
    for (let i = 0; i < 3; i++) await createClaimAt(t.ds, w, 'in_review');
    // Signed in just now, so that no request here is the once-a-minute write of the session's last activity.
    const agent = await signIn(t.request(), reviewer.email);
    const small = await t.countQueries(() => agent.get('/api/review/queue?pageSize=1'));
    const large = await t.countQueries(() => agent.get('/api/review/queue?pageSize=50'));
    expect(large.result.status).toBe(200);
    // The session with its user and organisation (one statement), then the page carrying its total.
    expect(small.counter.count).toBe(1 + 1);
    expect(large.counter.count).toBe(1 + 1);
    expect(small.result.body.total).toBe(4);
    const items = large.result.body.items as { stage: string; contractor: { id: string } }[];
    expect(large.result.body.total).toBe(4);
    expect(items.map((x) => x.stage).sort()).toEqual(['filed', 'in_review', 'in_review', 'in_review']);
    expect(items.every((x) => x.contractor.id === filing.id)).toBe(true);
    // Past the last page: no row carries the total, which is then counted on its own.
    const past = await t.countQueries(() => agent.get('/api/review/queue?pageSize=2&page=3'));
    expect(past.result.body).toMatchObject({ items: [], total: 4 });
    expect(past.counter.count).toBe(1 + 2);
  });
});
