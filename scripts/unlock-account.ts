// npm run auth:unlock -- EMAIL: clears the sign-in limits of an account (its account-wide, per-address and
// per-device counts; server/auth/login-throttle.ts) so that its owner can sign in at once. The per-address count
// of an address is left alone: it guards every account, and it lapses by itself after 15 minutes.
import { z } from 'zod';
import { forgetLoginFailuresIn } from '../server/auth/login-throttle';
import { loadConfig } from '../server/config/env';
import { createDataSource } from '../server/db/data-source';
import { startLocalDb } from './lib/mariadb';

async function main() {
  const parsed = z.string().trim().email().safeParse(process.argv[2]);
  if (!parsed.success) {
    console.error('Usage: npm run auth:unlock -- EMAIL');
    process.exit(2);
  }
  const config = loadConfig();
  const url =
    config.databaseUrl ??
    (await startLocalDb({ dataDir: config.dataDir, profile: 'demo', port: config.dbPort, log: () => {} }))
      .url;
  const ds = createDataSource(url, { poolSize: 1 });
  await ds.initialize();
  try {
    const n = await forgetLoginFailuresIn(ds, parsed.data);
    console.log(`Sign-in limits of ${parsed.data.toLowerCase()} cleared (${n} counters).`);
  } finally {
    await ds.destroy();
  }
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
