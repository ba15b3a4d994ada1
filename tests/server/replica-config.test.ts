import express from 'express';
import supertest from 'supertest';
import { describe, expect, it } from 'vitest';
import { ConfigError, loadConfig } from '../../server/config/env';
import { heldToPrimary, withReadRouting } from '../../server/db/read';
import { clock } from '../../server/lib/clock';
import { readYourWrites, WROTE_COOKIE } from '../../server/middleware/read-your-writes';

describe('DATABASE_REPLICA_URLS', () => {
  it('is a comma-separated list of mysql:// URLs, empty when unset', () => {
    expect(loadConfig({}).databaseReplicaUrls).toEqual([]);
    expect(
      loadConfig({ DATABASE_REPLICA_URLS: ' mysql://a:b@10.0.0.2:3306/x , mariadb://a:b@10.0.0.3/x,' })
        .databaseReplicaUrls,
    ).toEqual(['mysql://a:b@10.0.0.2:3306/x', 'mariadb://a:b@10.0.0.3/x']);
  });

  it('refuses anything else, naming the variable', () => {
    expect(() => loadConfig({ DATABASE_REPLICA_URLS: 'postgres://x' })).toThrow(ConfigError);
    expect(() => loadConfig({ DATABASE_REPLICA_URLS: 'postgres://x' })).toThrow(/DATABASE_REPLICA_URLS/);
    expect(() => loadConfig({ READ_YOUR_WRITES_SECONDS: '-1' })).toThrow(/READ_YOUR_WRITES_SECONDS/);
  });
});

describe('read-your-writes routing', () => {
  const app = express();
  app.use(readYourWrites(loadConfig({ READ_YOUR_WRITES_SECONDS: '10' })));
  // After an await, as a route's service reads: the routing must survive it.
  app.all('/probe', async (_req, res) => {
    await new Promise((r) => setTimeout(r, 1));
    res.json({ primary: heldToPrimary() });
  });
  const at = (ms: number) => `${WROTE_COOKIE}=${ms}`;

  it('holds a request that may write to the primary and stamps the browser with the time', async () => {
    const r = await supertest(app).post('/probe');
    expect(r.body.primary).toBe(true);
    const cookie = String(r.headers['set-cookie']);
    expect(cookie).toMatch(new RegExp(`^${WROTE_COOKIE}=\\d+;`));
    expect(cookie).toMatch(/Max-Age=10;/);
    expect(cookie).toMatch(/HttpOnly/);
  });

  it('sends reads to the primary within the window after a write, to a replica outside it', async () => {
    const now = clock.nowMs();
    const get = (c?: string) =>
      supertest(app)
        .get('/probe')
        .set('Cookie', c ?? '');
    expect((await get()).body.primary).toBe(false);
    expect((await get(at(now - 9_000))).body.primary).toBe(true);
    expect((await get(at(now - 11_000))).body.primary).toBe(false);
    // Nonsense or a stamp from far in the future holds nothing.
    expect((await get(`${WROTE_COOKIE}=soon`)).body.primary).toBe(false);
    expect((await get(at(now + 3_600_000))).body.primary).toBe(false);
    expect((await get()).headers['set-cookie']).toBeUndefined();
  });
});

describe('background work started on the primary (server/index.ts)', () => {
  it('stays on the primary in every timer it sets, while other code is routed as it asks', async () => {
    const seen: boolean[] = [];
    const timer = withReadRouting(true, () => setInterval(() => seen.push(heldToPrimary()), 5));
    await new Promise((r) => setTimeout(r, 30));
    clearInterval(timer);
    expect(seen.length).toBeGreaterThan(1);
    expect(seen.every(Boolean)).toBe(true);
    expect(heldToPrimary()).toBe(false);
  });
});
