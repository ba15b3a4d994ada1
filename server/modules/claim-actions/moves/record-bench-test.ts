import type { EntityManager } from 'typeorm';
import type { ActionPayload } from '../../../../shared/claims/stages';
import { engineContextFrom, engineInputFor } from '../../../../shared/claims/engine-input';
import { safeEvaluateClaim } from '../../../../shared/engine';
import { Attachment } from '../../../db/entities/attachment.entity';
import type { Claim } from '../../../db/entities/claim.entity';
import { WarrantyPolicyVersion } from '../../../db/entities/warranty-policy-version.entity';
import { AppError } from '../../../lib/errors';
import { loadParties } from '../claim-documents';
import crypto from 'node:crypto';
import { BenchTest } from '../../../db/entities/bench-test.entity';
import { ReturnAuthorization } from '../../../db/entities/return-authorization.entity';
import { moveClaim } from '../../claims/move-claim';
import type { MoveHandler } from './types';

/** The engine's word on the bench readings, everything else judged as at filing. */
async function benchEvaluation(
  m: EntityManager,
  claim: Claim,
  readings: ActionPayload<'record_bench_test'>['readings'],
  now: Date,
) {
  const parties = await loadParties(m, claim);
  const version = claim.policyVersionId
    ? await m.findOneBy(WarrantyPolicyVersion, { id: claim.policyVersionId })
    : null;
  const p = parties.product;
  const i = parties.installation;
  const engineCtx = engineContextFrom(
    {
      ratedInputWatts: p.ratedInputWatts,
      inputVoltsMin: p.inputVoltsMin,
      inputVoltsMax: p.inputVoltsMax,
      ledStrings: p.ledStrings,
      ledsPerString: p.ledsPerString,
      ledForwardVolts: p.ledForwardVolts,
      driverOutputAmps: p.driverOutputAmps,
      driverMaxOutputVolts: p.driverMaxOutputVolts,
      location: p.location,
      enclosedRated: p.enclosedRated,
      dimming: p.dimming,
      ambientMaxC: p.ambientMaxC,
      ratedLifeHours: p.ratedLifeHours,
    },
    version,
    i,
  );
  const files = await m.find(Attachment, { where: { ownerType: 'claim', ownerId: claim.id } });
  const input = engineInputFor(
    engineCtx,
    {
      serials: claim.serials,
      units: claim.units ?? undefined,
      failedOn: claim.failedOn,
      symptoms: claim.symptoms,
      // Replaced by the bench readings below.
      measurements: undefined,
      observations: claim.observations,
      narrative: claim.narrative,
    },
    {
      photos: files.filter((f) => f.kind === 'photo').length,
      proofOfPurchase: files.some((f) => f.purpose === 'proof_of_purchase'),
    },
    claim.filedAt ? claim.filedAt.toISOString().slice(0, 10) : now.toISOString().slice(0, 10),
  ) as { claim: { measurements: unknown } };
  // The bench readings replace the field readings; everything else is judged as at filing.
  input.claim.measurements = readings;
  const result = safeEvaluateClaim(input);
  if (!result.ok) {
    throw new AppError(
      422,
      'claim.bench_unevaluable',
      'The engine could not evaluate these bench readings.',
      result.issues,
    );
  }
  return result.evaluation;
}

export const recordBenchTest: MoveHandler<'record_bench_test'> = async ({
  m,
  claim,
  user,
  now,
  to,
  payload: p,
}) => {
  const evaluationNow = await benchEvaluation(m, claim, p.readings, now);
  const moved = await moveClaim(m, claim, to);
  const ra = await m.findOne(ReturnAuthorization, {
    where: { claimId: claim.id },
    order: { createdAt: 'DESC' },
  });
  const test = m.create(BenchTest, {
    id: crypto.randomUUID(),
    claimId: claim.id,
    returnAuthorizationId: ra?.id ?? null,
    testedOn: p.testedOn,
    result: p.result,
    readings: p.readings,
    evaluation: evaluationNow,
    engineVersion: evaluationNow.engineVersion,
    note: p.note ?? null,
    testedById: user.id,
  });
  await m.insert(BenchTest, test);
  const after = {
    benchTestId: test.id,
    result: p.result,
    verdict: evaluationNow.verdict,
    filingVerdict: claim.verdict,
  };
  return { moved, after };
};
