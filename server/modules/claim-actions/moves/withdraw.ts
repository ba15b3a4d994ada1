import { moveClaim } from '../../claims/move-claim';
import type { MoveHandler } from './types';

export const withdraw: MoveHandler<'withdraw'> = async ({ m, claim, parties, tell, payload: p }) => {
  const moved = await moveClaim(m, claim, 'withdrawn');
  const after = { reason: p.reason ?? null };
  // A draft was never shown to the manufacturer: nobody there to tell.
  if (claim.stage !== 'draft') {
    await tell('manufacturer', {
      headline: `${parties.contractor.name} withdrew the claim`,
      quote: p.reason,
      nextStep: 'Nothing: the claim is closed.',
    });
  }
  return { moved, after };
};
