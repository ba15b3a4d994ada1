import { Router } from 'express';
import type { AppContext } from '../../context';
import { authorizeType, requireUser } from '../../middleware/auth';
import { organizationMailbox } from './mailbox.service';

// Demo mode only: lets an administrator read what the fake SMTP server received for their own organisation.
export function mailboxRouter(ctx: AppContext) {
  const r = Router();
  r.use(requireUser);
  r.get('/', async (req, res) => {
    authorizeType(req, 'read', 'Mailbox');
    const items = await organizationMailbox(ctx.ds, ctx.config.mailboxDir, req.user!.organizationId);
    res.json({ items, total: items.length, page: 1, pageSize: items.length });
  });
  return r;
}
