import crypto from 'node:crypto';
import type { ClaimStage, Symptom } from '../../shared/schemas/claims';
import type { AppDataSource } from '../../server/db/data-source';
import { Claim } from '../../server/db/entities/claim.entity';
import { Installation } from '../../server/db/entities/installation.entity';
import type { Organization } from '../../server/db/entities/organization.entity';
import type { ProductModel } from '../../server/db/entities/product-model.entity';

// Installations and claims straight into the database, for the analytics tests (which are about counting them).

export type InstallationFixture = {
  installDate: string;
  quantity: number;
  hoursPerDay?: number;
  lot?: string | null;
  enclosure?: Installation['enclosure'];
  location?: Installation['location'];
  dimmer?: Installation['dimmer'];
  nominalSupplyVolts?: number;
  ambientC?: number;
  policyVersionId?: string | null;
};

export async function insertInstallations(
  ds: AppDataSource,
  contractor: Organization,
  product: ProductModel,
  list: InstallationFixture[],
) {
  const rows = list.map((f) => ({
    id: crypto.randomUUID(),
    contractorId: contractor.id,
    manufacturerId: product.manufacturerId,
    productModelId: product.id,
    policyVersionId: f.policyVersionId ?? null,
    siteName: 'Analytics test site',
    siteAddress: '1 Test Street',
    siteCity: 'Testville',
    siteRegion: 'WA',
    sitePostalCode: '98000',
    quantity: f.quantity,
    installDate: f.installDate,
    purchaseDate: null,
    distributor: null,
    invoiceNumber: null,
    location: f.location ?? 'dry',
    enclosure: f.enclosure ?? 'open',
    dimmer: f.dimmer ?? 'none',
    nominalSupplyVolts: f.nominalSupplyVolts ?? 277,
    hoursPerDay: f.hoursPerDay ?? 12,
    ambientC: f.ambientC ?? 25,
    lot: f.lot ?? null,
    createdById: null,
  }));
  for (let i = 0; i < rows.length; i += 500) {
    await ds
      .createQueryBuilder()
      .insert()
      .into(Installation)
      .values(rows.slice(i, i + 500))
      .updateEntity(false)
      .execute();
  }
  return rows;
}

export type ClaimFixture = {
  installationId: string;
  failedOn: string | null;
  units?: number | null;
  stage?: ClaimStage;
  verdict?: Claim['verdict'];
  symptoms?: Symptom[];
  findings?: string[];
  waitingOn?: Claim['waitingOn'];
  filedAt?: Date | null;
};

export async function insertClaims(
  ds: AppDataSource,
  installations: { id: string; contractorId: string; manufacturerId: string; productModelId: string }[],
  list: ClaimFixture[],
) {
  const byId = new Map(installations.map((i) => [i.id, i]));
  const rows = list.map((f) => {
    const inst = byId.get(f.installationId)!;
    return {
      id: crypto.randomUUID(),
      number: null,
      contractorId: inst.contractorId,
      manufacturerId: inst.manufacturerId,
      installationId: inst.id,
      productModelId: inst.productModelId,
      policyVersionId: null,
      stage: f.stage ?? 'approved',
      stageChangedAt: new Date(),
      waitingOn: f.waitingOn ?? null,
      units: f.units === undefined ? 1 : f.units,
      serials: [],
      failedOn: f.failedOn,
      symptoms: f.symptoms ?? ['dark'],
      measurements: {},
      observations: {},
      narrative: '',
      evaluation: f.findings
        ? ({ findings: f.findings.map((code) => ({ code })) } as unknown as Claim['evaluation'])
        : null,
      verdict: f.verdict === undefined ? 'covered' : f.verdict,
      filedAt: f.filedAt === undefined ? new Date() : f.filedAt,
    };
  });
  for (let i = 0; i < rows.length; i += 500) {
    await ds
      .createQueryBuilder()
      .insert()
      .into(Claim)
      .values(rows.slice(i, i + 500))
      .updateEntity(false)
      .execute();
  }
  return rows;
}
