import type supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Claim } from '../../server/db/entities/claim.entity';
import type { Organization } from '../../server/db/entities/organization.entity';
import { claimSearch } from '../../server/lib/claim-search';
import { createOrganization, createUser, signIn } from '../support/factories';
import { createClaimAt, createReviewWorld, type ReviewWorld } from '../support/review-factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// The claims' free-text search (server/lib/claim-search.ts), through both lists that offer it: the review queue
// (GET /api/review/queue) and the claims list (GET /api/claims). Number, serials, site, contractor, product and
// narrative are found; `%` and `_` are characters, not wildcards; another organisation's claims are never found.

let t: TestContext;
let manufacturer: Organization;
let contractor: Organization;
let worldA: ReviewWorld;
let worldB: ReviewWorld;
let a: Claim;
let b: Claim;
let foreign: Claim;
let rival: Claim;
let asReviewer: supertest.Agent;
let asInstaller: supertest.Agent;

const stamp = Date.now().toString(36).toUpperCase();

async function setText(claim: Claim, narrative: string, serials: string[]) {
  // Straight SQL, as any later edit would be: the triggers keep the search text.
  await t.ds.query('UPDATE claims SET narrative = ?, serials = ? WHERE id = ?', [
    narrative,
    JSON.stringify(serials),
    claim.id,
  ]);
}

beforeAll(async () => {
  t = await createTestApp();
  manufacturer = await createOrganization(t.ds, 'manufacturer');
  const otherManufacturer = await createOrganization(t.ds, 'manufacturer');
  contractor = await createOrganization(t.ds, 'contractor', `Quillfeather Electric ${stamp}`);
  const otherContractor = await createOrganization(t.ds, 'contractor', `Brindle Wiring ${stamp}`);
  worldA = await createReviewWorld(t.ds, contractor, manufacturer);
  worldB = await createReviewWorld(t.ds, contractor, manufacturer);
  const worldForeign = await createReviewWorld(t.ds, contractor, otherManufacturer);
  const worldRival = await createReviewWorld(t.ds, otherContractor, manufacturer);
  a = await createClaimAt(t.ds, worldA, 'in_review');
  b = await createClaimAt(t.ds, worldB, 'filed');
  foreign = await createClaimAt(t.ds, worldForeign, 'filed');
  rival = await createClaimAt(t.ds, worldRival, 'filed');
  await t.ds.query('UPDATE installations SET site_name = ?, site_city = ? WHERE id = ?', [
    `Pier 9 Cold Store ${stamp}`,
    'Saltmarsh',
    worldA.installation.id,
  ]);
  await t.ds.query('UPDATE installations SET site_name = ? WHERE id = ?', [
    `Harbor Annex ${stamp}`,
    worldB.installation.id,
  ]);
  await setText(a, `Driver hums at 50% dimming; the lens_cover cracked. ${stamp}`, [
    `AX-77_12-${stamp}`,
    `BQ-4410-${stamp}`,
  ]);
  await setText(b, `Flicker after 5000 hours; lensXcover yellowed. ${stamp}`, [`AX-77312-${stamp}`]);
  // The same words on claims of another manufacturer, and of another contractor.
  await setText(foreign, `Driver hums at 50% dimming; the lens_cover cracked. ${stamp}`, [
    `AX-77_12-${stamp}`,
  ]);
  await setText(rival, `Driver hums at 50% dimming; the lens_cover cracked. ${stamp}`, [`AX-77_12-${stamp}`]);
  const reviewer = await createUser(t.ds, manufacturer, ['reviewer']);
  const installer = await createUser(t.ds, contractor, ['installer']);
  asReviewer = await signIn(t.request(), reviewer.email);
  asInstaller = await signIn(t.request(), installer.email);
});
afterAll(() => closeTestApp(t));

async function queue(q: string) {
  const res = await asReviewer.get('/api/review/queue').query({ q, pageSize: 100 }).expect(200);
  expect(res.body.total).toBe(res.body.items.length);
  return (res.body.items as { id: string }[]).map((x) => x.id).sort();
}
async function list(agent: supertest.Agent, q: string) {
  const res = await agent.get('/api/claims').query({ q, pageSize: 100 }).expect(200);
  expect(res.body.total).toBe(res.body.items.length);
  return (res.body.items as { id: string }[]).map((x) => x.id).sort();
}
const ids = (...claims: Claim[]) => claims.map((c) => c.id).sort();

describe('claim search', () => {
  it('finds a claim by its whole number, in any case and spacing, and by part of it', async () => {
    expect(await queue(a.number!)).toEqual(ids(a));
    expect(await queue(a.number!.toLowerCase().replace(/-/g, ' '))).toEqual(ids(a));
    // "LP-2506-7K4" (month and first group): the claims of that number's first part, a among them.
    const prefix = a.number!.slice(0, 11);
    expect(await queue(prefix)).toContain(a.id);
    expect(await list(asInstaller, a.number!)).toEqual(ids(a));
  });

  it('finds a claim by a serial, whole or in part', async () => {
    expect(await queue(`BQ-4410-${stamp}`)).toEqual(ids(a));
    expect(await queue('bq-4410')).toEqual(ids(a));
    expect(await list(asInstaller, `AX-77312-${stamp}`)).toEqual(ids(b));
  });

  it('takes % and _ literally', async () => {
    // As LIKE wildcards, "50%" would also match b's "5000 hours" and "AX-77_12" b's "AX-77312".
    expect(await queue(`50% ${stamp}`)).toEqual(ids(a, rival));
    expect(await queue(`AX-77_12-${stamp}`)).toEqual(ids(a, rival));
    expect(await queue(`lens_cover ${stamp}`)).toEqual(ids(a, rival));
    expect(await list(asInstaller, `50% ${stamp}`)).toEqual(ids(a, foreign));
    expect(await queue(`% ${stamp}`)).toEqual(ids(a, rival));
    expect(await queue('_%_%_')).toEqual([]);
  });

  it('finds a claim by its site (name or city), contractor, product and narrative', async () => {
    expect(await queue(`cold store ${stamp}`)).toEqual(ids(a));
    expect(await queue(`Pier 9 ${stamp}`)).toEqual(ids(a));
    expect(await queue(`Saltmarsh ${stamp}`)).toEqual(ids(a));
    expect(await queue(`Harbor Annex ${stamp}`)).toEqual(ids(b));
    expect(await queue(`Brindle Wiring ${stamp}`)).toEqual(ids(rival));
    expect(await queue(`Quillfeather ${stamp}`)).toEqual(ids(a, b));
    expect(await queue(`${worldA.product.modelNumber} ${stamp}`)).toEqual(ids(a));
    expect(await queue(`flicker ${stamp}`)).toEqual(ids(b));
    expect(await queue(`flick ${stamp}`)).toEqual(ids(b));
    expect(await list(asInstaller, `yellowed ${stamp}`)).toEqual(ids(b));
    // Every term must be there: one claim has "flicker", the other "Cold Store".
    expect(await queue(`flicker cold ${stamp}`)).toEqual([]);
  });

  it("follows a renamed site and contractor, and never finds another organisation's claims", async () => {
    await t.ds.query('UPDATE installations SET site_name = ? WHERE id = ?', [
      `Gantry Works ${stamp}`,
      worldB.installation.id,
    ]);
    expect(await queue(`Gantry Works ${stamp}`)).toEqual(ids(b));
    expect(await queue(`Harbor Annex ${stamp}`)).toEqual([]);
    await t.ds.query('UPDATE organizations SET name = ? WHERE id = ?', [
      `Quillfeather Lighting ${stamp}`,
      contractor.id,
    ]);
    expect(await queue(`Quillfeather Lighting ${stamp}`)).toEqual(ids(a, b));
    // foreign (another manufacturer's) and rival (another contractor's) hold the same words as a.
    expect(await queue(`AX-77_12-${stamp}`)).not.toContain(foreign.id);
    expect(await list(asInstaller, `AX-77_12-${stamp}`)).toEqual(ids(a, foreign));
    expect(await list(asInstaller, `Brindle ${stamp}`)).toEqual([]);
  });

  it('leaves every word out of the index query that the index cannot hold, and checks every term as typed', () => {
    expect(claimSearch('  ')).toBeNull();
    expect(claimSearch('LP 7K')).toEqual({
      sql: '(LOCATE(?, c.search_text) > 0 AND LOCATE(?, c.search_text) > 0)',
      params: ['LP', '7K'],
    });
    // A word with a digit narrows on its own (a serial, a site's number); the other words are checked as typed.
    expect(claimSearch('Pier 4321 store')).toEqual({
      sql: '(MATCH(c.search_text) AGAINST (? IN BOOLEAN MODE) AND LOCATE(?, c.search_text) > 0 AND LOCATE(?, c.search_text) > 0 AND LOCATE(?, c.search_text) > 0)',
      params: ['+4321*', 'Pier', '4321', 'store'],
    });
    expect(claimSearch("O'Neil 50% lens_cover")).toEqual({
      sql: '(MATCH(c.search_text) AGAINST (? IN BOOLEAN MODE) AND LOCATE(?, c.search_text) > 0 AND LOCATE(?, c.search_text) > 0 AND LOCATE(?, c.search_text) > 0)',
      params: ['+lens_cover*', "O'Neil", '50%', 'lens_cover'],
    });
  });
});
