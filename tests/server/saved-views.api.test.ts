import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SavedView } from '../../server/db/entities/saved-view.entity';
import { MAX_SAVED_VIEWS } from '../../shared/schemas/saved-views';
import { createOrganization, createUser, signIn } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));

async function reviewer() {
  const org = await createOrganization(t.ds, 'manufacturer');
  const user = await createUser(t.ds, org, ['reviewer']);
  return { org, user, agent: await signIn(t.request(), user.email) };
}
const viewsOf = (userId: string) => t.ds.getRepository(SavedView).findBy({ userId });
const mine = { name: 'My open, oldest first', filters: { assignee: 'me', sort: 'stageChangedAt' } };

describe('saved review-desk views', () => {
  it('keeps a view per person on the server and lists only their own', async () => {
    const a = await reviewer();
    const colleague = await createUser(t.ds, a.org, ['reviewer']);
    const b = await signIn(t.request(), colleague.email);
    const r = await a.agent.post('/api/saved-views').send(mine);
    expect(r.status).toBe(201);
    expect(r.body.view).toMatchObject(mine);
    expect((await a.agent.get('/api/saved-views')).body.items.map((v: { name: string }) => v.name)).toEqual([
      mine.name,
    ]);
    expect((await b.get('/api/saved-views')).body.items).toEqual([]);
    const rows = await viewsOf(a.user.id);
    expect(rows.map((v) => [v.name, v.filters])).toEqual([[mine.name, mine.filters]]);
  });

  it('refuses a taken name, bad filters and too many views, changing nothing', async () => {
    const a = await reviewer();
    expect((await a.agent.post('/api/saved-views').send(mine)).status).toBe(201);
    const again = await a.agent.post('/api/saved-views').send({ ...mine, name: mine.name.toUpperCase() });
    expect([again.status, again.body.error.code]).toEqual([409, 'saved_view.name_taken']);
    for (const filters of [{ sort: 'sideways' }, { minAmount: 'lots' }, { stage: 'a;b' }, { extra: 1 }]) {
      const r = await a.agent.post('/api/saved-views').send({ name: 'Bad', filters });
      expect(r.status, JSON.stringify(filters)).toBe(400);
    }
    expect(await viewsOf(a.user.id)).toHaveLength(1);
    for (let i = 1; i < MAX_SAVED_VIEWS; i++)
      await t.ds.getRepository(SavedView).save({ userId: a.user.id, name: `v${i}`, filters: {} });
    const over = await a.agent.post('/api/saved-views').send({ name: 'One more', filters: {} });
    expect([over.status, over.body.error.code]).toEqual([409, 'saved_view.too_many']);
    expect(await viewsOf(a.user.id)).toHaveLength(MAX_SAVED_VIEWS);
  });

  it("deletes one's own view; a colleague's is a 404 like a missing one and stays", async () => {
    const a = await reviewer();
    const colleague = await createUser(t.ds, a.org, ['reviewer']);
    const b = await signIn(t.request(), colleague.email);
    const id = (await a.agent.post('/api/saved-views').send(mine)).body.view.id;
    const theirs = await b.delete(`/api/saved-views/${id}`);
    const missing = await b.delete('/api/saved-views/00000000-0000-4000-8000-000000000000');
    expect(theirs.status).toBe(404);
    expect(theirs.body).toEqual(missing.body);
    expect(await viewsOf(a.user.id)).toHaveLength(1);
    expect((await a.agent.delete(`/api/saved-views/${id}`)).status).toBe(204);
    expect(await viewsOf(a.user.id)).toHaveLength(0);
  });

  it('is for reviewers: an installer gets 403', async () => {
    const org = await createOrganization(t.ds, 'contractor');
    const installer = await createUser(t.ds, org, ['installer']);
    const agent = await signIn(t.request(), installer.email);
    expect((await agent.get('/api/saved-views')).status).toBe(403);
    expect((await agent.post('/api/saved-views').send(mine)).status).toBe(403);
    expect(await viewsOf(installer.id)).toHaveLength(0);
  });
});
