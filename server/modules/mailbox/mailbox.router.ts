import { Router } from 'express';
import type { AppContext } from '../../context';
import { User } from '../../db/entities/user.entity';
import { authorizeType, requireUser } from '../../middleware/auth';
import { readMailbox } from './mailbox.service';

// Demo mode only: lets an administrator read what the fake SMTP server received for their own organisation.
export function mailboxRouter(ctx: AppContext) {
  const r = Router();
  r.use(requireUser);
  r.get('/', async (req, res) => {
    authorizeType(req, 'read', 'Mailbox');
    const members = await ctx.ds
      .getRepository(User)
      .find({ where: { organizationId: req.user!.organizationId }, select: { email: true } });
    const emails = new Set(members.map((m) => m.email.toLowerCase()));
    const items = (await readMailbox(ctx.config.mailboxDir)).filter((m) => m.to.some((t) => emails.has(t)));
    res.json({ items, total: items.length, page: 1, pageSize: items.length });
  });
  return r;
}
