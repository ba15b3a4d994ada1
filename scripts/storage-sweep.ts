// npm run storage:sweep [-- --dry-run] [--grace-minutes N] [--prefix P]: removes stored objects that no row names
// and that are older than the grace period (STORAGE_SWEEP_GRACE_MINUTES, an hour by default), as the server does
// at start-up and periodically. A grace of 0 is only safe with every server stopped: an upload in flight has
// its object written before its row commits.
import { parseArgs } from 'node:util';
import { z } from 'zod';
import { loadConfig } from '../server/config/env';
import { createDataSource } from '../server/db/data-source';
import { createLogger } from '../server/lib/logger';
import { createStorage } from '../server/lib/storage';
import { sweepStorage } from '../server/lib/storage-sweep';
import { startLocalDb } from './lib/mariadb';

const argsSchema = z.strictObject({
  'dry-run': z.boolean().default(false),
  'grace-minutes': z.coerce
    .number()
    .int()
    .min(0)
    .max(7 * 24 * 60)
    .optional(),
  prefix: z
    .string()
    .regex(/^[A-Za-z0-9][A-Za-z0-9._/-]{0,200}$/, 'a key prefix: letters, digits, . _ - /')
    .optional(),
});

async function main() {
  const { values } = parseArgs({
    options: {
      'dry-run': { type: 'boolean' },
      'grace-minutes': { type: 'string' },
      prefix: { type: 'string' },
    },
    strict: true,
  });
  const parsed = argsSchema.safeParse(values);
  if (!parsed.success) {
    console.error(parsed.error.issues.map((i) => `--${i.path.join('.')}: ${i.message}`).join('\n'));
    process.exit(2);
  }
  const args = parsed.data;
  const config = loadConfig();
  const url =
    config.databaseUrl ??
    (await startLocalDb({ dataDir: config.dataDir, profile: 'demo', port: config.dbPort, log: () => {} }))
      .url;
  const ds = createDataSource(url, { poolSize: 2 });
  await ds.initialize();
  try {
    const graceMs =
      args['grace-minutes'] !== undefined ? args['grace-minutes'] * 60_000 : config.storage.sweep.graceMs;
    const r = await sweepStorage(ds, createStorage(config), {
      graceMs,
      prefix: args.prefix,
      dryRun: args['dry-run'],
      logger: createLogger('warn'),
    });
    if (r.skipped) {
      console.log('Another sweep is running on this database; nothing done.');
      return;
    }
    const verb = args['dry-run'] ? 'would remove' : 'removed';
    console.log(
      `Storage sweep (${config.storage.driver}, grace ${graceMs / 60_000} min): ${r.listed} objects listed, ` +
        `${r.referenced} referenced, ${r.fresh} inside the grace period, ${verb} ${r.removed.length}` +
        (r.failed.length ? `, ${r.failed.length} could not be removed` : '') +
        (r.temporaries.length ? `; ${r.temporaries.length} temporary files of cut-off writes removed` : '') +
        '.',
    );
    for (const k of r.removed) console.log(`  ${k}`);
    if (r.failed.length) process.exitCode = 1;
  } finally {
    await ds.destroy();
  }
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
