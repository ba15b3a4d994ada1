import nodemailer, { type Transporter } from 'nodemailer';
import type { EntityManager } from 'typeorm';
import type { AppConfig } from '../config/env';
import type { AppDataSource } from '../db/data-source';
import { OutboxMessage, type OutboxAttachment } from '../db/entities/outbox-message.entity';
import { clock } from './clock';
import { afterFailure, claimDue, startQueueWorker, type ClaimOptions } from './delivery-queue';
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

/** Sends due messages, claimed with a lease (server/lib/delivery-queue.ts) so that none is sent twice at once. */
export async function deliverDue(
  ds: AppDataSource,
  transport: Transporter,
  opts: ClaimOptions & {
    from: string;
    loadAttachment?: (a: OutboxAttachment) => Promise<Buffer>;
  },
) {
  const claimed = await claimDue(ds, OutboxMessage, opts);

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
      await ds.getRepository(OutboxMessage).update(
        { id: row.id },
        {
          ...afterFailure(row.attempts + 1),
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
  return startQueueWorker({
    firstDelayMs: 200,
    intervalMs: opts.intervalMs,
    run: () =>
      deliverDue(ds, transport, { from: config.smtp.from, loadAttachment: opts.loadAttachment })
        .then((r) => r.sent && logger.info({ sent: r.sent }, 'outbox delivered'))
        .catch((err) => logger.warn({ err }, 'outbox run failed')),
    close: () => transport.close(),
  });
}
