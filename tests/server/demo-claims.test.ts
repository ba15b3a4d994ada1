import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { In } from 'typeorm';
import { isValidClaimNumber } from '../../shared/claims/claim-number';
import { CLAIM_STAGES } from '../../shared/schemas/claims';
import { ENGINE_VERSION } from '../../shared/engine';
import { seedDemo } from '../../server/db/seed/demo';
import { createStorage } from '../../server/lib/storage';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { Claim } from '../../server/db/entities/claim.entity';
import { Organization } from '../../server/db/entities/organization.entity';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

let t: TestContext;
let claims: Claim[];
let names: Map<string, string>;
beforeAll(async () => {
  t = await createTestApp();
  await seedDemo(t.ds, { onlyIfEmpty: false, credits: { storage: createStorage(t.config), config: t.config } });
  const orgs = await t.ds.getRepository(Organization).findBy({ name: In(['Aldercrest Lighting', 'Veltra Luminaires', 'Harborview Electric', 'Copperline Electrical']) });
  names = new Map(orgs.map((o) => [o.id, o.name]));
  claims = await t.ds.getRepository(Claim).findBy({ contractorId: In(orgs.map((o) => o.id)) });
});
afterAll(() => closeTestApp(t));

describe('the demo claims (API.md demo data)', () => {
  it('hold at least 60 claims over every stage, both manufacturers and both contractors', () => {
    expect(claims.length).toBeGreaterThanOrEqual(60);
    expect(new Set(claims.map((c) => c.stage))).toEqual(new Set(CLAIM_STAGES));
    expect(new Set(claims.map((c) => names.get(c.manufacturerId)))).toEqual(new Set(['Aldercrest Lighting', 'Veltra Luminaires']));
    expect(new Set(claims.map((c) => names.get(c.contractorId)))).toEqual(new Set(['Harborview Electric', 'Copperline Electrical']));
    for (const pair of ['Harborview Electric|Aldercrest Lighting', 'Harborview Electric|Veltra Luminaires', 'Copperline Electrical|Aldercrest Lighting', 'Copperline Electrical|Veltra Luminaires']) {
      expect(claims.some((c) => `${names.get(c.contractorId)}|${names.get(c.manufacturerId)}` === pair)).toBe(true);
    }
  });

  it('have at least 5 approved and not yet credited claims for each manufacturer', () => {
    for (const m of ['Aldercrest Lighting', 'Veltra Luminaires']) {
      expect(claims.filter((c) => c.stage === 'approved' && names.get(c.manufacturerId) === m).length).toBeGreaterThanOrEqual(5);
    }
  });

  it('every filed claim has a valid number, the engine’s evaluation with its version, and an audit trail to its stage', async () => {
    const filed = claims.filter((c) => c.stage !== 'draft');
    for (const c of filed) {
      expect(isValidClaimNumber(c.number!)).toBe(true);
      expect(c.evaluation?.engineVersion).toBe(ENGINE_VERSION);
      expect(c.verdict).toBe(c.evaluation!.verdict);
    }
    expect(new Set(filed.map((c) => c.verdict)).size).toBeGreaterThanOrEqual(2);
    const credited = filed.find((c) => c.stage === 'credited')!;
    const trail = (await t.ds.getRepository(AuditEvent).find({ where: { entityType: 'Claim', entityId: credited.id }, order: { id: 'ASC' } })).map((a) => a.action);
    expect(trail).toEqual(['claim.created', 'claim.filed', 'claim.review_started', 'claim.approved', 'claim.credited']);
  });
});
