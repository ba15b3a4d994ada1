import crypto from 'node:crypto';
import { In, type EntityManager } from 'typeorm';
import { newClaimNumber } from '../../../shared/claims/claim-number';
import { engineContextFrom, engineInputFor } from '../../../shared/claims/engine-input';
import { ACTIONS, type ClaimActionName } from '../../../shared/claims/stages';
import { safeEvaluateClaim } from '../../../shared/engine';
import type { ClaimFields, ClaimStage, Symptom } from '../../../shared/schemas/claims';
import { recordAuditMany, type Actor } from '../../lib/audit';
import { clock } from '../../lib/clock';
import { Claim } from '../entities/claim.entity';
import { InstallationUnit } from '../entities/installation-unit.entity';
import type { Organization } from '../entities/organization.entity';
import type { User } from '../entities/user.entity';
import { WarrantyPolicyVersion } from '../entities/warranty-policy-version.entity';
import type { DemoCatalogue } from './demo-catalogue';
import type { EvidencePlan } from './demo-evidence';

// The demo's claims: both contractors against both manufacturers, at every stage the stage machine has, with
// readings a meter would show for each model's LED topology. Here the stages are set, each with the audit rows of
// the moves that lead to it; demo-workflow adds each stage's own rows (decisions and letters, questions, returns)
// and demo-credits credits the oldest approved claims through the credits service, so a `credited` slot below is
// seeded `approved` and gets its memo, its ledger entry and its one `claim.credited` row from there. Fixed seed.
// Returns the claims and, per claim, the evidence its evaluation counted, which demo-evidence then attaches.

function prng(seed: number) {
  let s = seed >>> 0;
  return () => {
    s = (s * 1664525 + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

/** Per manufacturer, in turn: at least 5 approved-not-credited in every 16 (API.md's demo needs). */
const STAGE_ROTATION: ClaimStage[] = [
  'filed',
  'approved',
  'in_review',
  'needs_info',
  'approved',
  'draft',
  'return_requested',
  'unit_received',
  'approved',
  'denied',
  'credited',
  'approved',
  'closed',
  'withdrawn',
  'approved',
  'filed',
];

/** The moves from filed to each stage (stage machine action names). */
const maxIso = (a: string, b: string) => (a > b ? a : b);

const PATHS: Record<ClaimStage, ClaimActionName[]> = {
  draft: [],
  filed: ['file'],
  in_review: ['file', 'start_review'],
  needs_info: ['file', 'start_review', 'request_info'],
  return_requested: ['file', 'start_review', 'request_return'],
  unit_received: ['file', 'start_review', 'request_return', 'receive_unit'],
  approved: ['file', 'start_review', 'approve'],
  denied: ['file', 'start_review', 'deny'],
  credited: ['file', 'start_review', 'approve', 'credit'],
  closed: ['file', 'start_review', 'deny', 'close'],
  withdrawn: ['file', 'withdraw'],
};

const WAITING: Partial<Record<ClaimStage, 'manufacturer' | 'contractor'>> = {
  filed: 'manufacturer',
  in_review: 'manufacturer',
  unit_received: 'manufacturer',
  approved: 'manufacturer',
  needs_info: 'contractor',
  return_requested: 'contractor',
};

const NARRATIVES = [
  'Half the fixture went dark after a storm week; the rest still lights. Checked the breaker and the splice, both fine.',
  'Driver cycles on and off every few seconds once warm. Swapped nothing; readings taken from the lift.',
  'Customer reported flicker for two weeks, now three strings are out. No water marks inside.',
  'Fixture is completely dark. Supply present at the whip; no output from the driver.',
  'Light output visibly lower than the neighbouring fixtures of the same batch, colour gone slightly pink.',
  'Fan stopped and the housing runs hot; the unit dims itself after twenty minutes.',
];

const addDays = (iso: string, days: number) =>
  new Date(Date.parse(`${iso}T00:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);
const round = (v: number, d: number) => Number(v.toFixed(d));

export async function seedDemoClaims(
  m: EntityManager,
  orgs: Map<string, Organization>,
  users: Map<string, User>,
  catalogue: DemoCatalogue,
) {
  const rand = prng(5150);
  const products = new Map([...catalogue.products.values()].map((p) => [p.id, p]));
  const instIds = catalogue.installations.map((i) => i.id);
  const unitRows = await m.find(InstallationUnit, {
    where: { installationId: In(instIds) },
    select: { installationId: true, serial: true },
  });
  const serialsOf = new Map<string, string[]>();
  for (const u of unitRows)
    serialsOf.set(u.installationId, [...(serialsOf.get(u.installationId) ?? []), u.serial]);
  const versionIds = [
    ...new Set(catalogue.installations.map((i) => i.policyVersionId).filter((x): x is string => !!x)),
  ];
  const versions = new Map(
    (await m.find(WarrantyPolicyVersion, { where: { id: In(versionIds) } })).map((v) => [v.id, v]),
  );

  const installerOf = (orgId: string) =>
    [...users.values()].find((u) => u.organizationId === orgId && u.roles.includes('installer'))!;
  const reviewerOf = (orgId: string) =>
    [...users.values()].find((u) => u.organizationId === orgId && u.roles.includes('reviewer')) ?? null;
  const accountantOf = (orgId: string) =>
    [...users.values()].find((u) => u.organizationId === orgId && u.roles.includes('accountant')) ?? null;
  const turn = new Map<string, number>();
  const today = clock.now().toISOString().slice(0, 10);
  const claims: Claim[] = [];
  const audits: { actor: Actor; action: string; entityId: string; after: Record<string, unknown> }[] = [];
  const evidence = new Map<string, EvidencePlan>();

  // Two passes over the installations: the demo needs at least 60 claims, there are 68 sites.
  for (const inst of catalogue.installations) {
    const p = products.get(inst.productModelId)!;
    const serials = serialsOf.get(inst.id) ?? [];
    const k = turn.get(inst.manufacturerId) ?? 0;
    turn.set(inst.manufacturerId, k + 1);
    const slot = STAGE_ROTATION[k % STAGE_ROTATION.length];
    const stage: ClaimStage = slot === 'credited' ? 'approved' : slot;
    const v = inst.policyVersionId ? (versions.get(inst.policyVersionId) ?? null) : null;
    if (!v && stage !== 'draft') continue; // nothing to claim against

    const ageDays = Math.max(
      30,
      Math.floor((Date.parse(today) - Date.parse(inst.installDate)) / 86_400_000) - 20,
    );
    // A claim still waiting on someone failed in the last couple of months (a reviewer's desk holds weeks, not
    // years); a decided one may be from any time in the fixture's life.
    const when = rand();
    const waiting = ['filed', 'in_review', 'needs_info', 'return_requested', 'unit_received'].includes(stage);
    const failedOn = waiting
      ? maxIso(addDays(inst.installDate, 30), addDays(today, -(25 + Math.floor(when * 45))))
      : addDays(inst.installDate, Math.floor(30 + when * (ageDays - 30)));
    const filedOn = addDays(failedOn, 2 + Math.floor(rand() * 12));
    const units = serials.length
      ? 1 + Math.floor(rand() * Math.min(3, serials.length))
      : 1 + Math.floor(rand() * 2);
    const mode = Math.floor(rand() * 6);
    const symptoms: Symptom[] = [
      ['partly_dark'],
      ['cycling'],
      ['flicker', 'partly_dark'],
      ['dark'],
      ['dim', 'color_shift'],
      ['fan_noise', 'dim'],
    ][mode] as Symptom[];
    const nominal = inst.nominalSupplyVolts;
    const stringVolts = p.ledsPerString * p.ledForwardVolts;
    const share = p.driverOutputAmps / p.ledStrings;
    const darkStrings =
      mode === 0 || mode === 2 ? 1 + Math.floor(rand() * Math.max(1, Math.floor(p.ledStrings / 3))) : 0;
    const strings = Array.from({ length: Math.min(p.ledStrings, 12) }, (_, i) =>
      i < darkStrings
        ? { volts: round(stringVolts * (1.05 + rand() * 0.05), 1), amps: 0, darkLeds: p.ledsPerString }
        : {
            volts: round(stringVolts * (0.98 + rand() * 0.03), 1),
            amps: round(share * (0.95 + rand() * 0.1), 3),
          },
    );
    const fields: ClaimFields = {
      serials: serials.slice(0, units),
      units,
      failedOn,
      symptoms,
      measurements:
        mode === 3
          ? { supplyVolts: round(nominal * (0.97 + rand() * 0.05), 1), inputWatts: 0 }
          : {
              supplyVolts: round(nominal * (0.96 + rand() * 0.07), 1),
              inputWatts: round(p.ratedInputWatts * (0.9 + rand() * 0.1), 1),
              powerFactor: round(0.9 + rand() * 0.08, 2),
              driverOutputVolts: round(stringVolts * (1 + rand() * 0.04), 1),
              driverOutputAmps: round(
                p.driverOutputAmps * (darkStrings ? 1 - darkStrings / p.ledStrings : 0.98 + rand() * 0.03),
                3,
              ),
              strings,
            },
      observations: {
        debrisIngress: mode === 5 && rand() < 0.5,
        waterIngress: rand() < 0.08,
        physicalDamage: rand() < 0.05,
        fanStopped: mode === 5 && p.activeCooling,
        burnMarks: rand() < 0.04,
      },
      narrative: NARRATIVES[mode],
    };
    const installer = installerOf(inst.contractorId);
    const filedAt = new Date(
      `${filedOn}T${String(7 + Math.floor(rand() * 10)).padStart(2, '0')}:${String(Math.floor(rand() * 60)).padStart(2, '0')}:00Z`,
    );
    const claim = m.create(Claim, {
      id: crypto.randomUUID(),
      number: null,
      contractorId: inst.contractorId,
      manufacturerId: inst.manufacturerId,
      installationId: inst.id,
      productModelId: p.id,
      policyVersionId: inst.policyVersionId,
      stage,
      stageChangedAt:
        stage === 'draft' ? clock.now() : new Date(filedAt.getTime() + PATHS[stage].length * 2 * 86_400_000),
      waitingOn: WAITING[stage] ?? null,
      units: fields.units!,
      serials: fields.serials!,
      failedOn,
      symptoms,
      measurements: fields.measurements!,
      observations: fields.observations!,
      narrative: fields.narrative!,
      evaluation: null,
      engineVersion: null,
      evaluatedAt: null,
      verdict: null,
      expectedCredit: null,
      currency: null,
      filedAt: null,
      filedById: null,
      batchId: null,
      assignedReviewerId: null,
      createdById: installer.id,
      version: 1,
    });
    const cActor: Actor = { userId: installer.id, organizationId: inst.contractorId };
    audits.push({
      actor: cActor,
      action: 'claim.created',
      entityId: claim.id,
      after: { stage: 'draft', installationId: inst.id, source: 'demo' },
    });
    if (stage !== 'draft' && v) {
      const ctx = engineContextFrom(p, v, inst);
      // The evidence the engine counts is the evidence demo-evidence attaches: nameplate, failure and site photos
      // (and on some a second site view), and the invoice on most.
      const plan: EvidencePlan = { photos: 3 + Math.floor(rand() * 2), proofOfPurchase: rand() < 0.9 };
      const r = safeEvaluateClaim(engineInputFor(ctx, fields, plan, filedOn));
      if (!r.ok) continue;
      evidence.set(claim.id, plan);
      const e = r.evaluation;
      Object.assign(claim, {
        number: newClaimNumber(filedAt, (n) => Math.floor(rand() * n)),
        evaluation: e,
        engineVersion: e.engineVersion,
        evaluatedAt: filedAt,
        verdict: e.verdict,
        expectedCredit: e.computed.credit,
        currency: e.computed.currency,
        filedAt,
        filedById: installer.id,
      });
      const reviewer = reviewerOf(inst.manufacturerId);
      const accountant = accountantOf(inst.manufacturerId);
      let from: ClaimStage = 'draft';
      for (const a of PATHS[stage]) {
        const def = ACTIONS[a];
        const to = (Array.isArray(def.to) ? def.to[0] : def.to) as ClaimStage;
        const who = def.side === 'contractor' ? installer : a === 'credit' ? accountant : reviewer;
        audits.push({
          actor: {
            userId: who?.id ?? null,
            organizationId: def.side === 'contractor' ? inst.contractorId : inst.manufacturerId,
          },
          action: def.audit,
          entityId: claim.id,
          after: {
            from,
            stage: to,
            ...(a === 'file'
              ? { number: claim.number, verdict: e.verdict, engineVersion: e.engineVersion }
              : {}),
            source: 'demo',
          },
        });
        from = to;
      }
    }
    // A draft has its nameplate photo so far.
    if (stage === 'draft') evidence.set(claim.id, { photos: 1, proofOfPurchase: false });
    claims.push(claim);
  }
  await m.save(claims, { chunk: 50 });
  for (const a of audits)
    await recordAuditMany(m, a.actor, [
      { action: a.action, entityType: 'Claim', entityId: a.entityId, after: a.after },
    ]);
  void orgs;
  return { claims, evidence };
}
