import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { OutboxMessage } from '../../server/db/entities/outbox-message.entity';
import { backoffMs, createTransport, deliverDue, enqueueEmail } from '../../server/lib/outbox';
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
    await t.ds.transaction((m) => enqueueEmail(m, { to: [kept], template: 'invitation', view: view(kept) }));
    await expect(
      t.ds.transaction(async (m) => {
        await enqueueEmail(m, { to: [dropped], template: 'invitation', view: view(dropped) });
        throw new Error('the change failed');
      }),
    ).rejects.toThrow('the change failed');

    const transport = createTransport(t.config);
    // Other tests (and the demo seed) leave messages queued before ours: deliver until the queue is empty.
    for (let i = 0; i < 100; i++) {
      const r = await deliverDue(t.ds, transport, { from: t.config.smtp.from, batch: 100 });
      if (r.claimed === 0) break;
    }
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
    await t.ds.transaction((m) => enqueueEmail(m, { to: [to], template: 'invitation', view: view(to) }));
    const down = createTransport({ ...t.config, smtp: { ...t.config.smtp, port: 1 } });
    await deliverDue(t.ds, down, { from: t.config.smtp.from, batch: 100 });
    down.close();
    const row = await t.ds.getRepository(OutboxMessage).findOneByOrFail({ to });
    expect(row).toMatchObject({ status: 'pending', attempts: 1 });
    expect(row.lastError).toBeTruthy();
    expect(row.nextAttemptAt.getTime()).toBeGreaterThan(clock.nowMs() + backoffMs(1) - 2000);

    clock.advance(backoffMs(1) + 1000);
    const up = createTransport(t.config);
    await deliverDue(t.ds, up, { from: t.config.smtp.from, batch: 100 });
    up.close();
    expect(await t.ds.getRepository(OutboxMessage).findOneByOrFail({ to })).toMatchObject({
      status: 'sent',
      attempts: 2,
    });
    expect(smtp.received.filter((m) => m.to.includes(to))).toHaveLength(1);
  });
});
