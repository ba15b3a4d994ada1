// npm run bench:generate (also the first part of npm run bench)
// Fills the benchmarks' private database (profile "bench", port DB_PORT + 4, emptied first) with a realistic
// spread: 4 manufacturers with 5 models each, 20 contractors, one user per role in each organisation,
// installations and BENCH_CLAIMS claims (100,000 by default) over every stage, by multi-row INSERTs straight
// into the tables (no services: this is set-up, not the thing measured). Prints rows per second.
import crypto from 'node:crypto';
import { CLAIM_NUMBER_ALPHABET } from '../../shared/claims/claim-number';
import { STAGES } from '../../shared/claims/stages';
import { WAITING_ON_BY_STAGE } from '../../shared/claims/workflow';
import { hashPassword } from '../../server/auth/passwords';
import type { AppDataSource } from '../../server/db/data-source';
import { Organization } from '../../server/db/entities/organization.entity';
import { ProductModel } from '../../server/db/entities/product-model.entity';
import { hasTable, openBenchDb, report } from './lib/bench-db';

export const BENCH_PASSWORD = 'lumenproof-bench';
export const benchEmail = (org: 'c' | 'm', i: number, role: string) => `${role}.${org}${i}@bench.test`;

export type BenchWorld = {
  manufacturers: number;
  contractors: number;
  installations: number;
  claims: number;
};

const MANUFACTURERS = 4;
const CONTRACTORS = 20;
const MODELS_PER_MANUFACTURER = 5;

// A fixed PRNG (mulberry32) so that every run builds the same data.
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

async function insertRows(
  ds: AppDataSource,
  table: string,
  columns: string[],
  rows: unknown[][],
  chunk = 1000,
) {
  const one = `(${columns.map(() => '?').join(',')})`;
  for (let i = 0; i < rows.length; i += chunk) {
    const part = rows.slice(i, i + chunk);
    await ds.query(
      `INSERT INTO \`${table}\` (${columns.join(', ')}) VALUES ${part.map(() => one).join(',')}`,
      part.flat(),
    );
  }
}

const iso = (ms: number) => new Date(ms).toISOString().slice(0, 10);
const stamp = (ms: number) => new Date(ms).toISOString().slice(0, 23).replace('T', ' ');

export async function generate(ds: AppDataSource, opts: { claims: number }): Promise<BenchWorld> {
  const rand = prng(20261201);
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(rand() * xs.length)];
  const now = Date.UTC(2026, 10, 30);
  const orgs = ds.getRepository(Organization);
  const manufacturers: Organization[] = [];
  const contractors: Organization[] = [];
  for (let i = 0; i < MANUFACTURERS; i++)
    manufacturers.push(await orgs.save(orgs.create({ name: `Bench Lighting ${i}`, kind: 'manufacturer' })));
  for (let i = 0; i < CONTRACTORS; i++)
    contractors.push(await orgs.save(orgs.create({ name: `Bench Electric ${i}`, kind: 'contractor' })));

  const hash = await hashPassword(BENCH_PASSWORD);
  const users: unknown[][] = [];
  const userIds = new Map<string, string>();
  const addUser = (orgId: string, email: string, role: string) => {
    const id = crypto.randomUUID();
    userIds.set(email, id);
    users.push([id, orgId, email, `Bench ${role}`, hash, role, 'active', stamp(now), stamp(now), 1]);
  };
  manufacturers.forEach((m, i) =>
    ['reviewer', 'accountant', 'administrator'].forEach((r) => addUser(m.id, benchEmail('m', i, r), r)),
  );
  contractors.forEach((c, i) =>
    ['installer', 'administrator'].forEach((r) => addUser(c.id, benchEmail('c', i, r), r)),
  );
  await insertRows(
    ds,
    'users',
    [
      'id',
      'organization_id',
      'email',
      'name',
      'password_hash',
      'roles',
      'status',
      'created_at',
      'updated_at',
      'version',
    ],
    users,
  );

  const productsRepo = ds.getRepository(ProductModel);
  const products: ProductModel[] = [];
  const families = ['high_bay', 'wall_pack', 'troffer', 'corn_lamp', 'high_bay'] as const;
  for (const [mi, m] of manufacturers.entries()) {
    for (let k = 0; k < MODELS_PER_MANUFACTURER; k++) {
      products.push(
        await productsRepo.save(
          productsRepo.create({
            manufacturerId: m.id,
            modelNumber: `B${mi}-${families[k].toUpperCase()}-${k}`,
            name: `Bench ${families[k]} ${k}`,
            family: families[k],
            ratedInputWatts: 24 + 30 * k,
            inputVoltsMin: 120,
            inputVoltsMax: 277,
            ratedLumens: 3000 + 4000 * k,
            ledStrings: 12,
            ledsPerString: 16,
            ledForwardVolts: 3,
            driverOutputAmps: 0.44,
            driverMaxOutputVolts: 56,
            location: k % 2 ? 'wet' : 'damp',
            enclosedRated: false,
            dimming: '0-10v',
            ambientMaxC: 45,
            ratedLifeHours: 50000 + 10000 * k,
            activeCooling: false,
          }),
        ),
      );
    }
  }

  // Ten claims per installation on average.
  const installationCount = Math.max(200, Math.ceil(opts.claims / 10));
  const installations: {
    id: string;
    contractorId: string;
    manufacturerId: string;
    productId: string;
    installMs: number;
  }[] = [];
  const instRows: unknown[][] = [];
  for (let i = 0; i < installationCount; i++) {
    const c = pick(contractors);
    const p = pick(products);
    const installMs = now - Math.floor(rand() * 4 * 365) * 86_400_000;
    const id = crypto.randomUUID();
    installations.push({
      id,
      contractorId: c.id,
      manufacturerId: p.manufacturerId,
      productId: p.id,
      installMs,
    });
    instRows.push([
      id,
      c.id,
      p.manufacturerId,
      p.id,
      null,
      `Bench site ${i}`,
      `${i} Bench Road`,
      'Benchton',
      'WA',
      '98000',
      2 + (i % 20),
      iso(installMs),
      iso(installMs - 20 * 86_400_000),
      'Bench Supply',
      `INV-${i}`,
      pick(['dry', 'damp', 'wet']),
      'open',
      'none',
      277,
      12,
      25,
      null,
      1,
      stamp(installMs),
      stamp(installMs),
    ]);
  }
  await insertRows(
    ds,
    'installations',
    [
      'id',
      'contractor_id',
      'manufacturer_id',
      'product_model_id',
      'policy_version_id',
      'site_name',
      'site_address',
      'site_city',
      'site_region',
      'site_postal_code',
      'quantity',
      'install_date',
      'purchase_date',
      'distributor',
      'invoice_number',
      'location',
      'enclosure',
      'dimmer',
      'nominal_supply_volts',
      'hours_per_day',
      'ambient_c',
      'created_by_id',
      'version',
      'created_at',
      'updated_at',
    ],
    instRows,
    500,
  );

  let claims = 0;
  if (await hasTable(ds, 'claims')) claims = await generateClaims(ds, opts.claims, installations, rand, now);
  return { manufacturers: MANUFACTURERS, contractors: CONTRACTORS, installations: installationCount, claims };
}

/** Claims spread over every stage, with numbers, verdicts and amounts; 1,000 rows a statement. */
async function generateClaims(
  ds: AppDataSource,
  n: number,
  installations: {
    id: string;
    contractorId: string;
    manufacturerId: string;
    productId: string;
    installMs: number;
  }[],
  rand: () => number,
  now: number,
): Promise<number> {
  const cols = [
    'id',
    'number',
    'contractor_id',
    'manufacturer_id',
    'installation_id',
    'product_model_id',
    'stage',
    'stage_changed_at',
    'waiting_on',
    'units',
    'serials',
    'failed_on',
    'symptoms',
    'measurements',
    'observations',
    'narrative',
    'verdict',
    'expected_credit',
    'currency',
    'filed_at',
    'created_at',
    'updated_at',
    'version',
  ];
  const verdicts = ['covered', 'covered', 'covered', 'review', 'excluded'];
  const symptoms = ['["dark"]', '["partly_dark"]', '["cycling"]', '["flicker"]', '["dim"]'];
  const used = new Set<string>();
  const rows: unknown[][] = [];
  for (let k = 0; k < n; k++) {
    const inst = installations[Math.floor(rand() * installations.length)];
    const stage = STAGES[Math.floor(rand() * STAGES.length)];
    const filedMs = Math.min(now, inst.installMs + Math.floor(rand() * 3 * 365) * 86_400_000);
    const d = new Date(filedMs);
    let number: string | null = null;
    if (stage !== 'draft') {
      do {
        let body = '';
        for (let i = 0; i < 7; i++)
          body += CLAIM_NUMBER_ALPHABET[Math.floor(rand() * CLAIM_NUMBER_ALPHABET.length)];
        number = `LP-${String(d.getUTCFullYear() % 100).padStart(2, '0')}${String(d.getUTCMonth() + 1).padStart(2, '0')}-${body.slice(0, 3)}-${body.slice(3)}`;
      } while (used.has(number));
      used.add(number);
    }
    rows.push([
      crypto.randomUUID(),
      number,
      inst.contractorId,
      inst.manufacturerId,
      inst.id,
      inst.productId,
      stage,
      stamp(filedMs),
      WAITING_ON_BY_STAGE[stage],
      1 + (k % 3),
      JSON.stringify([`SN-${k}`]),
      iso(filedMs - 5 * 86_400_000),
      symptoms[k % symptoms.length],
      JSON.stringify({ supplyVolts: 270 + (k % 15), inputWatts: 20 + (k % 7) }),
      '{}',
      'Strings went dark on the east row.',
      stage === 'draft' ? null : verdicts[k % verdicts.length],
      stage === 'draft' ? null : (60 + (k % 40)).toFixed(2),
      stage === 'draft' ? null : 'USD',
      stage === 'draft' ? null : stamp(filedMs),
      stamp(filedMs - 86_400_000),
      stamp(filedMs),
      1 + (k % 5),
    ]);
    if (rows.length === 1000) await insertRows(ds, 'claims', cols, rows.splice(0));
  }
  if (rows.length) await insertRows(ds, 'claims', cols, rows);
  return n;
}

async function main() {
  const n = Number(process.env.BENCH_CLAIMS ?? 100_000);
  const bench = await openBenchDb({ reset: true });
  try {
    const t0 = performance.now();
    const w = await generate(bench.ds, { claims: n });
    const s = (performance.now() - t0) / 1000;
    const rows = w.installations + w.claims;
    console.log(
      `generated ${w.manufacturers} manufacturers, ${w.contractors} contractors, ${w.installations.toLocaleString()} installations, ` +
        `${w.claims.toLocaleString()} claims in ${s.toFixed(1)} s`,
    );
    report({ part: 'generate', figure: 'installations + claims inserted', value: rows / s, unit: 'rows/s' });
    report({ part: 'generate', figure: 'claims in the bench database', value: w.claims, unit: 'claims' });
  } finally {
    await bench.close();
  }
}

if (import.meta.url === `file://${process.argv[1]}`) {
  main().catch((err) => {
    console.error(err);
    process.exit(1);
  });
}
