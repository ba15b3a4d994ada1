import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { createApp, type App } from '../../server/app';
import { loadConfig } from '../../server/config/env';
import { createDataSource, type AppDataSource } from '../../server/db/data-source';
import { createLogger } from '../../server/lib/logger';

// The security headers on everything the server sends beyond the JSON API (which auth.api.test.ts covers): the
// built client's index.html, its static assets, the page fallback for any other path, a missing asset, and an
// unexpected server error. A file download's headers are in attachments.test.ts.

let app: App;
let ds: AppDataSource;
let clientDir: string;

const INDEX = `<!doctype html><html lang="en"><head><meta charset="UTF-8" /><title>Lumenproof</title>
<script type="module" crossorigin src="/assets/index-abc123.js"></script>
<link rel="stylesheet" crossorigin href="/assets/index-abc123.css"></head><body><div id="root"></div></body></html>`;

beforeAll(async () => {
  clientDir = fs.mkdtempSync(path.join(os.tmpdir(), 'lumenproof-client-'));
  fs.mkdirSync(path.join(clientDir, 'assets'));
  fs.writeFileSync(path.join(clientDir, 'index.html'), INDEX);
  fs.writeFileSync(path.join(clientDir, 'assets', 'index-abc123.js'), 'console.log("lumenproof");\n');
  fs.writeFileSync(path.join(clientDir, 'assets', 'index-abc123.css'), 'body{margin:0}\n');
  fs.writeFileSync(path.join(clientDir, 'favicon.svg'), '<svg xmlns="http://www.w3.org/2000/svg"/>');
  const databaseUrl = inject('databaseUrl');
  const config = loadConfig({
    NODE_ENV: 'test',
    APP_MODE: 'demo',
    LOG_LEVEL: 'silent',
    PUBLIC_URL: 'http://127.0.0.1:3000',
    DATA_DIR: '.data/test-run',
  });
  ds = createDataSource(databaseUrl, { poolSize: 2 });
  await ds.initialize();
  app = createApp({
    config,
    ds,
    logger: createLogger('silent'),
    databaseUrl,
    clientDir,
    // A route that fails the way a bug would, to see what a 500 carries.
    mountApi: (api) => {
      api.get('/test-only/boom', () => {
        throw new Error('a bug at /work/server/modules/thing.ts:12:34');
      });
    },
  });
});
afterAll(async () => {
  await app?.close();
  await ds?.destroy();
  fs.rmSync(clientDir, { recursive: true, force: true });
});

function expectHardened(r: supertest.Response) {
  const csp = String(r.headers['content-security-policy']);
  expect(csp).toContain("default-src 'self'");
  expect(csp).toContain("script-src 'self'");
  expect(csp).toContain("object-src 'none'");
  expect(csp).toContain("frame-ancestors 'none'");
  expect(csp).toContain("base-uri 'self'");
  expect(csp).not.toMatch(/unsafe-inline|unsafe-eval/);
  expect(r.headers['x-content-type-options']).toBe('nosniff');
  expect(r.headers['x-frame-options']).toBe('SAMEORIGIN');
  expect(r.headers['referrer-policy']).toBe('same-origin');
  expect(r.headers['cross-origin-opener-policy']).toBe('same-origin');
  expect(r.headers['x-powered-by']).toBeUndefined();
  expect(r.headers['x-request-id']).toMatch(/^[0-9a-f-]{36}$/);
  // Plain HTTP on loopback: no HSTS (it would pin a developer's browser to HTTPS on 127.0.0.1).
  expect(r.headers['strict-transport-security']).toBeUndefined();
  // Pages and files never start a session.
  expect(r.headers['set-cookie']).toBeUndefined();
}

describe('security headers beyond the API', () => {
  it('index.html carries the strict CSP, is not cached stale, and holds no inline script the CSP would block', async () => {
    const r = await supertest(app).get('/');
    expect(r.status).toBe(200);
    expect(r.headers['content-type']).toMatch(/^text\/html/);
    expect(r.headers['cache-control']).toBe('no-cache');
    expectHardened(r);
    expect(r.text).not.toMatch(/<script(?![^>]*\bsrc=)[^>]*>/);
  });

  it('the page fallback for any client path is the same hardened index.html', async () => {
    for (const p of ['/claims/123', '/settings/users?x=1', '/nowhere/at/all']) {
      const r = await supertest(app).get(p);
      expect(r.status).toBe(200);
      expect(r.text).toBe(INDEX);
      expectHardened(r);
    }
  });

  it('static assets: long-lived and immutable when hashed, typed, hardened', async () => {
    const js = await supertest(app).get('/assets/index-abc123.js');
    expect(js.status).toBe(200);
    expect(js.headers['content-type']).toMatch(/javascript/);
    expect(js.headers['cache-control']).toBe('public, max-age=31536000, immutable');
    expectHardened(js);
    const icon = await supertest(app).get('/favicon.svg');
    expect(icon.status).toBe(200);
    expect(icon.headers['content-type']).toMatch(/^image\/svg\+xml/);
    expectHardened(icon);
  });

  it('a missing asset is a 404 in the error shape, not the HTML page, and hardened', async () => {
    const r = await supertest(app).get('/assets/index-gone.js');
    expect(r.status).toBe(404);
    expect(r.headers['content-type']).toMatch(/^application\/json/);
    expect(r.body.error.code).toBe('route.not_found');
    // The message is ours: nothing about the file system.
    expect(r.text).not.toMatch(/ENOENT|assets\/index-gone|tmp/);
    expectHardened(r);
  });

  it('an unknown API path is a JSON 404, never the HTML page', async () => {
    const r = await supertest(app).get('/api/nothing-here');
    expect(r.status).toBe(404);
    expect(r.body.error.code).toBe('route.not_found');
    expect(r.headers['cache-control']).toBe('no-store');
    expectHardened(r);
  });

  it('an unexpected error is a 500 with a generic message and the request id, hardened, without a stack or path', async () => {
    const r = await supertest(app).get('/api/test-only/boom');
    expect(r.status).toBe(500);
    expect(r.body).toEqual({
      error: { code: 'internal', message: expect.any(String), requestId: r.headers['x-request-id'] },
    });
    expect(r.text).not.toMatch(/thing\.ts|\/work\/|at .+:\d+:\d+/);
    expect(r.headers['cache-control']).toBe('no-store');
    expectHardened(r);
  });
});
