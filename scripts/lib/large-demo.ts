import { newClaimNumber } from '../../shared/claims/claim-number';
import type { AppDataSource } from '../../server/db/data-source';
import { Claim } from '../../server/db/entities/claim.entity';
import { Installation } from '../../server/db/entities/installation.entity';
import { Organization } from '../../server/db/entities/organization.entity';
import { ProductModel } from '../../server/db/entities/product-model.entity';
import { installationRow, loadStoryInputs } from '../../server/db/seed/demo-reliability';
import { generateStory, prng, stageFor, storyUuid } from '../../server/db/seed/reliability-story';

// The large demo: the demo's reliability story scaled to about 1,000,000 installed units and 100,000 claims,
// bulk-inserted with multi-row INSERTs on top of the ordinary demo. Its sites are named "Large demo ..." so a
// second run replaces them. Claims carry the engine's verdict 'covered' without the stored evaluation (the
// analytics read symptoms and site observations); they are for measuring, not for reading one by one.

export const LARGE_STORY = {
  months: 36,
  perMonth: 78,
  quantity: [12, 60] as [number, number],
  scaleFactor: 0.165,
  seed: 1_000_003,
};

export async function generateLarge(
  ds: AppDataSource,
  opts: { today: string; log?: (s: string) => void } = { today: new Date().toISOString().slice(0, 10) },
) {
  const log = opts.log ?? console.log;
  const names = ['Harborview Electric', 'Copperline Electrical'];
  const contractors = await Promise.all(
    names.map((name) => ds.getRepository(Organization).findOneByOrFail({ name })),
  );
  const makers = await ds.getRepository(Organization).findBy({ kind: 'manufacturer' });
  const demoMakers = makers.filter((o) => o.name === 'Aldercrest Lighting' || o.name === 'Veltra Luminaires');
  const products = (await ds.getRepository(ProductModel).find()).filter((p) =>
    demoMakers.some((o) => o.id === p.manufacturerId),
  );

  log('Removing an earlier large demo, if any...');
  await ds.query(
    `DELETE c FROM claims c JOIN installations i ON i.id = c.installation_id WHERE i.site_name LIKE 'Large demo %'`,
  );
  await ds.query(`DELETE FROM installations WHERE site_name LIKE 'Large demo %'`);

  const versionsByModel = await loadStoryInputs(ds.manager, products);
  const { installations, claims } = generateStory(
    products,
    versionsByModel,
    contractors.map((c) => c.id),
    { ...LARGE_STORY, today: opts.today },
  );
  const units = installations.reduce((n, i) => n + i.quantity, 0);
  log(
    `Inserting ${installations.length.toLocaleString('en-US')} installations (${units.toLocaleString('en-US')} units)...`,
  );
  const started = Date.now();
  for (let i = 0; i < installations.length; i += 1000) {
    const rows = installations.slice(i, i + 1000).map((inst) => ({
      ...installationRow(inst),
      siteName: `Large demo ${installationRow(inst).siteName}`.slice(0, 160),
    }));
    await ds.createQueryBuilder().insert().into(Installation).values(rows).updateEntity(false).execute();
  }

  const rand = prng(77);
  const existing: { number: string }[] = await ds.query('SELECT number FROM claims WHERE number IS NOT NULL');
  const numbers = new Set(existing.map((r) => r.number));
  log(`Inserting ${claims.length.toLocaleString('en-US')} claims...`);
  for (let i = 0; i < claims.length; i += 1000) {
    const rows = claims.slice(i, i + 1000).map((c) => {
      const { stage, waitingOn, decidedOn } = stageFor('covered', c.filedOn, opts.today, rand);
      let number = newClaimNumber(new Date(`${c.filedOn}T12:00:00Z`), (n) => Math.floor(rand() * n));
      while (numbers.has(number))
        number = newClaimNumber(new Date(`${c.filedOn}T12:00:00Z`), (n) => Math.floor(rand() * n));
      numbers.add(number);
      const filedAt = new Date(`${c.filedOn}T15:00:00Z`);
      return {
        id: storyUuid(rand),
        number,
        contractorId: c.installation.contractorId,
        manufacturerId: c.installation.manufacturerId,
        installationId: c.installation.id,
        productModelId: c.installation.productModelId,
        policyVersionId: c.installation.policyVersionId,
        stage,
        stageChangedAt: decidedOn ? new Date(`${decidedOn}T16:00:00Z`) : filedAt,
        waitingOn,
        units: c.units,
        serials: [],
        failedOn: c.failedOn,
        symptoms: c.symptoms,
        measurements: {},
        observations: c.observations,
        narrative: 'Large demo claim.',
        evaluation: null,
        verdict: 'covered' as const,
        filedAt,
      };
    });
    await ds.createQueryBuilder().insert().into(Claim).values(rows).updateEntity(false).execute();
    if ((i / 1000) % 20 === 0) log(`  ${(i + rows.length).toLocaleString('en-US')} claims`);
  }
  log(
    `Done in ${((Date.now() - started) / 1000).toFixed(1)} s: ${units.toLocaleString('en-US')} units, ${claims.length.toLocaleString('en-US')} claims.`,
  );
  return { installations: installations.length, units, claims: claims.length };
}
