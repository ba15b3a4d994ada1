import crypto from 'node:crypto';
import { addDays, INFO_RESPONSE_DAYS } from '../../../../shared/claims/workflow';
import { ClaimMessage } from '../../../db/entities/claim-message.entity';
import { moveClaim } from '../../claims/move-claim';
import type { MoveHandler } from './types';

export const requestInfo: MoveHandler<'request_info'> = async ({
  m,
  claim,
  user,
  today,
  parties,
  tell,
  payload: p,
}) => {
  const moved = await moveClaim(m, claim, 'needs_info');
  const msg = m.create(ClaimMessage, {
    id: crypto.randomUUID(),
    claimId: claim.id,
    kind: 'info_request',
    authorOrgId: user.organizationId,
    authorId: user.id,
    body: p.message,
    dueOn: addDays(today, INFO_RESPONSE_DAYS),
    answeredAt: null,
  });
  await m.insert(ClaimMessage, msg);
  const after = { messageId: msg.id, dueOn: msg.dueOn };
  await tell('contractor', {
    headline: `${parties.manufacturer.name} needs more information`,
    intro: `The reviewer asks:`,
    quote: p.message,
    details: [{ label: 'Please answer by', date: msg.dueOn! }],
    nextStep:
      'Answer on the claim, with photos or documents if they help. The claim returns to review when you do.',
  });
  return { moved, after };
};
