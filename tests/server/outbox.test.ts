import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { OutboxMessage } from '../../server/db/entities/outbox-message.entity';
import { backoffMs } from '../../server/lib/delivery-queue';
import { createTransport, deliverDue, enqueueEmail } from '../../server/lib/outbox';
import { clock } from '../../server/lib/clock';
import { startFakeSmtp } from '../../scripts/fake-smtp';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

let t: TestContext;
let smtp: Awaited<ReturnType<typeof startFakeSmtp>>;
beforeAll(async () => {
  smtp = await startFakeSmtp({ port: 0 });
  t = await createTestApp({ SMTP_PORT: String(smtp.port) });
});
afterAll(async () => {
  await closeTestApp(t);
  await smtp.close();
});

afterEach(() => clock.reset());

// The test database's queue is shared with other files' workers (the outbox crash test runs one in a child
// process), so these tests hide their messages from the real clock (due a day from now) and deliver only them,
// on this process's clock moved forward.
const HIDE_MS = 24 * 60 * 60 * 1000;
async function enqueueHidden(to: string) {
  // In the same transaction, so no other worker ever sees it due.
  await t.ds.transaction(async (m) => {
    await enqueueEmail(m, { to: [to], template: 'invitation', view: view(to) });
    await m
      .createQueryBuilder()
      .update(OutboxMessage)
      .set({ nextAttemptAt: new Date(Date.now() + HIDE_MS) })
      .where('to_address = :to', { to })
      .execute();
  });
  return (await t.ds.getRepository(OutboxMessage).findOneByOrFail({ to })).id;
}

const view = (to: string) => ({
  name: 'Test',
  inviterName: 'Admin',
  organizationName: 'Org',
  rolesText: 'installer',
  link: `http://127.0.0.1/invitations/${to}`,
  expiresOn: '2026-12-08',
});

describe('the e-mail outbox', () => {
  it('sends a committed message once, and never one whose transaction rolled back', async () => {
    const kept = `kept-${Date.now()}@example.test`;
    const dropped = `dropped-${Date.now()}@example.test`;
    const id = await enqueueHidden(kept);
    await expect(
      t.ds.transaction(async (m) => {
        await enqueueEmail(m, { to: [dropped], template: 'invitation', view: view(dropped) });
        throw new Error('the change failed');
      }),
    ).rejects.toThrow('the change failed');
    expect(await t.ds.getRepository(OutboxMessage).findOneBy({ to: dropped })).toBeNull();

    clock.advance(HIDE_MS + 60_000);
    const transport = createTransport(t.config);
    await deliverDue(t.ds, transport, { from: t.config.smtp.from, ids: [id] });
    await deliverDue(t.ds, transport, { from: t.config.smtp.from, ids: [id] }); // sent once, not again
    transport.close();
    expect(smtp.received.filter((m) => m.to.includes(kept))).toHaveLength(1);
    expect(smtp.received.filter((m) => m.to.includes(dropped))).toHaveLength(0);
    expect(await t.ds.getRepository(OutboxMessage).findOneByOrFail({ to: kept })).toMatchObject({
      status: 'sent',
    });
    const raw = smtp.received.find((m) => m.to.includes(kept))!.raw;
    expect(raw).toContain('Subject: Admin invited you to Org on Lumenproof');
  });

  it('retries with backoff when the mail server is down', async () => {
    const to = `retry-${Date.now()}@example.test`;
    const id = await enqueueHidden(to);
    clock.advance(HIDE_MS + 60_000);
    const down = createTransport({ ...t.config, smtp: { ...t.config.smtp, port: 1 } });
    await deliverDue(t.ds, down, { from: t.config.smtp.from, ids: [id] });
    down.close();
    const row = await t.ds.getRepository(OutboxMessage).findOneByOrFail({ to });
    expect(row).toMatchObject({ status: 'pending', attempts: 1 });
    expect(row.lastError).toBeTruthy();
    // The first retry waits 5 s (then 10 s, 20 s, ... doubling, at most an hour): written out, not backoffMs(1).
    const firstRetryMs = 5_000;
    expect(row.nextAttemptAt.getTime()).toBeGreaterThan(clock.nowMs() + firstRetryMs - 2000);
    expect(row.nextAttemptAt.getTime()).toBeLessThanOrEqual(clock.nowMs() + firstRetryMs);
    // The schedule by hand: 5 s x 2^(n - 1) for attempt n, capped at 3,600,000 ms (5 s x 2^10 = 5,120 s > 1 h).
    expect([1, 2, 3, 4, 10, 11, 30].map(backoffMs)).toEqual([
      5_000, 10_000, 20_000, 40_000, 2_560_000, 3_600_000, 3_600_000,
    ]);

    clock.advance(firstRetryMs + 1000);
    const up = createTransport(t.config);
    await deliverDue(t.ds, up, { from: t.config.smtp.from, ids: [id] });
    up.close();
    expect(await t.ds.getRepository(OutboxMessage).findOneByOrFail({ to })).toMatchObject({
      status: 'sent',
      attempts: 2,
    });
    expect(smtp.received.filter((m) => m.to.includes(to))).toHaveLength(1);
  });
});
