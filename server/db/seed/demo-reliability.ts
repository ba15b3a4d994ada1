import type { EntityManager } from 'typeorm';
import { engineContextFrom, engineInputFor } from '../../../shared/claims/engine-input';
import { newClaimNumber } from '../../../shared/claims/claim-number';
import { safeEvaluateClaim } from '../../../shared/engine';
import type { Evaluation } from '../../../shared/engine';
import { AuditEvent } from '../entities/audit-event.entity';
import { Claim } from '../entities/claim.entity';
import { Installation } from '../entities/installation.entity';
import type { Organization } from '../entities/organization.entity';
import { PolicyModel } from '../entities/policy-model.entity';
import type { ProductModel } from '../entities/product-model.entity';
import type { User } from '../entities/user.entity';
import { WarrantyPolicyVersion } from '../entities/warranty-policy-version.entity';
import {
  addDaysIso,
  generateStory,
  prng,
  stageFor,
  storyUuid,
  type StoryClaim,
  type StoryInstallation,
  type StoryOptions,
} from './reliability-story';

// The demo's reliability history (see reliability-story.ts for the story): about three years of installations
// for both manufacturers and the claims their units brought, each judged by the real engine at filing, with
// the reviewers' decisions in the audit trail for the throughput chart. Fictional throughout.

const PLACES = [
  'Alder',
  'Brook',
  'Cinder',
  'Dunmore',
  'Elm',
  'Fallow',
  'Granite',
  'Heron',
  'Iris',
  'Juniper',
  'Kestrel',
  'Larch',
];
const KINDS = [
  'distribution centre',
  'parking deck',
  'school',
  'cold store',
  'depot',
  'workshop',
  'retail park',
  'clinic',
];

export const DEMO_STORY: Omit<StoryOptions, 'today'> = {
  months: 36,
  perMonth: 2,
  quantity: [12, 60],
  scaleFactor: 1,
  seed: 9009,
};

export function installationRow(i: StoryInstallation) {
  const place = PLACES[i.siteIndex % PLACES.length];
  return {
    id: i.id,
    contractorId: i.contractorId,
    manufacturerId: i.manufacturerId,
    productModelId: i.productModelId,
    policyVersionId: i.policyVersionId,
    siteName: `${place} ${KINDS[Math.floor(i.siteIndex / PLACES.length) % KINDS.length]}`,
    siteAddress: `${10 + (i.siteIndex % 890)} ${place} Way`,
    siteCity: `${place}ford`,
    siteRegion: 'WA',
    sitePostalCode: `98${String(100 + (i.siteIndex % 800)).padStart(3, '0')}`,
    quantity: i.quantity,
    installDate: i.installDate,
    purchaseDate: addDaysIso(i.installDate, -14),
    distributor: 'Northgate Electrical Supply',
    invoiceNumber: `INV-R${i.installDate.replace(/-/g, '')}-${i.siteIndex}`,
    location: i.location,
    enclosure: i.enclosure,
    dimmer: i.dimmer,
    nominalSupplyVolts: i.nominalSupplyVolts,
    hoursPerDay: i.hoursPerDay,
    ambientC: i.ambientC,
    lot: i.lot,
    createdById: null,
  };
}

export async function loadStoryInputs(m: EntityManager, products: ProductModel[]) {
  const links = await m.getRepository(PolicyModel).find();
  const versions = await m.getRepository(WarrantyPolicyVersion).find({ order: { effectiveFrom: 'ASC' } });
  const versionsByModel = new Map<string, WarrantyPolicyVersion[]>();
  for (const p of products) {
    const policyIds = new Set(links.filter((l) => l.productModelId === p.id).map((l) => l.policyId));
    versionsByModel.set(
      p.id,
      versions.filter((v) => policyIds.has(v.policyId)),
    );
  }
  return versionsByModel;
}

export async function seedDemoReliability(
  m: EntityManager,
  orgs: Map<string, Organization>,
  users: Map<string, User>,
  products: ProductModel[],
  today = new Date().toISOString().slice(0, 10),
) {
  const versionsByModel = await loadStoryInputs(m, products);
  // The catalogue's own installations get the date code of the month before they were installed.
  await m.query(
    `UPDATE installations i JOIN product_models pm ON pm.id = i.product_model_id
     SET i.lot = CONCAT(LEFT(REGEXP_REPLACE(pm.model_number, '[^A-Z]', ''), 3), DATE_FORMAT(DATE_SUB(i.install_date, INTERVAL 1 MONTH), '%y%m'))
     WHERE i.lot IS NULL`,
  );
  const contractorIds = [orgs.get('harborview')!.id, orgs.get('copperline')!.id];
  const { installations, claims } = generateStory(products, versionsByModel, contractorIds, {
    ...DEMO_STORY,
    today,
  });
  for (let i = 0; i < installations.length; i += 500) {
    await m
      .createQueryBuilder()
      .insert()
      .into(Installation)
      .values(installations.slice(i, i + 500).map(installationRow))
      .updateEntity(false)
      .execute();
  }

  const productById = new Map(products.map((p) => [p.id, p]));
  const versionById = new Map([...versionsByModel.values()].flat().map((v) => [v.id, v]));
  const reviewerOf = new Map<string, User | undefined>([
    [orgs.get('aldercrest')!.id, users.get('rhea@aldercrest.test')],
    [orgs.get('veltra')!.id, users.get('theo@veltra.test')],
  ]);
  const installerOf = new Map<string, User | undefined>([
    [contractorIds[0], users.get('ines@harborview.test')],
    [contractorIds[1], users.get('omar@copperline.test')],
  ]);
  const rand = prng(4242);
  const numbers = new Set<string>();
  const rows: Partial<Claim>[] = [];
  const audits: (Omit<Partial<AuditEvent>, 'before' | 'after'> & {
    before: null;
    after: { number: string; source: string };
  })[] = [];
  for (const c of claims) {
    const inst = c.installation;
    const product = productById.get(inst.productModelId)!;
    const version = inst.policyVersionId ? versionById.get(inst.policyVersionId)! : null;
    const ctx = engineContextFrom(product, version, inst);
    const serials = Array.from(
      { length: c.units },
      (_, k) => `${inst.lot}-${String(Math.floor(rand() * 90000) + 10000)}${k}`,
    );
    const fields = {
      units: c.units,
      serials,
      failedOn: c.failedOn,
      symptoms: c.symptoms,
      observations: c.observations,
      measurements: {},
      narrative: narrativeOf(c),
    };
    const result = safeEvaluateClaim(
      engineInputFor(ctx, fields as never, { photos: 2, proofOfPurchase: true }, c.filedOn),
    );
    const evaluation: Evaluation | null = result.ok ? result.evaluation : null;
    const verdict = evaluation?.verdict ?? 'review';
    const { stage, waitingOn, decidedOn } = stageFor(verdict, c.filedOn, today, rand);
    let number = newClaimNumber(new Date(`${c.filedOn}T12:00:00Z`), (n) => Math.floor(rand() * n));
    while (numbers.has(number))
      number = newClaimNumber(new Date(`${c.filedOn}T12:00:00Z`), (n) => Math.floor(rand() * n));
    numbers.add(number);
    const id = storyUuid(rand);
    const filedAt = new Date(`${c.filedOn}T15:00:00Z`);
    rows.push({
      id,
      number,
      contractorId: inst.contractorId,
      manufacturerId: inst.manufacturerId,
      installationId: inst.id,
      productModelId: inst.productModelId,
      policyVersionId: inst.policyVersionId,
      stage,
      stageChangedAt: decidedOn ? new Date(`${decidedOn}T16:00:00Z`) : filedAt,
      waitingOn,
      units: c.units,
      serials,
      failedOn: c.failedOn,
      symptoms: c.symptoms,
      measurements: {},
      observations: c.observations,
      narrative: fields.narrative,
      evaluation,
      engineVersion: evaluation?.engineVersion ?? null,
      evaluatedAt: evaluation ? filedAt : null,
      verdict: evaluation?.verdict ?? null,
      expectedCredit: evaluation ? evaluation.computed.credit : null,
      currency: evaluation ? evaluation.computed.currency : null,
      filedAt,
      filedById: installerOf.get(inst.contractorId)?.id ?? null,
      createdById: installerOf.get(inst.contractorId)?.id ?? null,
    });
    const reviewer = reviewerOf.get(inst.manufacturerId);
    if (decidedOn && decidedOn <= today) {
      audits.push({
        occurredAt: new Date(`${decidedOn}T16:00:00Z`),
        actorUserId: reviewer?.id ?? null,
        organizationId: inst.manufacturerId,
        action:
          stage === 'denied' || (stage === 'closed' && verdict === 'excluded')
            ? 'claim.denied'
            : 'claim.approved',
        entityType: 'Claim',
        entityId: id,
        before: null,
        after: { number, source: 'demo' },
        requestId: null,
      });
    }
  }
  for (let i = 0; i < rows.length; i += 200) {
    await m
      .createQueryBuilder()
      .insert()
      .into(Claim)
      .values(rows.slice(i, i + 200))
      .updateEntity(false)
      .execute();
  }
  for (let i = 0; i < audits.length; i += 500) {
    await m
      .createQueryBuilder()
      .insert()
      .into(AuditEvent)
      .values(audits.slice(i, i + 500))
      .updateEntity(false)
      .execute();
  }
  return {
    installations: installations.length,
    units: installations.reduce((n, i) => n + i.quantity, 0),
    claims: rows.length,
  };
}

function narrativeOf(c: StoryClaim): string {
  if (c.mode === 'weak_lot')
    return 'Several LEDs on one board went dark within months; the rest of the fixture still lights.';
  if (c.mode === 'enclosed_driver')
    return 'Fixture cycles off when warm and comes back after cooling; mounted in a closed housing.';
  if (c.mode === 'insects') return 'Fan is clogged with insects and the lamp runs hot and dim.';
  return 'Fixture failed in normal service.';
}
