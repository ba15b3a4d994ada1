import crypto from 'node:crypto';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { IdempotencyKey } from '../../server/db/entities/idempotency-key.entity';
import { IDEMPOTENCY_KEY_DAYS, purgeIdempotencyKeys } from '../../server/lib/idempotency';
import { createOrganization, createUser } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));

it(`purges idempotency keys older than ${IDEMPOTENCY_KEY_DAYS} days and keeps the rest`, async () => {
  const org = await createOrganization(t.ds, 'manufacturer');
  const user = await createUser(t.ds, org, ['accountant']);
  const repo = t.ds.getRepository(IdempotencyKey);
  const day = 86_400_000;
  // A 'now' long before any other test's rows, so that the purge touches only this test's two keys.
  const now = new Date('2001-01-01T00:00:00Z');
  const row = (ageDays: number) =>
    repo.create({
      key: `purge-${crypto.randomUUID()}`,
      userId: user.id,
      route: 'POST /claims/:id/credits',
      requestHash: '0'.repeat(64),
      status: 'done',
      responseStatus: 201,
      responseBody: {},
      createdAt: new Date(now.getTime() - ageDays * day),
    });
  const [old, recent] = await repo.save([row(IDEMPOTENCY_KEY_DAYS + 1), row(IDEMPOTENCY_KEY_DAYS - 1)]);
  const purged = await purgeIdempotencyKeys(t.ds, now);
  expect(purged).toBe(1);
  expect(await repo.findOneBy({ id: old.id })).toBeNull();
  expect(await repo.findOneBy({ id: recent.id })).not.toBeNull();
});
