import { IsNull, type EntityManager } from 'typeorm';
import type { Claim } from '../../../db/entities/claim.entity';
import { ReturnAuthorization } from '../../../db/entities/return-authorization.entity';
import { conflict } from '../../../lib/errors';

/** The claim's open return authorisation (the newest not yet received); a 409 when there is none. */
export async function openReturnOf(m: EntityManager, claim: Pick<Claim, 'id'>) {
  const ra = await m.findOne(ReturnAuthorization, {
    where: { claimId: claim.id, receivedOn: IsNull() },
    order: { createdAt: 'DESC' },
  });
  if (!ra) throw conflict('claim.invalid_transition', 'There is no open return authorisation on this claim.');
  return ra;
}
