import fs from 'node:fs';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../server/config/env';
import { dbServersOf, stopLeftovers, stopStaleProfiles } from '../../scripts/lib/db-processes';
import { profileDir, startLocalDb, stopLocalDb } from '../../scripts/lib/mariadb';

// What npm test and npm run bench use to find the database servers a run left behind (issue: the browser
// tests' server outlived npm test). A real mariadbd of the "restore" profile (DB_PORT + 3) plays the leftover.
const config = loadConfig();
afterAll(async () => {
  await stopLocalDb(config.dataDir, 'restore');
});

describe('database servers left running', () => {
  it('finds a server of this data folder by its process, even without its pid file, and stops it', async () => {
    await stopStaleProfiles(config.dataDir, ['restore']);
    const before = dbServersOf(config.dataDir);
    expect(before.some((p) => p.profile === 'restore')).toBe(false);

    const db = await startLocalDb({
      dataDir: config.dataDir,
      profile: 'restore',
      port: config.dbPort + 3,
      log: () => {},
    });
    const running = dbServersOf(config.dataDir).filter((p) => p.profile === 'restore');
    expect(running).toHaveLength(1);
    const pid = running[0].pid;
    // A killed run can leave the server without the pid file that would have named it.
    fs.rmSync(path.join(path.resolve(profileDir(config.dataDir, 'restore')), 'mariadbd.pid'), {
      force: true,
    });

    const left = await stopLeftovers(config.dataDir, before);
    expect(left.map((p) => p.pid)).toEqual([pid]);
    expect(() => process.kill(pid, 0)).toThrow();
    expect(dbServersOf(config.dataDir).some((p) => p.profile === 'restore')).toBe(false);
    expect(db.port).toBe(config.dbPort + 3);
  });

  it('leaves servers that were running before the run alone', async () => {
    const before = dbServersOf(config.dataDir);
    expect(await stopLeftovers(config.dataDir, before)).toEqual([]);
    for (const p of before) expect(() => process.kill(p.pid, 0)).not.toThrow();
  });

  it('does not count a server of another data folder', async () => {
    const elsewhere = path.join(config.dataDir, '..', `${path.basename(config.dataDir)}-elsewhere`);
    expect(dbServersOf(elsewhere)).toEqual([]);
  });
});
