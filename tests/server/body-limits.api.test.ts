import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createOrganization, createUser, sessionCookie, TEST_PASSWORD } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// Issue 13, item 4: a large body was read and parsed before the session was checked (19.5 MB for 430 ms before a
// 401). The session is now checked first, and each route has its own body limit, judged from Content-Length
// before anything is read.
let t: TestContext;
let server: http.Server;
let port: number;
beforeAll(async () => {
  t = await createTestApp();
  server = http.createServer(t.app);
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
  port = (server.address() as AddressInfo).port;
});
afterAll(async () => {
  server.closeAllConnections();
  await new Promise<void>((r) => server.close(() => r()));
  await closeTestApp(t);
});

/**
 * Announces `declared` bytes of JSON, sends only the first `sent`, and waits for an answer. An answer while the
 * upload is unfinished shows the server judged the request without reading its body.
 */
function partialUpload(path: string, declared: number, sent: number, cookie?: string) {
  return new Promise<{ status: number; body: string }>((resolve, reject) => {
    const req = http.request({
      host: '127.0.0.1',
      port,
      path,
      method: 'POST',
      headers: {
        'content-type': 'application/json',
        'content-length': String(declared),
        ...(cookie ? { cookie } : {}),
      },
    });
    req.on('response', (res) => {
      let body = '';
      res.on('data', (c) => (body += c));
      res.on('end', () => {
        req.destroy();
        resolve({ status: res.statusCode!, body });
      });
    });
    req.on('error', reject);
    req.write(`{"rows":[${' '.repeat(sent - 9)}`);
    // Never finished: the server must answer on the headers alone.
  });
}

async function signInCookie() {
  const org = await createOrganization(t.ds, 'manufacturer');
  const admin = await createUser(t.ds, org, ['administrator']);
  const r = await fetch(`http://127.0.0.1:${port}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: admin.email, password: TEST_PASSWORD }),
  });
  return sessionCookie({ headers: { 'set-cookie': r.headers.getSetCookie() } })!;
}

describe('request bodies and sign-in', () => {
  it('answers an unauthenticated 19.5 MB import with 401 before the upload is finished', async () => {
    const r = await partialUpload('/api/products/import', 19_500_000, 64 * 1024);
    expect(r.status).toBe(401);
    expect(JSON.parse(r.body).error.code).toBe('auth.required');
  });

  it('answers any unauthenticated write with 401 before reading its body', async () => {
    for (const path of [
      '/api/claims',
      '/api/claims/batches',
      '/api/installations/import',
      '/api/users/invitations',
    ]) {
      const r = await partialUpload(path, 5_000_000, 1024);
      expect(r.status, path).toBe(401);
    }
  });

  it("refuses a body over the route's own limit with 413 from its Content-Length, after sign-in", async () => {
    const cookie = await signInCookie();
    // An ordinary route takes a small body; the imports take a whole spreadsheet.
    const claims = await partialUpload('/api/claims', 2_000_000, 1024, cookie);
    expect(claims.status).toBe(413);
    expect(JSON.parse(claims.body).error.code).toBe('request.too_large');
    const imports = await partialUpload('/api/products/import', 25_000_000, 1024, cookie);
    expect(imports.status).toBe(413);
    // Sign-in takes only a small body.
    const login = await partialUpload('/api/auth/login', 100_000, 1024);
    expect(login.status).toBe(413);
  });
});
