// npm run -s routes: every API route the server registers, one per line.
import { createApp } from '../server/app';
import { loadConfig } from '../server/config/env';
import { createDataSource } from '../server/db/data-source';
import { createLogger } from '../server/lib/logger';
import { listRoutes } from '../server/lib/routes';

const config = loadConfig({ ...process.env, LOG_LEVEL: 'silent' });
const url = 'mysql://nobody:x@127.0.0.1:1/none';
const app = createApp({
  config,
  ds: createDataSource(url),
  logger: createLogger('silent'),
  databaseUrl: url,
});
for (const r of listRoutes(app)) console.log(`${r.method.padEnd(6)} ${r.path}`);
void app.close().finally(() => process.exit(0));
