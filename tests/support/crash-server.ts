// A Lumenproof API server in a child process, for the crash test: createApp on the test database, listening on
// a free port, which it prints as one JSON line. The test arms a crash point with TEST_CRASH_POINT (honoured only
// with NODE_ENV=test; server/lib/crash-point.ts) and kills this process there.
import type { AddressInfo } from 'node:net';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config/env';
import { createDataSource } from '../../server/db/data-source';
import { createLogger } from '../../server/lib/logger';

const config = loadConfig();
const databaseUrl = config.databaseUrl!;
const ds = createDataSource(databaseUrl, { poolSize: 5 });
await ds.initialize();
const app = createApp({ config, ds, logger: createLogger('silent'), databaseUrl });
const server = app.listen(0, '127.0.0.1', () => {
  process.stdout.write(`${JSON.stringify({ port: (server.address() as AddressInfo).port })}\n`);
});
