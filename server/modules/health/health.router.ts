import { Router } from 'express';
import type { AppContext } from '../../context';

export function healthRouter(ctx: AppContext) {
  const r = Router();
  r.get('/', async (_req, res) => {
    try {
      await ctx.ds.query('SELECT 1');
      res.json({ ok: true, db: 'up' });
    } catch {
      res.status(503).json({ ok: false, db: 'down' });
    }
  });
  return r;
}
