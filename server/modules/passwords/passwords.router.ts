import { Router } from 'express';
import {
  changePasswordSchema,
  forgotPasswordSchema,
  PASSWORD_RESET_MINUTES,
  resetPasswordSchema,
} from '../../../shared/schemas/auth';
import type { AppContext } from '../../context';
import { actorFromRequest } from '../../lib/audit';
import { requireUser } from '../../middleware/auth';
import { parseBody } from '../../middleware/validate';
import { createPasswordsService } from './passwords.service';

// Password recovery ("forgot password", then the e-mailed link) needs no sign-in: the link's token is the
// credential. Changing the password does, and asks for the current one.
export function passwordsRouter(ctx: AppContext) {
  const r = Router();
  const service = createPasswordsService(ctx);

  r.post('/forgot', async (req, res) => {
    const { email } = parseBody(forgotPasswordSchema, req);
    await service.admitResetRequest(email, req.ip ?? 'unknown');
    // The same answer, after the same work, whether or not the address belongs to an account: looking the
    // account up and writing its link happen after the answer has gone.
    res.status(202).json({
      ok: true,
      message: `If this address belongs to an active account, a link to choose a new password is on its way. It works once, for ${PASSWORD_RESET_MINUTES} minutes.`,
    });
    const requestId = String(req.id);
    service
      .sendResetLink(email, requestId)
      .catch((err: unknown) => ctx.logger.error({ err, requestId }, 'password reset link not sent'));
  });

  r.post('/reset', async (req, res) => {
    const input = parseBody(resetPasswordSchema, req);
    const done = await service.resetPassword(input.token, input.password, String(req.id));
    res.json({ ok: true, email: done.email });
  });

  r.post('/change', requireUser, async (req, res) => {
    const input = parseBody(changePasswordSchema, req);
    await service.changePassword(req.user!.id, input, actorFromRequest(req), req.sessionID);
    res.json({ ok: true });
  });

  return r;
}
