import type supertest from 'supertest';
import type { ClaimFieldsInput } from '../../shared/schemas/claims';
import type { Role } from '../../shared/roles';
import { createOrganization, createUser, signIn } from './factories';
import { createPolicy, createProduct, installationPayload } from './catalogue-factories';
import type { TestContext } from './test-app';

export const daysAgo = (n: number) => new Date(Date.now() - n * 86_400_000).toISOString().slice(0, 10);

export async function member(
  t: TestContext,
  org: Awaited<ReturnType<typeof createOrganization>>,
  roles: Role[],
) {
  const user = await createUser(t.ds, org, roles);
  return { org, user, agent: await signIn(t.request(), user.email) };
}

/**
 * Two manufacturers and two contractors; manufacturer A's 24 W troffer (12 strings x 16 LEDs at 3.0 V, 0.44 A:
 * the ENGINE.md example) under a 60-month policy, installed by contractor X in a dry room at 277 V.
 */
export async function claimWorld(t: TestContext) {
  const mfrA = await createOrganization(t.ds, 'manufacturer');
  const mfrB = await createOrganization(t.ds, 'manufacturer');
  const conX = await createOrganization(t.ds, 'contractor');
  const conY = await createOrganization(t.ds, 'contractor');
  const product = await createProduct(t.ds, mfrA);
  const { versions } = await createPolicy(t.ds, mfrA, [product], [{ effectiveFrom: '2023-01-01' }]);
  const installer = await member(t, conX, ['installer']);
  const inst = await installer.agent
    .post('/api/installations')
    .send(installationPayload(product.id, { installDate: '2024-03-01', purchaseDate: '2024-02-15' }));
  if (inst.status !== 201) throw new Error(`installation: ${inst.status} ${JSON.stringify(inst.body)}`);
  return {
    mfrA,
    mfrB,
    conX,
    conY,
    product,
    policyVersion: versions[0],
    installation: inst.body.installation as { id: string; serials: string[]; quantity: number },
    installer,
    reviewer: await member(t, mfrA, ['reviewer']),
    otherInstaller: await member(t, conY, ['installer']),
    otherReviewer: await member(t, mfrB, ['reviewer']),
  };
}

/** A complete claim: one unit, dark, failed ten days ago, readings in range. */
export function goodClaimFields(serial: string, extra: Partial<ClaimFieldsInput> = {}): ClaimFieldsInput {
  return {
    serials: [serial],
    units: 1,
    failedOn: daysAgo(10),
    symptoms: ['partly_dark'],
    measurements: {
      supplyVolts: 276,
      inputWatts: 23.5,
      powerFactor: 0.95,
      driverOutputVolts: 48.1,
      driverOutputAmps: 0.44,
    },
    observations: {
      debrisIngress: false,
      waterIngress: false,
      physicalDamage: false,
      fanStopped: false,
      burnMarks: false,
    },
    narrative: 'Three strings went dark on the east row after a week of flicker.',
    ...extra,
  };
}

export async function createDraft(
  agent: supertest.Agent,
  installationId: string,
  fields: ClaimFieldsInput = {},
) {
  const r = await agent.post('/api/claims').send({ installationId, ...fields });
  if (r.status !== 201) throw new Error(`draft: ${r.status} ${JSON.stringify(r.body)}`);
  return r.body.claim as { id: string; version: number };
}
