import { afterAll, beforeAll, expect, it } from 'vitest';
import { CLAIM_NUMBER_ALPHABET } from '../../shared/claims/claim-number';
import { Claim } from '../../server/db/entities/claim.entity';
import { saveNumberedClaim } from '../support/claim-numbers';
import { createApprovedClaim } from '../support/credit-factories';
import { createOrganization } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// The factories' claim numbers: a number already taken is drawn again instead of failing the test.

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));

it('draws again when the number drawn is taken, and keeps the rest of the claim', async () => {
  const m = await createOrganization(t.ds, 'manufacturer');
  const c = await createOrganization(t.ds, 'contractor');
  const first = await createApprovedClaim(t.ds, { manufacturer: m, contractor: c });
  // A random source that draws the first claim's number once, then another.
  const body = first.number!.slice(8, 11) + first.number!.slice(12, 14);
  const draws = [...body].map((ch) => CLAIM_NUMBER_ALPHABET.indexOf(ch));
  let i = 0;
  const random = (n: number) => (i < draws.length ? draws[i++] : (i++ * 7) % n);
  const { id: _id, number: _number, version: _version, ...fields } = first;
  const third = await saveNumberedClaim(t.ds, first.filedAt!, fields, random);
  expect(i).toBeGreaterThan(draws.length);
  expect(third.number).not.toBe(first.number);
  expect(third.number!.slice(0, 7)).toBe(first.number!.slice(0, 7));
  expect(await t.ds.getRepository(Claim).countBy({ number: first.number! })).toBe(1);
});
