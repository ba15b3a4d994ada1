import type { EntityManager } from 'typeorm';
import type { Claim } from '../../db/entities/claim.entity';
import { User } from '../../db/entities/user.entity';
import { AppError } from '../../lib/errors';

/** The named user, if an active reviewer of the claim's manufacturer; else a 400 on the payload's field. */
export async function assertReviewer(m: EntityManager, claim: Claim, userId: string, path: string) {
  const u = await m.findOne(User, {
    where: { id: userId, organizationId: claim.manufacturerId, status: 'active' },
  });
  if (!u || !u.roles.includes('reviewer')) {
    throw new AppError(400, 'validation.failed', 'The request body has invalid fields.', [
      { path, message: 'Choose an active reviewer of the manufacturer.' },
    ]);
  }
  return u;
}
