import { Router } from 'express';
import { IsNull } from 'typeorm';
import { z } from 'zod';
import { acceptInvitationSchema } from '../../../shared/schemas/auth';
import { assertPasswordAllowed } from '../../auth/password-policy';
import { hashPassword } from '../../auth/passwords';
import type { AppContext } from '../../context';
import { Invitation } from '../../db/entities/invitation.entity';
import { User } from '../../db/entities/user.entity';
import { recordAudit } from '../../lib/audit';
import { clock } from '../../lib/clock';
import { AppError } from '../../lib/errors';
import { parseBody, parseWith } from '../../middleware/validate';
import { hashToken } from '../users/users.service';

const tokenParam = z.strictObject({
  token: z.string().regex(/^[A-Za-z0-9_-]{20,100}$/, 'Not a valid link.'),
});
const gone = () =>
  new AppError(
    404,
    'invitation.not_found',
    'This invitation link is not valid any more. Ask your administrator for a new one.',
  );

// No sign-in: the one-time token is the credential.
export function invitationsRouter(ctx: AppContext) {
  const r = Router();

  async function load(token: string) {
    const inv = await ctx.ds.getRepository(Invitation).findOne({
      where: { tokenHash: hashToken(token), usedAt: IsNull() },
      relations: { user: { organization: true } },
    });
    if (!inv || inv.expiresAt.getTime() < clock.nowMs() || inv.user.status !== 'invited') throw gone();
    return inv;
  }

  r.get('/:token', async (req, res) => {
    const { token } = parseWith(tokenParam, req.params, 'link');
    const inv = await load(token);
    res.json({
      invitation: {
        email: inv.user.email,
        name: inv.user.name,
        organization: { name: inv.user.organization.name, kind: inv.user.organization.kind },
        expiresAt: inv.expiresAt.toISOString(),
      },
    });
  });

  r.post('/:token/accept', async (req, res) => {
    const { token } = parseWith(tokenParam, req.params, 'link');
    const input = parseBody(acceptInvitationSchema, req);
    const inv = await load(token);
    assertPasswordAllowed(input.password, 'password', inv.user.email);
    const passwordHash = await hashPassword(input.password);
    await ctx.ds.transaction(async (m) => {
      const used = await m.update(Invitation, { id: inv.id, usedAt: IsNull() }, { usedAt: clock.now() });
      if (!used.affected) throw gone();
      await m.update(
        User,
        { id: inv.userId },
        { passwordHash, status: 'active', ...(input.name ? { name: input.name } : {}) },
      );
      await recordAudit(
        m,
        { userId: inv.userId, organizationId: inv.user.organizationId, requestId: String(req.id) },
        { action: 'user.joined', entityType: 'User', entityId: inv.userId, after: { status: 'active' } },
      );
    });
    res.json({ ok: true, email: inv.user.email });
  });

  return r;
}
