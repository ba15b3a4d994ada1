import crypto from 'node:crypto';
import type { EntityManager } from 'typeorm';
import { coverageDate, versionInForce } from '../../../shared/catalogue/policy-version';
import {
  installationInputSchema,
  policyTermsSchema,
  productInputSchema,
  type Dimmer,
  type Enclosure,
  type PolicyTermsInput,
  type ProductInput,
  type RatedLocation,
} from '../../../shared/schemas/catalogue';
import { recordAuditMany, type Actor } from '../../lib/audit';
import { InstallationUnit } from '../entities/installation-unit.entity';
import { Installation } from '../entities/installation.entity';
import type { Organization } from '../entities/organization.entity';
import { PolicyModel } from '../entities/policy-model.entity';
import { ProductModel } from '../entities/product-model.entity';
import type { User } from '../entities/user.entity';
import { WarrantyPolicyVersion } from '../entities/warranty-policy-version.entity';
import { WarrantyPolicy } from '../entities/warranty-policy.entity';

// The demo's catalogue: every manufacturer, model, site, number and serial here is invented for the demo.
// Each rating set is physically consistent (string volts x driver amps below the rated input) and passes the
// same schemas as the forms. Installations are generated from a fixed seed, so every run loads the same data.

type ModelSpec = ProductInput & { key: string; serialPrefix: string };

const ALDERCREST_MODELS: ModelSpec[] = [
  {
    key: 'ac-hb150',
    serialPrefix: 'ACH',
    modelNumber: 'AC-HB150-D',
    name: 'Arden round high-bay 150 W',
    family: 'high_bay',
    ratedInputWatts: 150,
    inputVoltsMin: 120,
    inputVoltsMax: 277,
    ratedLumens: 21000,
    ledStrings: 24,
    ledsPerString: 16,
    ledForwardVolts: 3.0,
    driverOutputAmps: 2.8,
    driverMaxOutputVolts: 60,
    location: 'damp',
    enclosedRated: false,
    dimming: '0-10v',
    ambientMaxC: 50,
    ratedLifeHours: 100000,
    activeCooling: false,
  },
  {
    key: 'ac-hb240',
    serialPrefix: 'ACV',
    modelNumber: 'AC-HB240-HV',
    name: 'Arden high-bay 240 W, 347-480 V',
    family: 'high_bay',
    ratedInputWatts: 240,
    inputVoltsMin: 347,
    inputVoltsMax: 480,
    ratedLumens: 33600,
    ledStrings: 32,
    ledsPerString: 16,
    ledForwardVolts: 3.0,
    driverOutputAmps: 4.4,
    driverMaxOutputVolts: 60,
    location: 'wet',
    enclosedRated: false,
    dimming: '0-10v',
    ambientMaxC: 55,
    ratedLifeHours: 100000,
    activeCooling: false,
  },
  {
    key: 'ac-wp40',
    serialPrefix: 'ACW',
    modelNumber: 'AC-WP40-W',
    name: 'Harlow wall pack 40 W',
    family: 'wall_pack',
    ratedInputWatts: 40,
    inputVoltsMin: 120,
    inputVoltsMax: 277,
    ratedLumens: 5200,
    ledStrings: 4,
    ledsPerString: 12,
    ledForwardVolts: 2.9,
    driverOutputAmps: 1.0,
    driverMaxOutputVolts: 45,
    location: 'wet',
    enclosedRated: true,
    dimming: 'none',
    ambientMaxC: 40,
    ratedLifeHours: 60000,
    activeCooling: false,
  },
  {
    key: 'ac-tr24',
    serialPrefix: 'ACT',
    modelNumber: 'AC-TR24-32',
    name: 'Fenwick 2x4 troffer 32 W',
    family: 'troffer',
    ratedInputWatts: 32,
    inputVoltsMin: 120,
    inputVoltsMax: 277,
    ratedLumens: 4200,
    ledStrings: 8,
    ledsPerString: 18,
    ledForwardVolts: 3.0,
    driverOutputAmps: 0.5,
    driverMaxOutputVolts: 60,
    location: 'dry',
    enclosedRated: false,
    dimming: '0-10v',
    ambientMaxC: 40,
    ratedLifeHours: 70000,
    activeCooling: false,
  },
  {
    key: 'ac-cl54',
    serialPrefix: 'ACC',
    modelNumber: 'AC-CL54-E39',
    name: 'Corvale corn lamp 54 W, E39 base',
    family: 'corn_lamp',
    ratedInputWatts: 54,
    inputVoltsMin: 120,
    inputVoltsMax: 277,
    ratedLumens: 7500,
    ledStrings: 12,
    ledsPerString: 12,
    ledForwardVolts: 3.0,
    driverOutputAmps: 1.3,
    driverMaxOutputVolts: 48,
    location: 'damp',
    enclosedRated: false,
    dimming: 'none',
    ambientMaxC: 45,
    ratedLifeHours: 50000,
    activeCooling: true,
  },
];

const VELTRA_MODELS: ModelSpec[] = [
  {
    key: 'vl-fl100',
    serialPrefix: 'VFL',
    modelNumber: 'VL-FL100',
    name: 'Solent flood 100 W',
    family: 'flood',
    ratedInputWatts: 100,
    inputVoltsMin: 120,
    inputVoltsMax: 277,
    ratedLumens: 14000,
    ledStrings: 12,
    ledsPerString: 20,
    ledForwardVolts: 3.0,
    driverOutputAmps: 1.5,
    driverMaxOutputVolts: 72,
    location: 'wet',
    enclosedRated: true,
    dimming: '0-10v',
    ambientMaxC: 50,
    ratedLifeHours: 100000,
    activeCooling: false,
  },
  {
    key: 'vl-wp80',
    serialPrefix: 'VWP',
    modelNumber: 'VL-WP80-W',
    name: 'Tamsin wall pack 80 W',
    family: 'wall_pack',
    ratedInputWatts: 80,
    inputVoltsMin: 120,
    inputVoltsMax: 347,
    ratedLumens: 10400,
    ledStrings: 8,
    ledsPerString: 16,
    ledForwardVolts: 3.0,
    driverOutputAmps: 1.5,
    driverMaxOutputVolts: 58,
    location: 'wet',
    enclosedRated: true,
    dimming: 'none',
    ambientMaxC: 45,
    ratedLifeHours: 100000,
    activeCooling: false,
  },
  {
    key: 'vl-st4',
    serialPrefix: 'VST',
    modelNumber: 'VL-ST4-38',
    name: 'Linden 4 ft strip 38 W',
    family: 'strip',
    ratedInputWatts: 38,
    inputVoltsMin: 120,
    inputVoltsMax: 277,
    ratedLumens: 5000,
    ledStrings: 6,
    ledsPerString: 20,
    ledForwardVolts: 2.9,
    driverOutputAmps: 0.6,
    driverMaxOutputVolts: 65,
    location: 'damp',
    enclosedRated: true,
    dimming: '0-10v',
    ambientMaxC: 40,
    ratedLifeHours: 60000,
    activeCooling: false,
  },
  {
    key: 'vl-cl36',
    serialPrefix: 'VCL',
    modelNumber: 'VL-CL36-E26',
    name: 'Marrow corn lamp 36 W, E26 base',
    family: 'corn_lamp',
    ratedInputWatts: 36,
    inputVoltsMin: 120,
    inputVoltsMax: 277,
    ratedLumens: 4700,
    ledStrings: 12,
    ledsPerString: 10,
    ledForwardVolts: 3.0,
    driverOutputAmps: 1.05,
    driverMaxOutputVolts: 40,
    location: 'damp',
    enclosedRated: false,
    dimming: 'none',
    ambientMaxC: 40,
    ratedLifeHours: 50000,
    activeCooling: false,
  },
  {
    key: 'vl-tr14',
    serialPrefix: 'VTR',
    modelNumber: 'VL-TR14-20',
    name: 'Orrin 1x4 troffer 20 W',
    family: 'troffer',
    ratedInputWatts: 20,
    inputVoltsMin: 120,
    inputVoltsMax: 277,
    ratedLumens: 2600,
    ledStrings: 6,
    ledsPerString: 16,
    ledForwardVolts: 3.0,
    driverOutputAmps: 0.35,
    driverMaxOutputVolts: 56,
    location: 'dry',
    enclosedRated: false,
    dimming: 'phase',
    ambientMaxC: 35,
    ratedLifeHours: 60000,
    activeCooling: false,
  },
];

const baseTerms = (
  t: Partial<PolicyTermsInput> & Pick<PolicyTermsInput, 'effectiveFrom'>,
): PolicyTermsInput => ({
  termMonths: 60,
  fullCoverageMonths: 36,
  filingWindowDays: 90,
  darkLedFailurePercent: 10,
  unitCredit: '96.00',
  currency: 'USD',
  labourAllowance: '35.00',
  requiredPhotos: 2,
  proofOfPurchaseRequired: true,
  exclusions: [
    'location_misapplication',
    'enclosed_misapplication',
    'dimmer_misapplication',
    'supply_outside_rating',
    'ambient_above_rating',
    'physical_damage',
    'field_modification',
  ],
  denialReasons: [
    { code: 'MISAPP-LOC', label: 'Installed in a wetter location than the fixture is rated for' },
    { code: 'MISAPP-ENC', label: 'Used in a totally enclosed fixture without an enclosed rating' },
    { code: 'MISAPP-DIM', label: 'Dimmed although the product is not dimmable' },
    { code: 'SUPPLY', label: 'Supply voltage outside the rated input range' },
    { code: 'OUT-OF-TERM', label: 'Failure after the warranty term' },
    { code: 'LATE', label: 'Claim filed after the filing window' },
    { code: 'DAMAGE', label: 'Physical damage' },
  ],
  ...t,
});

const POLICIES: {
  org: 'aldercrest' | 'veltra';
  name: string;
  models: string[];
  versions: PolicyTermsInput[];
}[] = [
  {
    org: 'aldercrest',
    name: 'Aldercrest Commercial Five-Year',
    models: ['ac-hb150', 'ac-hb240', 'ac-wp40', 'ac-tr24'],
    versions: [
      baseTerms({ effectiveFrom: '2021-01-01', changeNote: 'First edition.' }),
      baseTerms({
        effectiveFrom: '2024-01-01',
        filingWindowDays: 120,
        unitCredit: '110.00',
        labourAllowance: '45.00',
        requiredPhotos: 3,
        exclusions: [...baseTerms({ effectiveFrom: '2024-01-01' }).exclusions, 'power_surge_or_lightning'],
        changeNote:
          'Longer filing window and higher credit; a third photo (the nameplate) required; surges excluded.',
      }),
    ],
  },
  {
    org: 'aldercrest',
    name: 'Aldercrest Retrofit Lamp Three-Year',
    models: ['ac-cl54'],
    versions: [
      baseTerms({
        effectiveFrom: '2021-01-01',
        termMonths: 36,
        fullCoverageMonths: 12,
        filingWindowDays: 60,
        unitCredit: '28.00',
        labourAllowance: '10.00',
      }),
    ],
  },
  {
    org: 'veltra',
    name: 'Veltra ProLine Ten-Year',
    models: ['vl-fl100', 'vl-wp80'],
    versions: [
      baseTerms({
        effectiveFrom: '2020-06-01',
        termMonths: 120,
        fullCoverageMonths: 60,
        unitCredit: '185.00',
        currency: 'USD',
        labourAllowance: '60.00',
        requiredPhotos: 3,
      }),
    ],
  },
  {
    org: 'veltra',
    name: 'Veltra Standard Five-Year',
    models: ['vl-st4', 'vl-cl36', 'vl-tr14'],
    versions: [
      baseTerms({
        effectiveFrom: '2020-06-01',
        darkLedFailurePercent: 15,
        unitCredit: '42.00',
        labourAllowance: '20.00',
        proofOfPurchaseRequired: true,
      }),
      baseTerms({
        effectiveFrom: '2024-06-01',
        darkLedFailurePercent: 10,
        unitCredit: '45.00',
        labourAllowance: '20.00',
        proofOfPurchaseRequired: false,
        changeNote:
          'Failure threshold lowered to 10 % of LEDs dark; proof of purchase no longer required with a registered serial.',
      }),
    ],
  },
];

const SITES = [
  {
    name: 'Dockside cold store',
    address: '18 Wharf Road',
    city: 'Port Elliot',
    region: 'WA',
    postal: '98412',
  },
  {
    name: 'Marrowgate distribution centre',
    address: '400 Freight Way',
    city: 'Marrowgate',
    region: 'OR',
    postal: '97233',
  },
  {
    name: 'Westhaven municipal pool',
    address: '2 Lido Lane',
    city: 'Westhaven',
    region: 'WA',
    postal: '98077',
  },
  {
    name: 'Calder Falls parking deck',
    address: '75 Millrace Street',
    city: 'Calder Falls',
    region: 'ID',
    postal: '83814',
  },
  {
    name: 'Brindle Bay car wash',
    address: '911 Shoreline Drive',
    city: 'Brindle Bay',
    region: 'WA',
    postal: '98290',
  },
  {
    name: 'Ashford Mills school gym',
    address: '30 Schoolhouse Road',
    city: 'Ashford Mills',
    region: 'OR',
    postal: '97401',
  },
  {
    name: 'Kestrel Point warehouse 3',
    address: '1200 Industrial Loop',
    city: 'Kestrel Point',
    region: 'WA',
    postal: '98506',
  },
  {
    name: 'Old Quarry clinic',
    address: '6 Slate Court',
    city: 'Old Quarry',
    region: 'BC',
    postal: 'V2S 4N1',
  },
  {
    name: 'Fernleigh office park B',
    address: '88 Meadow Crescent',
    city: 'Fernleigh',
    region: 'OR',
    postal: '97124',
  },
  { name: 'Highmoor foundry', address: '5 Crucible Road', city: 'Highmoor', region: 'BC', postal: 'V3C 2K8' },
  {
    name: 'Tidewater fish processing',
    address: '14 Cannery Row',
    city: 'Tidewater',
    region: 'WA',
    postal: '98520',
  },
  {
    name: 'Larchmont retail plaza',
    address: '250 Market Street',
    city: 'Larchmont',
    region: 'ID',
    postal: '83702',
  },
];
const DISTRIBUTORS = ['Northgate Electrical Supply', 'Cascade Lamp & Wire', 'Pinewood Lighting Wholesale'];

/** A small deterministic generator (mulberry32) so the demo is the same on every machine. */
function prng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

type Conditions = {
  location: RatedLocation;
  enclosure: Enclosure;
  dimmer: Dimmer;
  nominalSupplyVolts: 120 | 208 | 240 | 277 | 347 | 480;
  hoursPerDay: number;
  ambientC: number;
};

/** Conditions as rated, or (every fifth site or so) one deliberate misapplication, for the claims to screen. */
function conditionsFor(p: ModelSpec, rand: () => number, misapply: number | null): Conditions {
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(rand() * xs.length)];
  const locations: RatedLocation[] =
    p.location === 'wet' ? ['dry', 'damp', 'wet'] : p.location === 'damp' ? ['dry', 'damp'] : ['dry'];
  const supplies = ([120, 208, 240, 277, 347, 480] as const).filter(
    (v) => v >= p.inputVoltsMin && v <= p.inputVoltsMax,
  );
  const c: Conditions = {
    location: pick(locations),
    enclosure: p.enclosedRated
      ? pick(['open', 'enclosed', 'enclosed_ventilated'] as const)
      : pick(['open', 'enclosed_ventilated'] as const),
    dimmer:
      p.dimming === 'none'
        ? 'none'
        : p.dimming === 'phase'
          ? pick(['none', 'phase'] as const)
          : pick(['none', '0-10v'] as const),
    nominalSupplyVolts: pick(supplies),
    hoursPerDay: pick([10, 12, 16, 18, 24]),
    ambientC: Math.round(10 + rand() * (p.ambientMaxC - 15)),
  };
  if (misapply === 0 && p.location !== 'wet') c.location = 'wet';
  if (misapply === 1 && !p.enclosedRated) c.enclosure = 'enclosed';
  if (misapply === 2 && p.dimming === 'none') c.dimmer = 'phase';
  if (misapply === 3) c.nominalSupplyVolts = p.inputVoltsMax < 480 ? 480 : 277;
  if (misapply === 4) c.ambientC = p.ambientMaxC + 8;
  return c;
}

export type DemoCatalogue = {
  products: Map<string, ProductModel>;
  installations: Installation[];
};

/** Loads the catalogue part of the demo inside the caller's transaction. */
export async function seedDemoCatalogue(
  m: EntityManager,
  orgs: Map<string, Organization>,
  users: Map<string, User>,
): Promise<DemoCatalogue> {
  const actorFor = (org: string, email?: string): Actor => ({
    userId: (email && users.get(email)?.id) || null,
    organizationId: orgs.get(org)!.id,
  });
  const products = new Map<string, ProductModel>();

  for (const [org, models, email] of [
    ['aldercrest', ALDERCREST_MODELS, 'max@aldercrest.test'],
    ['veltra', VELTRA_MODELS, undefined],
  ] as const) {
    const rows = models.map(({ key, serialPrefix: _s, ...spec }) => {
      void _s;
      const values = productInputSchema.parse(spec);
      const p = m.create(ProductModel, {
        ...values,
        id: crypto.randomUUID(),
        manufacturerId: orgs.get(org)!.id,
      });
      products.set(key, p);
      return p;
    });
    await m.save(rows);
    await recordAuditMany(
      m,
      actorFor(org, email),
      rows.map((p) => ({
        action: 'product.created',
        entityType: 'ProductModel',
        entityId: p.id,
        after: { modelNumber: p.modelNumber, name: p.name, source: 'demo' },
      })),
    );
  }

  const versionsByModel = new Map<string, WarrantyPolicyVersion[]>();
  for (const spec of POLICIES) {
    const orgId = orgs.get(spec.org)!.id;
    const actor = actorFor(spec.org, spec.org === 'aldercrest' ? 'max@aldercrest.test' : undefined);
    const policy = m.create(WarrantyPolicy, {
      manufacturerId: orgId,
      name: spec.name,
      latestVersionNumber: spec.versions.length,
    });
    await m.save(policy);
    const versions = spec.versions.map((raw, i) => {
      const t = policyTermsSchema.parse(raw);
      return m.create(WarrantyPolicyVersion, {
        policyId: policy.id,
        versionNumber: i + 1,
        ...t,
        darkLedFailurePercent: t.darkLedFailurePercent.toFixed(2),
        createdById: actor.userId,
      });
    });
    await m.save(versions);
    await m.insert(
      PolicyModel,
      spec.models.map((k) => ({ policyId: policy.id, productModelId: products.get(k)!.id })),
    );
    for (const k of spec.models) versionsByModel.set(products.get(k)!.id, versions);
    await recordAuditMany(m, actor, [
      {
        action: 'policy.created',
        entityType: 'WarrantyPolicy',
        entityId: policy.id,
        after: { name: spec.name, source: 'demo' },
      },
      ...versions.map((v) => ({
        action: 'policy.version_created',
        entityType: 'WarrantyPolicy',
        entityId: policy.id,
        after: { versionNumber: v.versionNumber, effectiveFrom: v.effectiveFrom },
      })),
    ]);
  }

  const installations: Installation[] = [];
  const units: Partial<InstallationUnit>[] = [];
  const audits: {
    action: string;
    entityType: string;
    entityId: string;
    after: Record<string, unknown>;
    actor: Actor;
  }[] = [];
  const allModels = [...ALDERCREST_MODELS, ...VELTRA_MODELS];
  for (const [contractor, email, seed] of [
    ['harborview', 'ines@harborview.test', 2401],
    ['copperline', 'omar@copperline.test', 2402],
  ] as const) {
    const rand = prng(seed);
    const actor = actorFor(contractor, email);
    for (let n = 0; n < 34; n++) {
      const spec = allModels[(n + (contractor === 'copperline' ? 3 : 0)) % allModels.length];
      const product = products.get(spec.key)!;
      const site = SITES[Math.floor(rand() * SITES.length)];
      const misapply = n % 6 === 5 ? Math.floor(rand() * 5) : null;
      const year = 2021 + Math.floor(rand() * 4); // 2021-2024
      const month = 1 + Math.floor(rand() * 12);
      const day = 1 + Math.floor(rand() * 27);
      const installDate = `${year}-${String(month).padStart(2, '0')}-${String(day).padStart(2, '0')}`;
      const purchase = new Date(Date.UTC(year, month - 1, day - 7 - Math.floor(rand() * 30)));
      const purchaseDate = n % 7 === 3 ? null : purchase.toISOString().slice(0, 10);
      const quantity = 2 + Math.floor(rand() * 38);
      const serialCount = n % 5 === 4 ? Math.floor(quantity / 2) : quantity; // some sites know only part of the serials
      const lot = `${String(year).slice(2)}${String(month).padStart(2, '0')}`;
      const serials = Array.from(
        { length: serialCount },
        (_, i) =>
          `${spec.serialPrefix}${lot}-${contractor === 'harborview' ? 'H' : 'C'}${String(n).padStart(2, '0')}${String(i + 1).padStart(3, '0')}`,
      );
      const values = installationInputSchema.parse({
        productModelId: product.id,
        siteName: `${site.name}${n >= SITES.length ? `, area ${Math.floor(n / SITES.length) + 1}` : ''}`,
        siteAddress: site.address,
        siteCity: site.city,
        siteRegion: site.region,
        sitePostalCode: site.postal,
        quantity,
        serials,
        installDate,
        purchaseDate,
        distributor: DISTRIBUTORS[n % DISTRIBUTORS.length],
        invoiceNumber: `INV-${contractor === 'harborview' ? 'H' : 'C'}${year}-${String(1000 + n * 17)}`,
        ...conditionsFor(spec, rand, misapply),
      });
      const { serials: list, ...fields } = values;
      const version = versionInForce(versionsByModel.get(product.id) ?? [], coverageDate(values));
      const inst = m.create(Installation, {
        ...fields,
        id: crypto.randomUUID(),
        contractorId: orgs.get(contractor)!.id,
        manufacturerId: product.manufacturerId,
        policyVersionId: version?.id ?? null,
        createdById: actor.userId,
      });
      installations.push(inst);
      for (const serial of list)
        units.push({
          id: crypto.randomUUID(),
          manufacturerId: product.manufacturerId,
          productModelId: product.id,
          installationId: inst.id,
          serial,
        });
      audits.push({
        action: 'installation.created',
        entityType: 'Installation',
        entityId: inst.id,
        after: { siteName: inst.siteName, productModelId: product.id, quantity, source: 'demo' },
        actor,
      });
    }
  }
  await m.save(installations, { chunk: 100 });
  for (let i = 0; i < units.length; i += 1000) {
    await m
      .createQueryBuilder()
      .insert()
      .into(InstallationUnit)
      .values(units.slice(i, i + 1000))
      .updateEntity(false)
      .execute();
  }
  for (const contractor of ['harborview', 'copperline']) {
    const mine = audits.filter((a) => a.actor.organizationId === orgs.get(contractor)!.id);
    if (mine.length) await recordAuditMany(m, mine[0].actor, mine);
  }
  return { products, installations };
}
