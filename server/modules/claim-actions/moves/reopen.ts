import { Decision } from '../../../db/entities/decision.entity';
import { moveClaim } from '../../claims/move-claim';
import type { MoveHandler } from './types';

export const reopen: MoveHandler<'reopen'> = async ({ m, claim, now, parties, tell, payload: p }) => {
  const moved = await moveClaim(m, claim, 'in_review');
  await m.update(Decision, { currentClaimId: claim.id }, { currentClaimId: null, supersededAt: now });
  const after = { reason: p.reason };
  await tell('contractor', {
    headline: `${parties.manufacturer.name} reopened its decision`,
    quote: p.reason,
    nextStep: 'The claim is back in review; a new decision and letter will follow.',
  });
  return { moved, after };
};
