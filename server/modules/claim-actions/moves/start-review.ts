import { moveClaim } from '../../claims/move-claim';
import { assertReviewer } from '../assert-reviewer';
import type { MoveHandler } from './types';

export const startReview: MoveHandler<'start_review'> = async ({ m, claim, user, payload: p }) => {
  const assignee = p.assigneeId ?? user.id;
  if (p.assigneeId) await assertReviewer(m, claim, p.assigneeId, 'assigneeId');
  const moved = await moveClaim(m, claim, 'in_review', { assignedReviewerId: assignee });
  const after = { assigneeId: assignee };
  return { moved, after };
};
