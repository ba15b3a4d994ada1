import crypto from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { Invitation } from '../../server/db/entities/invitation.entity';
import { User } from '../../server/db/entities/user.entity';
import { createOrganization, createUser } from '../support/factories';
import {
  connectionGone,
  httpJson,
  httpSignIn,
  killAllCrashServers,
  startCrashServer,
  type CrashServer,
} from '../support/crash-harness';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// The server in a child process, held at a named point inside a transaction (server/lib/crash-point.ts) and
// killed there with SIGKILL; then, with the database and the files as the crash left them and a fresh server:
// the invariants hold, and the retry succeeds exactly once.

let t: TestContext;
let fresh: CrashServer;
beforeAll(async () => {
  t = await createTestApp();
  fresh = await startCrashServer();
}, 60_000);
afterAll(async () => {
  await killAllCrashServers();
  await closeTestApp(t);
});

/** Starts a server armed at the point, sends the request, waits for it to reach the point, kills it there. */
async function crashAt(
  point: string,
  send: (s: CrashServer, cookie: string) => Promise<unknown>,
  email: string,
) {
  const s = await startCrashServer({ TEST_CRASH_POINT: point });
  const cookie = await httpSignIn(s.base, email);
  const inFlight = send(s, cookie).then(
    () => 'answered',
    () => 'cut off',
  );
  const at = await s.reached;
  expect(at.crashPoint).toBe(point);
  await s.kill();
  expect(await inFlight).toBe('cut off');
  await connectionGone(t.ds, at.connectionId);
}

const outboxTo = async (email: string) =>
  Number(
    (await t.ds.query('SELECT COUNT(*) AS n FROM outbox_messages WHERE to_address LIKE ?', [`%${email}%`]))[0]
      .n,
  );

describe('crash safety: invitations', () => {
  for (const point of ['user.invite.after_user', 'user.invite.before_commit']) {
    it(
      `killed at ${point}: no user, invitation, audit row or e-mail; the retry invites once`,
      { timeout: 60_000 },
      async () => {
        const org = await createOrganization(t.ds, 'manufacturer');
        const admin = await createUser(t.ds, org, ['administrator']);
        const email = `crash-${crypto.randomBytes(4).toString('hex')}@example.test`;
        const body = { email, name: 'Crash Test', roles: ['reviewer'] };
        await crashAt(
          point,
          (s, cookie) => httpJson(s.base, cookie, 'POST', '/api/users/invitations', body),
          admin.email,
        );

        expect(await t.ds.getRepository(User).countBy({ email })).toBe(0);
        expect(await t.ds.getRepository(Invitation).count({ where: { createdById: admin.id } })).toBe(0);
        expect(
          await t.ds.getRepository(AuditEvent).countBy({ action: 'user.invited', organizationId: org.id }),
        ).toBe(0);
        expect(await outboxTo(email)).toBe(0);

        const cookie = await httpSignIn(fresh.base, admin.email);
        const retry = await httpJson(fresh.base, cookie, 'POST', '/api/users/invitations', body);
        expect(retry.status).toBe(201);
        const again = await httpJson(fresh.base, cookie, 'POST', '/api/users/invitations', body);
        expect(again.status).toBe(409);
        expect(await t.ds.getRepository(User).countBy({ email })).toBe(1);
        expect(await t.ds.getRepository(Invitation).count({ where: { createdById: admin.id } })).toBe(1);
        expect(
          await t.ds.getRepository(AuditEvent).countBy({ action: 'user.invited', organizationId: org.id }),
        ).toBe(1);
        expect(await outboxTo(email)).toBe(1);
      },
    );
  }
});
