import crypto from 'node:crypto';
import { In, IsNull } from 'typeorm';
import { CONVERSATION_DRAFT, CONVERSATION_SENT } from '../../../../shared/claims/workflow';
import { Attachment } from '../../../db/entities/attachment.entity';
import { ClaimMessage } from '../../../db/entities/claim-message.entity';
import { moveClaim } from '../../claims/move-claim';
import { AppError } from '../../../lib/errors';
import type { MoveHandler } from './types';

export const answerInfo: MoveHandler<'answer_info'> = async ({
  m,
  claim,
  user,
  now,
  parties,
  tell,
  payload: p,
}) => {
  const moved = await moveClaim(m, claim, 'in_review');
  const open = await m.findOne(ClaimMessage, {
    where: { claimId: claim.id, kind: 'info_request', answeredAt: IsNull() },
    order: { createdAt: 'DESC' },
  });
  if (open) await m.update(ClaimMessage, { id: open.id }, { answeredAt: now });
  const msg = m.create(ClaimMessage, {
    id: crypto.randomUUID(),
    claimId: claim.id,
    kind: 'info_answer',
    authorOrgId: user.organizationId,
    authorId: user.id,
    body: p.message,
    dueOn: null,
    answeredAt: null,
  });
  await m.insert(ClaimMessage, msg);
  const ids = [...new Set(p.attachmentIds ?? [])];
  if (ids.length) {
    // Only the sender's own files, uploaded for this claim's thread and not yet sent with an answer.
    const files = await m.find(Attachment, {
      where: {
        id: In(ids),
        ownerType: CONVERSATION_DRAFT,
        ownerId: claim.id,
        organizationId: user.organizationId,
      },
    });
    if (files.length !== ids.length) {
      throw new AppError(400, 'validation.failed', 'The request body has invalid fields.', [
        {
          path: 'attachmentIds',
          message: 'Attach only files you uploaded to this claim’s conversation.',
        },
      ]);
    }
    await m.update(Attachment, { id: In(ids) }, { ownerType: CONVERSATION_SENT, ownerId: msg.id });
  }
  const after = { messageId: msg.id, attachments: ids.length, answers: open?.id ?? null };
  await tell('manufacturer', {
    headline: `${parties.contractor.name} answered your question`,
    quote: p.message,
    details: ids.length ? [{ label: 'Files attached', value: String(ids.length) }] : [],
    nextStep: 'The claim is back in review.',
  });
  return { moved, after };
};
