import crypto from 'node:crypto';
import { newClaimNumber } from '../../../shared/claims/claim-number';
import { toDecimal } from '../../../shared/credits/money';
import type { Symptom } from '../../../shared/schemas/claims';
import type { AppConfig } from '../../config/env';
import { clock } from '../../lib/clock';
import type { Storage } from '../../lib/storage';
import { approvedAmountOf, createCreditsService } from '../../modules/credits/credits.service';
import type { AppDataSource } from '../data-source';
import { AccountingMap } from '../entities/accounting-map.entity';
import { Claim } from '../entities/claim.entity';
import { Installation } from '../entities/installation.entity';
import { Organization } from '../entities/organization.entity';
import { User } from '../entities/user.entity';
import { WarrantyPolicyVersion } from '../entities/warranty-policy-version.entity';

// The credits part of the demo: for each manufacturer, fourteen approved claims from both contractors, six of
// them credited through the real issuing service (memos numbered, PDFs stored, ledger entries, e-mails) over the
// past months, and one of Aldercrest's memos voided by a reversal. That leaves at least eight approved claims per
// manufacturer waiting for a credit. Until the claims demo carries its own approved claims, these are them.

const DAY = 86_400_000;
const SYMPTOM_CYCLE: Symptom[] = ['partly_dark', 'cycling', 'dark', 'dim', 'flicker'];
const NARRATIVES = [
  'Three strings dark on the north aisle fixture; nameplate and failure photos attached.',
  'Driver cycles on and off every few minutes at full output; replaced unit on site.',
  'Fixture went fully dark after a storm-free week; supply measured within rating.',
  'Output visibly lower than the neighbouring fixtures from the same lot.',
  'Flicker at all dimming levels on a non-dimmed circuit.',
];

/** Small deterministic generator so the scenario is the same on every load. */
function prng(seed: number) {
  let s = seed >>> 0;
  return () => {
    s = (s * 1664525 + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

export async function seedDemoCredits(ds: AppDataSource, storage: Storage, config: AppConfig) {
  const orgs = await ds.getRepository(Organization).find();
  const byName = (n: string) => orgs.find((o) => o.name === n);
  const users = await ds.getRepository(User).find();
  const service = createCreditsService(ds, storage, (p) =>
    new URL(p, config.publicUrl ?? 'http://127.0.0.1:3000').toString(),
  );
  const rand = prng(7007);

  for (const [mfrName, accountantEmail, voidOne] of [
    ['Aldercrest Lighting', 'ada@aldercrest.test', true],
    ['Veltra Luminaires', 'vera@veltra.test', false],
  ] as const) {
    const mfr = byName(mfrName);
    const accountant = users.find((u) => u.email === accountantEmail);
    if (!mfr || !accountant) continue;
    const installations = await ds
      .getRepository(Installation)
      .find({ where: { manufacturerId: mfr.id }, order: { siteName: 'ASC' } });
    const versions = new Map(
      (await ds.getRepository(WarrantyPolicyVersion).find()).map((v) => [v.id, v] as const),
    );
    // The claims demo's own approved claims (engine-evaluated, with their audit trail) when there are enough
    // to credit some and still leave five; otherwise claims of our own.
    const existing = (
      await ds.getRepository(Claim).find({ where: { manufacturerId: mfr.id, stage: 'approved' } })
    ).filter((c) => approvedAmountOf(c));
    const claims: Claim[] = existing.length >= 7 ? existing : [];
    const now = clock.nowMs();
    for (let n = 0; n < 14 && installations.length && existing.length < 7; n++) {
      const inst = installations[(n * 5) % installations.length];
      const version = inst.policyVersionId ? versions.get(inst.policyVersionId) : undefined;
      const units = 1 + Math.floor(rand() * Math.min(4, inst.quantity));
      const unitCredit = version?.unitCredit ?? '75.00';
      // Some approvals are partly prorated: a share of the unit credit, to the cent (half-up, common practice).
      const share = n % 3 === 0 ? toDecimal('0.6') : toDecimal(1);
      const amount = toDecimal(unitCredit).times(units).times(share).toFixed(2);
      const approvedAt = new Date(now - Math.floor((5 + n * 11 + rand() * 9) * DAY));
      const filedAt = new Date(approvedAt.getTime() - Math.floor((6 + rand() * 20) * DAY));
      claims.push(
        ds.getRepository(Claim).create({
          number: newClaimNumber(filedAt),
          contractorId: inst.contractorId,
          manufacturerId: mfr.id,
          installationId: inst.id,
          productModelId: inst.productModelId,
          policyVersionId: inst.policyVersionId,
          stage: 'approved',
          stageChangedAt: approvedAt,
          waitingOn: null,
          units,
          serials: [],
          failedOn: new Date(filedAt.getTime() - 9 * DAY).toISOString().slice(0, 10),
          symptoms: [SYMPTOM_CYCLE[n % SYMPTOM_CYCLE.length]],
          measurements: {},
          observations: {},
          narrative: NARRATIVES[n % NARRATIVES.length],
          evaluation: null,
          engineVersion: null,
          evaluatedAt: null,
          verdict: null,
          expectedCredit: amount,
          currency: version?.currency ?? 'USD',
          filedAt,
          filedById:
            users.find((u) => u.organizationId === inst.contractorId && u.roles.includes('installer'))?.id ??
            null,
          batchId: null,
          assignedReviewerId: null,
          createdById: null,
        }),
      );
    }
    if (!existing.length || existing.length < 7)
      await ds.getRepository(Claim).save(claims.filter((c) => !c.id));

    const who = {
      id: accountant.id,
      roles: accountant.roles,
      organization: { id: mfr.id, kind: 'manufacturer' as const },
    };
    const actor = { userId: accountant.id, organizationId: mfr.id };
    // The oldest approvals were credited, each a few days after approval: the clock is set back to then so the
    // memos, ledger and cost-by-month read like months of work (and put right again after).
    const oldest = [...claims]
      .sort((a, b) => a.stageChangedAt.getTime() - b.stageChangedAt.getTime())
      .slice(0, existing.length >= 7 ? Math.min(6, existing.length - 5) : 6);
    const issued: string[] = [];
    try {
      for (const c of oldest) {
        clock.reset();
        clock.advance(c.stageChangedAt.getTime() + 3 * DAY - clock.nowMs());
        const r = await service.issue(
          c.id,
          who,
          actor,
          {},
          { key: crypto.randomUUID(), path: `/api/claims/${c.id}/credits`, body: {} },
        );
        issued.push((r.body as { creditMemo: { id: string } }).creditMemo.id);
      }
      if (voidOne && issued.length > 1) {
        clock.reset();
        clock.advance(-2 * DAY);
        await service.voidMemo(
          issued[1],
          who,
          actor,
          'Credited twice for the same failed units: already settled on replacement order RO-2291.',
        );
      }
    } finally {
      clock.reset();
    }
  }

  // Aldercrest's accountant has mapped the journal's accounts (invented demo codes); Veltra's has not yet, so the
  // demo shows both.
  const aldercrest = byName('Aldercrest Lighting');
  if (aldercrest)
    await ds.getRepository(AccountingMap).insert({
      organizationId: aldercrest.id,
      debitAccountCode: '5410',
      debitAccountName: 'Warranty credits to contractors',
      creditAccountCode: '2440',
      creditAccountName: 'Contractor credits payable',
      journalCode: 'WC',
      updatedById: users.find((u) => u.email === 'ada@aldercrest.test')?.id ?? null,
    });
}
