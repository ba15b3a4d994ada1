import { moveClaim } from '../../claims/move-claim';
import type { MoveHandler } from './types';

export const close: MoveHandler<'close'> = async ({ m, claim, payload: p }) => {
  const moved = await moveClaim(m, claim, 'closed');
  const after = { note: p.note ?? null };
  return { moved, after };
};
