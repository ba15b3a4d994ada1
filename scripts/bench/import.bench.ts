// npm run bench:import
// Imports 10,000 installation rows (two serials each) from CSV through the real import service, on the private
// MariaDB of its own (profile "bench-import", port DB_PORT + 5, emptied first), and
// beside it, as the baseline, raw multi-row INSERTs of the same installation and serial rows, in turn for
// BENCH_IMPORT_ROUNDS rounds (3). Prints each round, then the medians' rows per second and ratio; asserts nothing.
import crypto from 'node:crypto';
import Papa from 'papaparse';
import { loadConfig } from '../../server/config/env';
import { createDataSource } from '../../server/db/data-source';
import { Organization } from '../../server/db/entities/organization.entity';
import { ProductModel } from '../../server/db/entities/product-model.entity';
import {
  createInstallationsService,
  INSTALLATION_COLUMNS,
} from '../../server/modules/installations/installations.service';
import { resetDatabase, startLocalDb } from '../lib/mariadb';

const ROWS = Number(process.env.BENCH_ROWS ?? 10_000);
// Rounds of preview, import and raw INSERTs in turn (new serials each round); the medians are printed. One round
// each gave ratios from 0.45 to 0.66x in one evening, as the machine's speed moved between the two timings.
const ROUNDS = Number(process.env.BENCH_IMPORT_ROUNDS ?? 3);

async function main() {
  const config = loadConfig();
  const db = await startLocalDb({
    dataDir: config.dataDir,
    profile: 'bench-import',
    port: config.dbPort + 5,
    log: () => {},
  });
  await resetDatabase(db);
  const ds = createDataSource(db.url, { poolSize: 2 });
  await ds.initialize();
  await ds.runMigrations({ transaction: 'each' });
  try {
    const orgs = ds.getRepository(Organization);
    const mfr = await orgs.save(orgs.create({ name: 'Bench Lighting', kind: 'manufacturer' }));
    const contractor = await orgs.save(orgs.create({ name: 'Bench Electric', kind: 'contractor' }));
    const products = ds.getRepository(ProductModel);
    const product = await products.save(
      products.create({
        manufacturerId: mfr.id,
        modelNumber: 'BENCH-HB150',
        name: 'Bench high-bay',
        family: 'high_bay',
        ratedInputWatts: 150,
        inputVoltsMin: 120,
        inputVoltsMax: 277,
        ratedLumens: 21000,
        ledStrings: 24,
        ledsPerString: 16,
        ledForwardVolts: 3,
        driverOutputAmps: 2.8,
        driverMaxOutputVolts: 60,
        location: 'damp',
        enclosedRated: false,
        dimming: '0-10v',
        ambientMaxC: 50,
        ratedLifeHours: 100000,
        activeCooling: false,
      }),
    );
    const row = (i: number, tag: string) => ({
      manufacturer: mfr.name,
      model_number: product.modelNumber,
      site_name: `Site ${i}`,
      site_address: `${i} Bench Road`,
      site_city: 'Benchton',
      site_region: 'WA',
      site_postal_code: '98000',
      quantity: '2',
      serials: `${tag}-${i}-A;${tag}-${i}-B`,
      install_date: '2024-03-18',
      purchase_date: '2024-02-27',
      distributor: 'Bench Supply',
      invoice_number: `INV-${i}`,
      location: 'damp',
      enclosure: 'open',
      dimmer: 'none',
      nominal_supply_volts: '277',
      hours_per_day: '16',
      ambient_c: '25',
    });
    const service = createInstallationsService(ds);
    const actor = { userId: null, organizationId: contractor.id };
    const round = async (r: number) => {
      const csv = Papa.unparse({
        fields: INSTALLATION_COLUMNS.map((c) => c.column),
        data: Array.from({ length: ROWS }, (_, i) =>
          INSTALLATION_COLUMNS.map((c) => row(i, `IMP${r}`)[c.column as keyof ReturnType<typeof row>]),
        ),
      });
      if (r === 0) console.log(`CSV: ${ROWS.toLocaleString()} rows, ${(csv.length / 1e6).toFixed(1)} MB`);

      let t0 = performance.now();
      const preview = await service.importRows(contractor.id, { csv }, true, actor);
      const previewMs = performance.now() - t0;
      t0 = performance.now();
      const done = await service.importRows(contractor.id, { csv }, false, actor);
      const importMs = performance.now() - t0;
      if (done.imported !== ROWS || preview.valid !== ROWS)
        throw new Error(`expected ${ROWS} rows, got preview ${preview.valid}, imported ${done.imported}`);

      // Baseline: the same rows as raw multi-row INSERTs (500 installations or 1000 serials a statement), in
      // one transaction, with no parsing, validation, duplicate checks, version lookup or audit rows.
      t0 = performance.now();
      await ds.transaction(async (m) => {
        const ids = Array.from({ length: ROWS }, () => crypto.randomUUID());
        const cols =
          'id, contractor_id, manufacturer_id, product_model_id, policy_version_id, site_name, site_address, site_city, site_region, site_postal_code, quantity, install_date, purchase_date, distributor, invoice_number, location, enclosure, dimmer, nominal_supply_volts, hours_per_day, ambient_c, created_by_id, version';
        for (let i = 0; i < ROWS; i += 500) {
          const n = Math.min(500, ROWS - i);
          const params: unknown[] = [];
          for (let k = 0; k < n; k++) {
            const j = i + k;
            params.push(
              ids[j],
              contractor.id,
              mfr.id,
              product.id,
              null,
              `Site ${j}`,
              `${j} Bench Road`,
              'Benchton',
              'WA',
              '98000',
              2,
              '2024-03-18',
              '2024-02-27',
              'Bench Supply',
              `INV-${j}`,
              'damp',
              'open',
              'none',
              277,
              16,
              25,
              null,
              1,
            );
          }
          await m.query(
            `INSERT INTO installations (${cols}) VALUES ${Array(n)
              .fill(`(${Array(23).fill('?').join(',')})`)
              .join(',')}`,
            params,
          );
        }
        const units = ids.flatMap((id, j) =>
          [`RAW${r}-${j}-A`, `RAW${r}-${j}-B`].map((s) => [crypto.randomUUID(), mfr.id, product.id, id, s]),
        );
        for (let i = 0; i < units.length; i += 1000) {
          const part = units.slice(i, i + 1000);
          await m.query(
            `INSERT INTO installation_units (id, manufacturer_id, product_model_id, installation_id, serial) VALUES ${part.map(() => '(?,?,?,?,?)').join(',')}`,
            part.flat(),
          );
        }
      });
      const rawMs = performance.now() - t0;
      return { previewMs, importMs, rawMs };
    };
    const rounds = [];
    for (let r = 0; r < ROUNDS; r++) {
      const got = await round(r);
      rounds.push(got);
      console.log(
        `  round ${r + 1}: preview ${(got.previewMs / 1000).toFixed(2)} s, import ${(got.importMs / 1000).toFixed(2)} s, raw ${(got.rawMs / 1000).toFixed(2)} s (${(got.rawMs / got.importMs).toFixed(2)}x)`,
      );
    }
    const mid = (xs: number[]) => [...xs].sort((x, y) => x - y)[Math.floor(xs.length / 2)];
    const previewMs = mid(rounds.map((x) => x.previewMs));
    const importMs = mid(rounds.map((x) => x.importMs));
    const rawMs = mid(rounds.map((x) => x.rawMs));

    const rate = (ms: number) => Math.round(ROWS / (ms / 1000)).toLocaleString();
    console.log(
      `preview (dry run, nothing written): ${(previewMs / 1000).toFixed(2)} s, ${rate(previewMs)} rows/s`,
    );
    console.log(
      `import (validate + write + audit):   ${(importMs / 1000).toFixed(2)} s, ${rate(importMs)} rows/s`,
    );
    console.log(`baseline raw multi-row INSERT:       ${(rawMs / 1000).toFixed(2)} s, ${rate(rawMs)} rows/s`);
    console.log(
      `import takes ${(importMs / rawMs).toFixed(2)}x the raw INSERT time for the same rows (medians of ${ROUNDS} rounds)`,
    );
  } finally {
    await ds.destroy();
    await db.stop();
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
