import { spawn, type ChildProcess } from 'node:child_process';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { In, MoreThanOrEqual } from 'typeorm';
import { startFakeSmtp } from '../../scripts/fake-smtp';
import { OutboxMessage } from '../../server/db/entities/outbox-message.entity';
import { enqueueEmail } from '../../server/lib/outbox';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// A worker killed mid-batch still gets every message delivered: the lease it took on its batch runs out and the
// next worker sends what it had not. At least once, never lost (a message sent just before the kill may go twice).

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

function worker(env: Record<string, string>): ChildProcess {
  return spawn(process.execPath, ['--import', 'tsx', 'tests/support/outbox-worker-child.ts'], {
    env: {
      ...process.env,
      DATABASE_URL: inject('databaseUrl'),
      SMTP_PORT: String(smtp.port),
      SMTP_HOST: '127.0.0.1',
      ...env,
    },
    stdio: ['ignore', 'inherit', 'inherit'],
  });
}

const outboxIdOf = (raw: string) => /X-Lumenproof-Outbox-Id: (\d+)/i.exec(raw)?.[1];

describe('the outbox worker, killed mid-send', () => {
  it('delivers every message at least once and marks each sent', async () => {
    const stamp = Date.now();
    const ids: string[] = [];
    for (let i = 0; i < 30; i++) {
      await t.ds.transaction((m) =>
        enqueueEmail(m, {
          to: [`crash-${stamp}-${i}@example.test`],
          template: 'invitation',
          view: {
            name: 'T',
            inviterName: 'A',
            organizationName: 'O',
            rolesText: 'installer',
            link: 'http://x/',
            expiresOn: '2026-01-01',
          },
        }),
      );
    }
    const ours = await t.ds
      .getRepository(OutboxMessage)
      .find({ where: { to: MoreThanOrEqual(`crash-${stamp}-`) }, order: { id: 'ASC' } });
    for (const r of ours) if (r.to.startsWith(`crash-${stamp}-`)) ids.push(r.id);
    expect(ids).toHaveLength(30);
    const ourIds = new Set(ids);
    const delivered = () =>
      smtp.received.map((m) => outboxIdOf(m.raw)).filter((id): id is string => !!id && ourIds.has(id));

    // The workers take only these messages: other files share this test database's queue and enqueue as we go.
    // The first one kills itself (SIGKILL) right after its third message went out, before marking it sent: the
    // kill lands inside its leased batch however slow the machine is.
    const first = worker({
      SEND_DELAY_MS: '50',
      LEASE_MS: '3000',
      ONLY_IDS: ids.join(','),
      KILL_AFTER_SENDS: '3',
    });
    const signal = await new Promise((r) => first.on('exit', (_code, sig) => r(sig)));
    expect(signal).toBe('SIGKILL');
    const beforeSecond = delivered().length;
    expect(beforeSecond).toBeGreaterThanOrEqual(3);
    expect(beforeSecond).toBeLessThan(30);
    // Rows the dead worker had leased and not sent are still pending.
    const stuck = await t.ds
      .getRepository(OutboxMessage)
      .count({ where: { id: In(ids), status: 'pending' } });
    expect(stuck).toBeGreaterThan(0);

    const second = worker({
      SEND_DELAY_MS: '10',
      LEASE_MS: '3000',
      UNTIL_SENT_FROM: ids[0],
      ONLY_IDS: ids.join(','),
    });
    const code = await new Promise((r) => second.on('exit', r));
    expect(code).toBe(0);

    const got = new Set(delivered());
    for (const id of ids) expect(got.has(id), `message ${id} delivered`).toBe(true);
    const rows = await t.ds.getRepository(OutboxMessage).findBy({ id: MoreThanOrEqual(ids[0]) });
    for (const r of rows.filter((x) => ourIds.has(x.id))) expect(r.status).toBe('sent');
    // At least one row went out on a second attempt, after the dead worker's lease ran out.
    expect(rows.some((r) => ourIds.has(r.id) && r.attempts >= 2)).toBe(true);
  }, 120_000);
});
