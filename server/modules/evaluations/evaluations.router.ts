import { Router } from 'express';
import { evaluateClaim, evaluationInputSchema } from '../../../shared/engine';
import { authorizeType, requireUser } from '../../middleware/auth';
import { parseBody } from '../../middleware/validate';

// The engine as an API for signed-in users and manufacturers' own systems: the same JSON as ENGINE.md.
export function evaluationsRouter() {
  const r = Router();
  r.post('/', requireUser, (req, res) => {
    const input = parseBody(evaluationInputSchema, req);
    authorizeType(req, 'create', 'Evaluation');
    res.json(evaluateClaim(input));
  });
  return r;
}
