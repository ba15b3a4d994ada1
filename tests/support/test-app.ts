import { inject } from 'vitest';
import supertest from 'supertest';
import { createApp, type App, type CreateAppOptions } from '../../server/app';
import { loadConfig, type AppConfig } from '../../server/config/env';
import { createDataSource, type AppDataSource } from '../../server/db/data-source';
import { createLogger } from '../../server/lib/logger';
import { StatementCounter, type QueryCounter } from './statement-counter';

export type TestContext = {
  app: App;
  ds: AppDataSource;
  config: AppConfig;
  request: () => supertest.Agent;
  /** Runs fn and returns how many SQL statements it sent (tests/support/statement-counter.ts). */
  countQueries: <T>(fn: () => Promise<T>) => Promise<{ result: T; counter: QueryCounter }>;
};

/** createApp() on the real test database, as the server would build it, without listening. */
export async function createTestApp(
  overrides: Record<string, string> = {},
  options: Pick<CreateAppOptions, 'storage' | 'mountApi'> = {},
): Promise<TestContext> {
  const databaseUrl = inject('databaseUrl');
  const config = loadConfig({
    NODE_ENV: 'test',
    APP_MODE: 'demo',
    LOG_LEVEL: 'silent',
    PUBLIC_URL: 'http://127.0.0.1:3000',
    DATA_DIR: '.data/test-run',
    ...overrides,
  });
  const statements = new StatementCounter();
  const ds = createDataSource(databaseUrl, { poolSize: 5, logger: statements });
  await ds.initialize();
  const app = createApp({ config, ds, logger: createLogger('silent'), databaseUrl, ...options });
  return {
    app,
    ds,
    config,
    request: () => supertest.agent(app),
    countQueries: (fn) => statements.count(fn),
  };
}

export async function closeTestApp(ctx: TestContext | undefined) {
  if (!ctx) return;
  await ctx.app.close();
  await ctx.ds.destroy();
}
