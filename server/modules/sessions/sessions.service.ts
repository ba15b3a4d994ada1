import crypto from 'node:crypto';
import Bowser from 'bowser';
import type { Request } from 'express';
import type { SessionDto } from '../../../shared/schemas/security';
import { ABSOLUTE_TIMEOUT_MS } from '../../auth/session';
import type { SessionUser } from '../../auth/passport';
import type { AppContext } from '../../context';
import { readRows } from '../../db/read';
import { recordAudit } from '../../lib/audit';
import { clock } from '../../lib/clock';
import { AppError } from '../../lib/errors';

type Row = { session_id: string; data: string };
type Data = { createdAt?: number; lastSeenAt?: number; userAgent?: string; ip?: string };

/** A session's public id: a hash of its cookie value, which itself is a credential and never leaves the server. */
export const publicSessionId = (sid: string) =>
  crypto.createHash('sha256').update(sid).digest('hex').slice(0, 32);

/** "Chrome 120 on Linux" from the user agent (bowser); "Unknown browser" without one. */
export function describeDevice(userAgent: string | undefined): string {
  if (!userAgent) return 'Unknown browser';
  try {
    const ua = Bowser.parse(userAgent);
    const browser = ua.browser.name
      ? `${ua.browser.name}${ua.browser.version ? ` ${ua.browser.version.split('.')[0]}` : ''}`
      : 'Unknown browser';
    const os = ua.os.name ? ` on ${ua.os.name}${ua.os.versionName ? ` ${ua.os.versionName}` : ''}` : '';
    return `${browser}${os}`;
  } catch {
    return 'Unknown browser';
  }
}

const iso = (ms: number | undefined) => (ms ? new Date(ms).toISOString() : null);

export function createSessionsService(ctx: AppContext) {
  const { ds } = ctx;

  /** The user's live sessions (sessions.user_id is a virtual column of the session's JSON, indexed). */
  async function rows(userId: string) {
    const list = await readRows<Row>(
      ds,
      'SELECT session_id, data FROM sessions WHERE user_id = ? AND expires >= ?',
      [userId, Math.floor(clock.nowMs() / 1000)],
    );
    const oldest = clock.nowMs() - ABSOLUTE_TIMEOUT_MS;
    return list
      .map((r) => ({ sid: r.session_id, data: JSON.parse(r.data) as Data }))
      .filter((r) => !r.data.createdAt || r.data.createdAt >= oldest);
  }

  return {
    async list(req: Request, user: SessionUser): Promise<SessionDto[]> {
      const list = await rows(user.id);
      const items = list.map(({ sid, data }) => {
        // This request's own session may be newer in memory than its row (saved after the answer).
        const d: Data = sid === req.sessionID ? { ...data, ...req.session } : data;
        return {
          id: publicSessionId(sid),
          device: describeDevice(d.userAgent),
          ip: d.ip || null,
          signedInAt: iso(d.createdAt),
          lastSeenAt: iso(d.lastSeenAt),
          current: sid === req.sessionID,
        };
      });
      return items.sort(
        (a, b) =>
          Number(b.current) - Number(a.current) || (b.lastSeenAt ?? '').localeCompare(a.lastSeenAt ?? ''),
      );
    },

    async endOne(req: Request, user: SessionUser, id: string) {
      const target = (await rows(user.id)).find((r) => publicSessionId(r.sid) === id);
      if (!target) throw new AppError(404, 'session.not_found', 'That session has already ended.');
      if (target.sid === req.sessionID)
        throw new AppError(409, 'session.current', 'This is the session you are using: sign out instead.');
      await ds.transaction(async (m) => {
        await m.query('DELETE FROM sessions WHERE session_id = ? AND user_id = ?', [target.sid, user.id]);
        await recordAudit(
          m,
          { userId: user.id, organizationId: user.organizationId, requestId: String(req.id) },
          {
            action: 'user.sessions_ended',
            entityType: 'User',
            entityId: user.id,
            after: { ended: 1, device: describeDevice(target.data.userAgent), ip: req.ip ?? null },
          },
        );
      });
    },

    async endOthers(req: Request, user: SessionUser) {
      return ds.transaction(async (m) => {
        const result: { affectedRows?: number } = await m.query(
          'DELETE FROM sessions WHERE user_id = ? AND session_id <> ?',
          [user.id, req.sessionID],
        );
        const ended = result.affectedRows ?? 0;
        await recordAudit(
          m,
          { userId: user.id, organizationId: user.organizationId, requestId: String(req.id) },
          {
            action: 'user.sessions_ended',
            entityType: 'User',
            entityId: user.id,
            after: { ended, everywhereElse: true, ip: req.ip ?? null },
          },
        );
        return ended;
      });
    },
  };
}
