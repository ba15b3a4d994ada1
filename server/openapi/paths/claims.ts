import { z } from 'zod';
import { ACTIONS, ACTION_NAMES, type ClaimActionName } from '../../../shared/claims/stages';
import {
  assignClaimSchema,
  queueQuerySchema,
  reviewContractorsQuerySchema,
  reviewReviewersQuerySchema,
} from '../../../shared/claims/workflow';
import { instantSchema, orgRefSchema, pageSchema } from '../../../shared/schemas/answer-parts';
import { attachmentSchema, uploadAttachmentSchema } from '../../../shared/schemas/attachments';
import {
  claimWorkflowSchema,
  queueItemSchema,
  queueSummarySchema,
} from '../../../shared/schemas/claim-workflow';
import { importQuerySchema } from '../../../shared/schemas/catalogue';
import {
  batchRequestSchema,
  CLAIM_STAGES,
  claimBatchFileResultSchema,
  claimBatchResultSchema,
  claimDetailSchema,
  claimListItemSchema,
  claimListQuerySchema,
  createClaimSchema,
  fileClaimSchema,
  updateClaimSchema,
  WAITING_ON,
} from '../../../shared/schemas/claims';
import { itemsOf } from '../answers';
import { op, type Registry } from '../registry';

const tag = 'Claims';
const claimDetail = claimDetailSchema;
const workflow = claimWorkflowSchema;
const attachment = attachmentSchema;

/** Every move the one action route takes (the others have their own routes). */
const MOVES_HERE = ACTION_NAMES.filter((n) => !['file', 'credit', 'void_credit'].includes(n));

function attachmentRoutes(reg: Registry, base: string, what: string) {
  op(reg, {
    method: 'get',
    path: base,
    tag,
    summary: `${what}: the list`,
    answer: { json: itemsOf(attachment) },
  });
  op(reg, {
    method: 'post',
    path: base,
    tag,
    summary: `${what}: upload one (photo or PDF, re-encoded; hostile files refused)`,
    multipart: uploadAttachmentSchema,
    status: 201,
    answer: { json: z.object({ attachment }) },
    errors: [409],
  });
  op(reg, {
    method: 'get',
    path: `${base}/:attachmentId`,
    tag,
    summary: `${what}: one`,
    answer: { json: z.object({ attachment }) },
  });
  op(reg, {
    method: 'get',
    path: `${base}/:attachmentId/content`,
    tag,
    summary: `${what}: download the file`,
    answer: { file: 'application/octet-stream', description: 'The file as stored (an image or a PDF).' },
  });
  op(reg, {
    method: 'get',
    path: `${base}/:attachmentId/thumbnail`,
    tag,
    summary: `${what}: a photo’s thumbnail`,
    answer: { file: 'image/webp', description: 'A small picture of the photo.' },
  });
  op(reg, {
    method: 'delete',
    path: `${base}/:attachmentId`,
    tag,
    summary: `${what}: delete one`,
    status: 204,
    answer: { none: true },
    errors: [409],
  });
}

export function claimPaths(reg: Registry) {
  op(reg, {
    method: 'get',
    path: '/api/claims',
    tag,
    summary: 'The claims you may see',
    query: claimListQuerySchema,
    answer: { json: pageSchema(claimListItemSchema) },
  });
  op(reg, {
    method: 'post',
    path: '/api/claims',
    tag,
    summary: 'Start a draft claim on an installation',
    description: 'A retried request with the same `Idempotency-Key` makes one draft and answers it again.',
    body: createClaimSchema,
    idempotencyKey: 'optional',
    status: 201,
    alsoStatus: 200,
    answer: { json: z.object({ claim: claimDetail }), description: '201 made; 200 when the key replays.' },
  });
  op(reg, {
    method: 'get',
    path: '/api/claims/:id',
    tag,
    summary: 'One claim, all of it',
    answer: { json: z.object({ claim: claimDetail }) },
  });
  op(reg, {
    method: 'patch',
    path: '/api/claims/:id',
    tag,
    summary: 'Change a draft',
    body: updateClaimSchema,
    answer: { json: z.object({ claim: claimDetail }) },
    errors: [409],
  });
  op(reg, {
    method: 'post',
    path: '/api/claims/:id/file',
    tag,
    summary: 'File a draft: the engine evaluates it and the manufacturer is told',
    body: fileClaimSchema,
    idempotencyKey: 'optional',
    answer: { json: z.object({ claim: claimDetail, replayed: z.boolean() }) },
    errors: [409],
  });
  op(reg, {
    method: 'delete',
    path: '/api/claims/:id',
    tag,
    summary: 'Delete a draft',
    status: 204,
    answer: { none: true },
    errors: [409],
  });
  attachmentRoutes(reg, '/api/claims/:id/attachments', 'Evidence');

  op(reg, {
    method: 'post',
    path: '/api/claims/:id/actions/:action',
    tag,
    summary: 'Move a claim: review, ask for information, authorise a return, decide …',
    description:
      'The body is the action’s payload (one of the schemas listed). Filing, crediting and voiding have their ' +
      'own routes (409 `claim.move_elsewhere`). Refusals: 403 `claim.not_allowed`, 409 `claim.invalid_transition`, ' +
      '409 `claim.changed` (moved since `If-Match`).',
    params: z.object({ id: z.uuid(), action: z.enum(MOVES_HERE as [ClaimActionName, ...ClaimActionName[]]) }),
    body: z.union(
      MOVES_HERE.map((n) => ACTIONS[n].schema) as unknown as [z.ZodType, z.ZodType, ...z.ZodType[]],
    ),
    ifMatch: true,
    answer: {
      json: z.object({
        claim: z.object({
          id: z.uuid(),
          stage: z.enum(CLAIM_STAGES),
          version: z.number().int(),
          waitingOn: z.enum(WAITING_ON).nullable(),
        }),
        workflow,
      }),
    },
  });
  op(reg, {
    method: 'post',
    path: '/api/claims/:id/assign',
    tag,
    summary: 'Hand a claim to a reviewer (or back to the queue)',
    body: assignClaimSchema,
    ifMatch: true,
    answer: {
      json: z.object({
        claim: z.object({
          id: z.uuid(),
          stage: z.enum(CLAIM_STAGES),
          version: z.number().int(),
          assigneeId: z.uuid().nullable(),
        }),
      }),
    },
  });
  op(reg, {
    method: 'get',
    path: '/api/claims/:id/workflow',
    tag,
    summary: 'The claim’s review: thread, returns, bench tests, actions',
    answer: { json: workflow },
  });
  op(reg, {
    method: 'get',
    path: '/api/claims/:id/documents/:docId',
    tag,
    summary: 'A document the claim produced (return authorisation, decision letter)',
    answer: { file: 'application/pdf', description: 'The stored PDF; `X-Content-SHA256` carries its hash.' },
  });
  attachmentRoutes(reg, '/api/claims/:id/conversation/uploads', 'Files for the next answer');
  op(reg, {
    method: 'get',
    path: '/api/claims/:id/conversation/files/:fileId',
    tag,
    summary: 'A file sent with an answer',
    answer: { file: 'application/octet-stream', description: 'The file as stored.' },
  });
  op(reg, {
    method: 'get',
    path: '/api/claims/:id/conversation/files/:fileId/thumbnail',
    tag,
    summary: 'A sent photo’s thumbnail',
    answer: { file: 'image/webp', description: 'A small picture of the photo.' },
  });

  op(reg, {
    method: 'get',
    path: '/api/claims/batches/template.csv',
    tag,
    summary: 'The CSV template for filing many claims at once',
    answer: { file: 'text/csv', description: 'The header row the batch import takes.' },
  });
  op(reg, {
    method: 'post',
    path: '/api/claims/batches',
    tag,
    summary: 'Make draft claims from a spreadsheet (`dryRun=true` checks only)',
    query: importQuerySchema,
    body: batchRequestSchema,
    status: 201,
    alsoStatus: 200,
    answer: {
      json: claimBatchResultSchema,
      description: '201 when drafts were made; 200 on a dry run or when none were.',
    },
  });
  op(reg, {
    method: 'get',
    path: '/api/claims/batches/:id',
    tag,
    summary: 'A batch and its claims',
    answer: {
      json: z.object({
        batch: z.object({
          id: z.uuid(),
          filename: z.string(),
          rowCount: z.number().int(),
          createdAt: instantSchema,
          claimIds: z.array(z.uuid()),
        }),
        claims: z.array(claimListItemSchema),
      }),
    },
  });
  op(reg, {
    method: 'post',
    path: '/api/claims/batches/:id/file',
    tag,
    summary: 'File every draft of a batch',
    body: z.strictObject({}),
    answer: { json: claimBatchFileResultSchema },
  });

  const desk = 'Review desk';
  op(reg, {
    method: 'get',
    path: '/api/review/queue',
    tag: desk,
    summary: 'The manufacturer’s review queue',
    query: queueQuerySchema,
    answer: { json: pageSchema(queueItemSchema) },
  });
  op(reg, {
    method: 'get',
    path: '/api/review/summary',
    tag: desk,
    summary: 'Counts for the desk’s header',
    answer: { json: queueSummarySchema },
  });
  op(reg, {
    method: 'get',
    path: '/api/review/contractors',
    tag: desk,
    summary: 'Contractors with filed claims on this manufacturer (the queue’s picker)',
    query: reviewContractorsQuerySchema,
    answer: { json: z.object({ items: z.array(orgRefSchema), more: z.boolean() }) },
  });
  op(reg, {
    method: 'get',
    path: '/api/review/reviewers',
    tag: desk,
    summary: 'The organisation’s active reviewers (to hand a claim to)',
    query: reviewReviewersQuerySchema,
    answer: { json: itemsOf(orgRefSchema) },
  });
}
