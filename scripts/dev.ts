// npm run dev: the private MariaDB and the fake SMTP server, the API reloading on change (tsx watch) and the
// Vite dev server in front of it (http://127.0.0.1:5173, /api proxied to the API).
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { loadConfig } from '../server/config/env';
import { createDataSource } from '../server/db/data-source';
import { seedDemo } from '../server/db/seed/demo';
import { createStorage } from '../server/lib/storage';
import { startFakeSmtp } from './fake-smtp';
import { startLocalDb } from './lib/mariadb';

async function main() {
  const config = loadConfig({ NODE_ENV: 'development', ...process.env });
  const db = config.databaseUrl
    ? null
    : await startLocalDb({ dataDir: config.dataDir, profile: 'demo', port: config.dbPort });
  const databaseUrl = config.databaseUrl ?? db!.url;
  const ds = createDataSource(databaseUrl, { poolSize: 1 });
  await ds.initialize();
  await ds.runMigrations({ transaction: 'each' });
  if (config.mode === 'demo') await seedDemo(ds, { credits: { storage: createStorage(config), config } });
  await ds.destroy();
  const smtp =
    config.mode === 'demo' ? await startFakeSmtp({ port: config.smtp.port, dir: config.mailboxDir }) : null;

  const env = {
    ...process.env,
    DATABASE_URL: databaseUrl,
    PUBLIC_URL: 'http://127.0.0.1:5173',
    API_PORT: String(config.port),
  };
  const children: ChildProcess[] = [
    spawn(path.resolve('node_modules/.bin/tsx'), ['watch', '--clear-screen=false', 'server/index.ts'], {
      stdio: 'inherit',
      env,
    }),
    spawn(process.execPath, [path.resolve('node_modules/vite/bin/vite.js')], { stdio: 'inherit', env }),
  ];
  console.log('\nLumenproof (development) on http://127.0.0.1:5173 — API on port', config.port);
  const stop = async () => {
    for (const c of children) c.kill('SIGTERM');
    await smtp?.close();
    await db?.stop();
    process.exit(0);
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
