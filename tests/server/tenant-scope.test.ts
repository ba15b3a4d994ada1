import { subject } from '@casl/ability';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { defineAbilityFor, type AbilityUser } from '../../shared/abilities';
import type { Role } from '../../shared/roles';
import type { Organization } from '../../server/db/entities/organization.entity';
import { Conditions, readRows } from '../../server/db/read';
import { namedScope, scopeConditions } from '../../server/lib/tenant-scope';
import { createOrganization } from '../support/factories';
import { createClaimAt, createReviewWorld } from '../support/review-factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// The lists' tenant scope comes from the CASL rules (server/lib/tenant-scope.ts). The reference here is CASL
// itself: the rows the SQL selects must be exactly the rows ability.can('read', row) accepts, one by one.

let t: TestContext;
let mfr: Organization;
let otherMfr: Organization;
let contractor: Organization;
let otherContractor: Organization;

const userOf = (org: Organization, roles: Role[]): AbilityUser => ({
  id: '00000000-0000-4000-8000-000000000001',
  roles,
  organization: { id: org.id, kind: org.kind },
});

beforeAll(async () => {
  t = await createTestApp();
  mfr = await createOrganization(t.ds, 'manufacturer');
  otherMfr = await createOrganization(t.ds, 'manufacturer');
  contractor = await createOrganization(t.ds, 'contractor');
  otherContractor = await createOrganization(t.ds, 'contractor');
  for (const [c, m] of [
    [contractor, mfr],
    [contractor, otherMfr],
    [otherContractor, mfr],
  ] as const) {
    const w = await createReviewWorld(t.ds, c, m);
    for (const stage of ['draft', 'filed', 'approved'] as const) await createClaimAt(t.ds, w, stage);
  }
});
afterAll(() => closeTestApp(t));

describe('scopeConditions', () => {
  it('turns the claim rules into SQL: the organisation, and for a manufacturer never a draft', () => {
    const reviewer = defineAbilityFor(userOf(mfr, ['reviewer']));
    expect(scopeConditions(reviewer, 'Claim', 'c')).toEqual({
      sql: '(c.manufacturer_id = ? AND c.stage <> ?)',
      params: [mfr.id, 'draft'],
    });
    const installer = defineAbilityFor(userOf(contractor, ['installer']));
    expect(scopeConditions(installer, 'Claim', 'c')).toEqual({
      sql: 'c.contractor_id = ?',
      params: [contractor.id],
    });
  });

  it('names the parameters for the query builder, a list as a spread', () => {
    expect(
      namedScope({
        sql: '(c.manufacturer_id = ? AND c.stage IN (?))',
        params: ['m1', ['filed', 'approved']],
      }),
    ).toEqual({
      sql: '(c.manufacturer_id = :scope0 AND c.stage IN (:...scope1))',
      params: { scope0: 'm1', scope1: ['filed', 'approved'] },
    });
  });

  it('an unconditional rule is every row; no rule at all is none', () => {
    const reviewer = defineAbilityFor(userOf(mfr, ['reviewer']));
    expect(scopeConditions(reviewer, 'ProductModel', 'p').sql).toBe('1 = 1');
    // A reviewer who is not an accountant may not read credit memos: an empty list, never everything.
    expect(scopeConditions(reviewer, 'CreditMemo', 'cm')).toEqual({ sql: '1 = 0', params: [] });
    expect(scopeConditions(defineAbilityFor(null), 'Claim', 'c').sql).toBe('1 = 0');
  });

  it.each([
    ['a manufacturer reviewer', () => userOf(mfr, ['reviewer'])],
    ['a manufacturer administrator', () => userOf(mfr, ['administrator'])],
    ['another manufacturer accountant', () => userOf(otherMfr, ['accountant'])],
    ['a contractor installer', () => userOf(contractor, ['installer'])],
    ['another contractor administrator', () => userOf(otherContractor, ['administrator'])],
  ])('selects exactly the claims CASL lets %s read', async (_name, who) => {
    const ability = defineAbilityFor(who());
    const ours = [mfr, otherMfr, contractor, otherContractor].map((o) => o.id);
    const all = await readRows<Record<string, unknown> & { id: string }>(
      t.ds,
      'SELECT id, contractor_id AS contractorId, manufacturer_id AS manufacturerId, stage FROM claims WHERE contractor_id IN (?)',
      [ours],
    );
    const expected = all
      .filter((row) => ability.can('read', subject('Claim', { ...row })))
      .map((r) => r.id)
      .sort();
    const scope = scopeConditions(ability, 'Claim', 'c');
    const w = new Conditions().and('c.contractor_id IN (?)', ours).and(scope.sql, ...scope.params);
    const selected = await readRows<{ id: string }>(t.ds, `SELECT c.id FROM claims c ${w.sql}`, w.params);
    expect(selected.map((r) => r.id).sort()).toEqual(expected);
    expect(expected.length).toBeGreaterThan(0);
  });
});
