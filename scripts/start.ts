// npm start: builds the client and the server (dist-server/) if needed, starts a private MariaDB, migrates, loads the demo data into an empty
// database (demo mode only), starts the fake SMTP server and serves the app. Ctrl-C stops all of it.
import { loadConfig } from '../server/config/env';
import { createDataSource } from '../server/db/data-source';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../server/db/seed/demo-accounts';
import { seedDemo } from '../server/db/seed/demo';
import { createStorage } from '../server/lib/storage';
import { buildClientIfNeeded } from './lib/build-client';
import { buildServerIfNeeded, startCompiledServer } from './lib/build-server';
import { startLocalDb, type LocalDb } from './lib/mariadb';
import { startFakeSmtp } from './fake-smtp';

async function main() {
  const config = loadConfig({ NODE_ENV: 'development', ...process.env });
  const stops: (() => Promise<void>)[] = [];
  let stopping = false;
  const stopAll = async (code = 0) => {
    if (stopping) return;
    stopping = true;
    console.log('\nStopping Lumenproof...');
    for (const stop of stops.reverse()) await stop().catch((e) => console.error(e));
    process.exit(code);
  };
  process.on('SIGINT', () => void stopAll(0));
  process.on('SIGTERM', () => void stopAll(0));

  try {
    buildClientIfNeeded();
    await buildServerIfNeeded();

    let databaseUrl = config.databaseUrl;
    if (!databaseUrl) {
      const db: LocalDb = await startLocalDb({
        dataDir: config.dataDir,
        profile: 'demo',
        port: config.dbPort,
      });
      stops.push(db.stop);
      databaseUrl = db.url;
      console.log(`MariaDB on 127.0.0.1:${db.port} (data in ${config.dataDir}/demo)`);
    }

    const ds = createDataSource(databaseUrl, { poolSize: 2 });
    await ds.initialize();
    const ran = await ds.runMigrations({ transaction: 'each' });
    if (ran.length) console.log(`Applied ${ran.length} migration(s).`);
    if (config.mode === 'demo') {
      if (await seedDemo(ds, { credits: { storage: createStorage(config), config } }))
        console.log('Loaded the demo scenario.');
    }
    await ds.destroy();

    if (config.mode === 'demo') {
      const smtp = await startFakeSmtp({ port: config.smtp.port, host: '127.0.0.1', dir: config.mailboxDir });
      stops.push(smtp.close);
      console.log(`Fake SMTP server on 127.0.0.1:${smtp.port} (mail kept in ${config.mailboxDir})`);
    }

    // The compiled server under plain node (scripts/lib/build-server.ts), one or WEB_CONCURRENCY processes.
    const server = await startCompiledServer({
      databaseUrl,
      env: { NODE_ENV: config.env, APP_MODE: config.mode },
    });
    stops.push(server.stop);

    console.log(`\nLumenproof is running at ${server.url}\n`);
    if (config.mode === 'demo') {
      console.log(`Demo accounts (password "${DEMO_PASSWORD}"):`);
      for (const a of DEMO_ACCOUNTS) console.log(`  ${a.email.padEnd(24)} ${a.roles.join(', ')}`);
      console.log('\nPress Ctrl-C to stop.');
    }
  } catch (err) {
    console.error(err instanceof Error ? err.message : err);
    await stopAll(1);
  }
}

void main();
