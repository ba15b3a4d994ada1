import nodemailer, { type Transporter } from 'nodemailer';
import type { EntityManager } from 'typeorm';
import type { AppConfig } from '../config/env';
import type { AppDataSource } from '../db/data-source';
import { OutboxMessage, type OutboxAttachment } from '../db/entities/outbox-message.entity';
import { clock } from './clock';
import type { Logger } from './logger';
import { renderEmail } from './templates';

/** Queues an e-mail in the caller's transaction: it is sent only if that transaction commits. */
export async function enqueueEmail(
  manager: EntityManager,
  msg: { to: string[]; template: string; view: Record<string, unknown>; attachments?: OutboxAttachment[] },
) {
  const rendered = renderEmail(msg.template, msg.view);
  await manager.insert(OutboxMessage, {
    template: msg.template,
    to: msg.to.join(', '),
    subject: rendered.subject,
    text: rendered.text,
    html: rendered.html,
    attachments: msg.attachments ?? null,
    status: 'pending',
    attempts: 0,
    nextAttemptAt: clock.now(),
  });
}

export function createTransport(config: AppConfig): Transporter {
  return nodemailer.createTransport({
    host: config.smtp.host,
    port: config.smtp.port,
    secure: config.smtp.secure,
    auth: config.smtp.user ? { user: config.smtp.user, pass: config.smtp.password ?? '' } : undefined,
    ignoreTLS: !config.smtp.secure && config.smtp.host === '127.0.0.1',
  });
}

const MAX_ATTEMPTS = 8;
export const backoffMs = (attempt: number) => Math.min(60 * 60 * 1000, 5_000 * 2 ** (attempt - 1));

/**
 * Sends due messages. Each one is claimed by pushing its next attempt into the future inside a short
 * transaction (FOR UPDATE SKIP LOCKED), so several workers never send the same row at once, and a worker killed
 * mid-send leaves the row to be retried when that lease runs out.
 */
export async function deliverDue(
  ds: AppDataSource,
  transport: Transporter,
  opts: {
    from: string;
    batch?: number;
    leaseMs?: number;
    loadAttachment?: (a: OutboxAttachment) => Promise<Buffer>;
    /** Only these messages (a resend of chosen ones; tests that share the queue with other workers). */
    ids?: string[];
  },
) {
  const leaseMs = opts.leaseMs ?? 120_000;
  const claimed = await ds.transaction(async (m) => {
    const qb = m
      .createQueryBuilder(OutboxMessage, 'o')
      .where('o.status = :s AND o.next_attempt_at <= :now', { s: 'pending', now: clock.now() });
    if (opts.ids) qb.andWhere('o.id IN (:...ids)', { ids: opts.ids.length ? opts.ids : ['none'] });
    const rows = await qb
      .orderBy('o.id', 'ASC')
      .limit(opts.batch ?? 20)
      .setLock('pessimistic_write')
      .setOnLocked('skip_locked')
      .getMany();
    if (rows.length) {
      await m
        .createQueryBuilder()
        .update(OutboxMessage)
        .set({ nextAttemptAt: new Date(clock.nowMs() + leaseMs), attempts: () => 'attempts + 1' })
        .whereInIds(rows.map((r) => r.id))
        .execute();
    }
    return rows;
  });

  let sent = 0;
  for (const row of claimed) {
    try {
      const attachments = [];
      for (const a of row.attachments ?? []) {
        if (!opts.loadAttachment) throw new Error('no attachment loader configured');
        attachments.push({
          filename: a.filename,
          contentType: a.contentType,
          content: await opts.loadAttachment(a),
        });
      }
      const info = await transport.sendMail({
        from: opts.from,
        to: row.to,
        subject: row.subject,
        text: row.text,
        html: row.html,
        attachments,
        headers: { 'X-Lumenproof-Outbox-Id': row.id },
      });
      await ds
        .getRepository(OutboxMessage)
        .update(
          { id: row.id },
          { status: 'sent', sentAt: clock.now(), messageId: info.messageId ?? null, lastError: null },
        );
      sent += 1;
    } catch (err) {
      const attempts = row.attempts + 1;
      await ds.getRepository(OutboxMessage).update(
        { id: row.id },
        {
          status: attempts >= MAX_ATTEMPTS ? 'failed' : 'pending',
          nextAttemptAt: new Date(clock.nowMs() + backoffMs(attempts)),
          lastError: String((err as Error).message ?? err).slice(0, 2000),
        },
      );
    }
  }
  return { claimed: claimed.length, sent };
}

export function startOutboxWorker(
  ds: AppDataSource,
  config: AppConfig,
  logger: Logger,
  opts: { intervalMs?: number; loadAttachment?: (a: OutboxAttachment) => Promise<Buffer> } = {},
) {
  const transport = createTransport(config);
  let stopped = false;
  let running: Promise<unknown> = Promise.resolve();
  const tick = async () => {
    if (stopped) return;
    running = deliverDue(ds, transport, { from: config.smtp.from, loadAttachment: opts.loadAttachment })
      .then((r) => r.sent && logger.info({ sent: r.sent }, 'outbox delivered'))
      .catch((err) => logger.warn({ err }, 'outbox run failed'));
    await running;
    if (!stopped) timer = setTimeout(tick, opts.intervalMs ?? 1000);
  };
  let timer = setTimeout(tick, 200);
  return {
    async stop() {
      stopped = true;
      clearTimeout(timer);
      await running;
      transport.close();
    },
  };
}
