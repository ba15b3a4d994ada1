import { Router } from 'express';
import {
  queueQuerySchema,
  reviewContractorsQuerySchema,
  reviewReviewersQuerySchema,
} from '../../../shared/claims/workflow';
import type { AppContext } from '../../context';
import { clock } from '../../lib/clock';
import { pageOf } from '../../lib/pagination';
import { authorizeNew, authorizeType, requireUser } from '../../middleware/auth';
import { parseQuery } from '../../middleware/validate';
import { presentDeskOption, presentQueueItem, presentQueueSummary } from './review.presenter';
import { createReviewService } from './review.service';

// The reviewer's desk: GET /api/review/queue, GET /api/review/summary (counts for the home panel), and the names
// behind the desk's pickers: GET /api/review/contractors and GET /api/review/reviewers (review.service.ts).

export function reviewRouter(ctx: AppContext) {
  const r = Router();
  const service = createReviewService(ctx.ds);
  r.use(requireUser);

  r.get('/queue', async (req, res) => {
    authorizeType(req, 'review', 'Claim');
    const q = parseQuery(queueQuerySchema, req);
    const { rows, total } = await service.queue(req.ability, req.user!.id, q);
    const now = clock.now();
    res.json(
      pageOf(
        rows.map((row) => presentQueueItem(row, now)),
        total,
        q,
      ),
    );
  });

  r.get('/summary', async (req, res) => {
    authorizeType(req, 'review', 'Claim');
    res.json(presentQueueSummary(await service.summary(req.ability, req.user!.id), clock.now()));
  });

  r.get('/contractors', async (req, res) => {
    const q = parseQuery(reviewContractorsQuerySchema, req);
    authorizeNew(req, 'read', 'Organization', { kind: 'contractor' });
    const { rows, more } = await service.contractors(req.ability, q);
    res.json({ items: rows.map(presentDeskOption), more });
  });

  r.get('/reviewers', async (req, res) => {
    parseQuery(reviewReviewersQuerySchema, req);
    authorizeType(req, 'review', 'Claim');
    const reviewers = await service.reviewers(req.user!.organizationId);
    res.json({ items: reviewers.map(presentDeskOption) });
  });

  return r;
}
