import { formatDateTime } from '../../../shared/dates';
import crypto from 'node:crypto';
import { ROLES_BY_KIND, ROLE_LABELS, type Role } from '../../../shared/roles';
import type { InviteUserInput, UpdateUserInput, UserListQuery } from '../../../shared/schemas/users';
import type { SessionUser } from '../../auth/passport';
import type { AppDataSource } from '../../db/data-source';
import { Invitation } from '../../db/entities/invitation.entity';
import { User } from '../../db/entities/user.entity';
import { recordAudit, type Actor } from '../../lib/audit';
import { clock } from '../../lib/clock';
import { crashPoint } from '../../lib/crash-point';
import { AppError, conflict } from '../../lib/errors';
import { enqueueEmail } from '../../lib/outbox';
import { likeContains, parseSort } from '../../lib/pagination';

export const INVITATION_TTL_MS = 7 * 24 * 60 * 60 * 1000;
const SORTS = { name: 'u.name', email: 'u.email', createdAt: 'u.created_at' };

export const hashToken = (token: string) => crypto.createHash('sha256').update(token).digest('hex');

function auditView(u: User) {
  return { email: u.email, name: u.name, roles: u.roles, status: u.status };
}

function checkRolesFit(roles: Role[], kind: SessionUser['organization']['kind']) {
  const allowed = ROLES_BY_KIND[kind];
  const bad = roles.filter((r) => !allowed.includes(r));
  if (bad.length) {
    throw new AppError(400, 'validation.failed', 'The request body has invalid fields.', [
      {
        path: 'roles',
        message: `A ${kind} cannot have the role ${bad.map((r) => ROLE_LABELS[r]).join(', ')}.`,
      },
    ]);
  }
}

export function createUsersService(ds: AppDataSource, opts: { publicUrl: (path: string) => string }) {
  const users = ds.getRepository(User);

  return {
    async list(organizationId: string, q: UserListQuery) {
      const sort = parseSort(q.sort, SORTS)!;
      const qb = users
        .createQueryBuilder('u')
        .where('u.organization_id = :org', { org: organizationId })
        .orderBy(sort.column, sort.direction)
        .addOrderBy('u.id', 'ASC')
        .skip((q.page - 1) * q.pageSize)
        .take(q.pageSize);
      if (q.status) qb.andWhere('u.status = :status', { status: q.status });
      if (q.q) qb.andWhere('(u.name LIKE :q OR u.email LIKE :q)', { q: likeContains(q.q) });
      const [items, total] = await qb.getManyAndCount();
      return { items, total };
    },

    findById(id: string) {
      return users.findOne({ where: { id } });
    },

    async invite(inviter: SessionUser, input: InviteUserInput, actor: Actor) {
      checkRolesFit(input.roles, inviter.organization.kind);
      const token = crypto.randomBytes(32).toString('base64url');
      const expiresAt = new Date(clock.nowMs() + INVITATION_TTL_MS);
      return ds.transaction(async (m) => {
        if (await m.exists(User, { where: { email: input.email } })) {
          throw conflict('user.email_taken', 'Someone already uses that e-mail address.');
        }
        const user = m.create(User, {
          organizationId: inviter.organization.id,
          email: input.email,
          name: input.name,
          roles: input.roles,
          status: 'invited',
          passwordHash: null,
        });
        await m.save(user);
        await crashPoint('user.invite.after_user', m);
        await m.insert(Invitation, {
          userId: user.id,
          tokenHash: hashToken(token),
          expiresAt,
          usedAt: null,
          createdById: inviter.id,
        });
        await recordAudit(m, actor, {
          action: 'user.invited',
          entityType: 'User',
          entityId: user.id,
          after: auditView(user),
        });
        await enqueueEmail(m, {
          to: [user.email],
          template: 'invitation',
          view: {
            name: user.name,
            inviterName: inviter.name,
            organizationName: inviter.organization.name,
            rolesText: input.roles.map((r) => ROLE_LABELS[r].toLowerCase()).join(' and '),
            link: opts.publicUrl(`/invitations/${token}`),
            // In the inviting organisation's zone and locale (shared/dates.ts), to the minute.
            expiresOn: formatDateTime(expiresAt, inviter.organization),
          },
        });
        await crashPoint('user.invite.before_commit', m);
        return { user, token };
      });
    },

    async update(editor: SessionUser, target: User, input: UpdateUserInput, actor: Actor) {
      if (input.roles) checkRolesFit(input.roles, editor.organization.kind);
      if (target.id === editor.id && input.roles && !input.roles.includes('administrator')) {
        throw conflict('user.self_demotion', 'You cannot remove your own administrator role.');
      }
      if (target.status === 'invited' && input.status === 'active') {
        throw conflict('user.not_accepted', 'This person has not accepted the invitation yet.');
      }
      return ds.transaction(async (m) => {
        const before = auditView(target);
        const patch: Partial<User> = {};
        if (input.name !== undefined) patch.name = input.name;
        if (input.roles !== undefined) patch.roles = input.roles;
        if (input.status !== undefined) patch.status = input.status;
        const result = await m
          .createQueryBuilder()
          .update(User)
          .set({ ...patch, version: () => 'version + 1' })
          .where('id = :id AND version = :v', { id: target.id, v: target.version })
          .execute();
        if (!result.affected)
          throw conflict('user.changed', 'Someone else changed this user just now. Reload and try again.');
        const after = await m.findOneByOrFail(User, { id: target.id });
        if (after.status === 'disabled') {
          // Sessions end at once: the session rows go, and every request re-checks the user's status anyway.
          await m.query('DELETE FROM sessions WHERE data LIKE ?', [`%"user":"${after.id}"%`]);
        }
        const action =
          input.status === 'disabled'
            ? 'user.disabled'
            : input.status === 'active'
              ? 'user.enabled'
              : 'user.updated';
        await recordAudit(m, actor, {
          action,
          entityType: 'User',
          entityId: after.id,
          before,
          after: auditView(after),
        });
        return after;
      });
    },
  };
}
