import { Router } from 'express';
import type { AppContext } from '../../context';
import { databaseUp } from './health.service';

export function healthRouter(ctx: AppContext) {
  const r = Router();
  r.get('/', async (_req, res) => {
    if (await databaseUp(ctx.ds)) res.json({ ok: true, db: 'up' });
    else res.status(503).json({ ok: false, db: 'down' });
  });
  return r;
}
