import crypto from 'node:crypto';
import { In } from 'typeorm';
import { formatDateTime } from '../../../shared/dates';
import {
  DEFAULT_WAITING_MAIL_MODE,
  WAITING_TEXT,
  type WaitingMailMode,
} from '../../../shared/schemas/waiting';
import type { SessionUser } from '../../auth/passport';
import type { AppDataSource } from '../../db/data-source';
import { User } from '../../db/entities/user.entity';
import { WaitingMailSetting } from '../../db/entities/waiting-mail-setting.entity';
import { WaitingRead } from '../../db/entities/waiting-read.entity';
import { clock } from '../../lib/clock';
import { enqueueEmail } from '../../lib/outbox';
import { itemsFor } from './waiting.service';

// The "waits on me" e-mail: at once (each new item, looked for every few minutes), a daily summary, or none.
// Every message carries an unsubscribe link that works without signing in: the user's id signed with HMAC-SHA256
// under the session secret, so it cannot be forged for someone else and needs no stored token.

const DAY_MS = 24 * 60 * 60 * 1000;
const PURPOSE = 'lumenproof.waiting-unsubscribe.v1';

const macOf = (secret: string, userId: string) =>
  crypto.createHmac('sha256', secret).update(`${PURPOSE}:${userId}`).digest('base64url');

export const unsubscribeToken = (secret: string, userId: string) => `${userId}.${macOf(secret, userId)}`;

/** The user id a token was made for, or null for anything forged, truncated or malformed. */
export function verifyUnsubscribeToken(secret: string, token: string): string | null {
  const m = /^([0-9a-f-]{36})\.([A-Za-z0-9_-]{43})$/.exec(token);
  if (!m) return null;
  const expected = Buffer.from(macOf(secret, m[1]));
  const given = Buffer.from(m[2]);
  return expected.length === given.length && crypto.timingSafeEqual(expected, given) ? m[1] : null;
}

export async function mailModeOf(ds: AppDataSource, userId: string): Promise<WaitingMailMode> {
  return (
    (await ds.getRepository(WaitingMailSetting).findOneBy({ userId }))?.mode ?? DEFAULT_WAITING_MAIL_MODE
  );
}

export async function setMailMode(ds: AppDataSource, userId: string, mode: WaitingMailMode) {
  await ds.getRepository(WaitingMailSetting).upsert({ userId, mode }, ['userId']);
}

/** One pass: every active person whose choice and clock say a message is due gets one. Returns how many. */
export async function sendWaitingMail(
  ds: AppDataSource,
  opts: { secret: string; publicUrl: (path: string) => string; userIds?: string[] },
): Promise<number> {
  const now = clock.now();
  const users = (await ds.getRepository(User).find({
    // userIds: a pass over some people only (a test, a resend); otherwise everyone active.
    where: { status: 'active', ...(opts.userIds ? { id: In(opts.userIds) } : {}) },
    relations: { organization: true },
  })) as SessionUser[];
  const settings = new Map(
    (await ds.getRepository(WaitingMailSetting).find()).map((s) => [s.userId, s] as const),
  );
  let sent = 0;
  for (const user of users) {
    const setting = settings.get(user.id);
    const mode = setting?.mode ?? DEFAULT_WAITING_MAIL_MODE;
    if (mode === 'none') continue;
    const last = setting?.lastSentAt ?? null;
    if (mode === 'daily' && last && now.getTime() - last.getTime() < DAY_MS) continue;
    const items = await itemsFor(ds, user);
    if (!items.length) continue;
    const read = new Set(
      (
        await ds.getRepository(WaitingRead).findBy({ userId: user.id, itemKey: In(items.map((i) => i.key)) })
      ).map((r) => r.itemKey),
    );
    const unread = items.filter((i) => !read.has(i.key));
    // At once: only what is new since the last message; a summary: everything still unread.
    const due =
      mode === 'immediate' && last ? unread.filter((i) => Date.parse(i.since) > last.getTime()) : unread;
    if (!due.length) continue;
    const rule = user.organization;
    await ds.transaction(async (m) => {
      await enqueueEmail(m, {
        to: [user.email],
        template: 'waiting',
        view: {
          name: user.name,
          summary: mode === 'daily',
          count: due.length,
          items: due.map((i) => ({
            text: WAITING_TEXT[i.kind],
            claimNumber: i.claimNumber,
            siteName: i.siteName,
            since: formatDateTime(i.since, rule),
            link: opts.publicUrl(i.link),
          })),
          listLink: opts.publicUrl('/waiting'),
          unsubscribeLink: opts.publicUrl(
            `/api/waiting/unsubscribe/${unsubscribeToken(opts.secret, user.id)}`,
          ),
        },
      });
      await m.upsert(WaitingMailSetting, { userId: user.id, mode, lastSentAt: now }, ['userId']);
    });
    sent++;
  }
  return sent;
}

/** Every five minutes: "at once" means within a few minutes, and the daily summary goes at most once a day. */
export function startWaitingMail(
  ds: AppDataSource,
  opts: { secret: string; publicUrl: (path: string) => string },
  logger: { error: (o: object, m: string) => void },
) {
  const run = () =>
    void sendWaitingMail(ds, opts).catch((err: unknown) =>
      logger.error({ err }, 'could not send the waiting-on-you e-mail'),
    );
  const timer = setInterval(run, 5 * 60 * 1000);
  timer.unref();
  return { stop: () => clearInterval(timer) };
}
