import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { listRoutes } from '../../server/lib/routes';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));

describe('route listing', () => {
  it('reads the registered routes from the router', () => {
    const routes = listRoutes(t.app).map((r) => `${r.method} ${r.path}`);
    expect(routes).toEqual(
      expect.arrayContaining([
        'POST /api/auth/login',
        'GET /api/auth/me',
        'PATCH /api/users/:id',
        'POST /api/evaluations',
        'GET /api/health',
      ]),
    );
  });
});
