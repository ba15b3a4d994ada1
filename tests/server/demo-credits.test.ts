import { afterAll, beforeAll, expect, it } from 'vitest';
import { Claim } from '../../server/db/entities/claim.entity';
import { CreditMemo } from '../../server/db/entities/credit-memo.entity';
import { Organization } from '../../server/db/entities/organization.entity';
import { OutboxMessage } from '../../server/db/entities/outbox-message.entity';
import { seedDemo } from '../../server/db/seed/demo';
import { seedDemoCredits } from '../../server/db/seed/demo-credits';
import { createStorage } from '../../server/lib/storage';
import { checkLedger } from '../../server/modules/credits/ledger-check';
import { MEMO_NUMBER_PATTERN } from '../../shared/credits/memo-number';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
  const credits = { storage: createStorage(t.config), config: t.config };
  await seedDemo(t.ds, { onlyIfEmpty: false, credits });
  // Another test file may have loaded the demo without its credits first (the test database is shared).
  const ald = await t.ds.getRepository(Organization).findOneByOrFail({ name: 'Aldercrest Lighting' });
  if ((await t.ds.getRepository(CreditMemo).countBy({ manufacturerId: ald.id })) === 0) {
    await seedDemoCredits(t.ds, credits.storage, t.config);
  }
}, 120_000);
afterAll(() => closeTestApp(t));

it('the demo holds memos, a reversal, and at least five approved, not yet credited claims per manufacturer', async () => {
  for (const name of ['Aldercrest Lighting', 'Veltra Luminaires']) {
    const mfr = await t.ds.getRepository(Organization).findOneByOrFail({ name });
    const approved = await t.ds.getRepository(Claim).countBy({ manufacturerId: mfr.id, stage: 'approved' });
    expect(approved).toBeGreaterThanOrEqual(5);
    const memos = await t.ds.getRepository(CreditMemo).findBy({ manufacturerId: mfr.id });
    expect(memos.filter((m) => m.kind === 'credit').length).toBeGreaterThanOrEqual(2);
    for (const m of memos) expect(m.number).toMatch(MEMO_NUMBER_PATTERN);
    const report = await checkLedger(t.ds, { manufacturerId: mfr.id });
    // Left open: the reliability history (demo-reliability.ts) writes ~190 old claims straight to `credited`
    // with no memo; crediting them through the service would render as many memo PDFs at every start, and
    // closing them instead changes the analytics. Only those claims' messages are set aside here: every
    // credited claim of the claims demo has its memo.
    const historyOnly: { number: string }[] = await t.ds.query(
      `SELECT c.number FROM claims c WHERE c.manufacturer_id = ? AND c.stage = 'credited'
          AND NOT EXISTS (SELECT 1 FROM audit_events a WHERE a.entity_id = c.id AND a.action = 'claim.filed')`,
      [mfr.id],
    );
    const history = new Set(historyOnly.map((c) => `claim ${c.number} is credited with 0 standing memos`));
    expect(report.problems.filter((p) => !history.has(p))).toEqual([]);
  }
  const ald = await t.ds.getRepository(Organization).findOneByOrFail({ name: 'Aldercrest Lighting' });
  const reversals = await t.ds.getRepository(CreditMemo).findBy({ manufacturerId: ald.id, kind: 'reversal' });
  expect(reversals).toHaveLength(1);
  expect(reversals[0].reason).toContain('Credited twice');
  expect(
    await t.ds
      .getRepository(OutboxMessage)
      .createQueryBuilder('o')
      .where("o.template = 'credit-memo'")
      .getCount(),
  ).toBeGreaterThan(0);
  // The memos were spread over past months, not all issued today.
  const months = new Set(
    (await t.ds.getRepository(CreditMemo).findBy({ manufacturerId: ald.id })).map((m) =>
      m.issuedAt.toISOString().slice(0, 7),
    ),
  );
  expect(months.size).toBeGreaterThan(1);
});
