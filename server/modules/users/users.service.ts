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
import { AppError, AuditedRefusal, conflict } from '../../lib/errors';
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
        // An address already in use answers like a new one unless the inviter's own organisation holds it: whether
        // another organisation has an account for it is that organisation's business (issue 13). Its owner gets an
        // e-mail saying so, with no link that could move their account.
        const existing = await m.findOne(User, {
          where: { email: input.email },
          relations: { organization: true },
        });
        if (existing?.organizationId === inviter.organization.id) {
          throw conflict(
            'user.email_taken',
            'Someone in your organisation already uses that e-mail address.',
          );
        }
        await recordAudit(m, actor, {
          action: 'user.invitation_requested',
          entityType: 'Organization',
          entityId: inviter.organization.id,
          after: { email: input.email, roles: input.roles },
        });
        if (existing) {
          await enqueueEmail(m, {
            to: [existing.email],
            template: 'invitation-address-in-use',
            view: {
              name: existing.name,
              inviterName: inviter.name,
              organizationName: inviter.organization.name,
              ownOrganizationName: existing.organization?.name ?? '',
              rolesText: input.roles.map((r) => ROLE_LABELS[r].toLowerCase()).join(' and '),
            },
          });
          return { user: null, token: null };
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
      // Four eyes: an administrator's own roles are changed by another administrator, never by themself (one could
      // otherwise make themself reviewer and accountant and approve and pay a claim alone).
      if (
        target.id === editor.id &&
        input.roles &&
        [...input.roles].sort().join() !== [...target.roles].sort().join()
      ) {
        throw new AuditedRefusal(
          403,
          'user.own_roles',
          'Your own roles are changed by another administrator of your organisation.',
          {
            action: 'user.roles_refused',
            entityType: 'User',
            entityId: target.id,
            after: { roles: input.roles },
          },
        );
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
