import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../server/config/env';
import { backup, restore, verify, type Manifest } from '../../scripts/lib/backup';
import { resetDatabase, startLocalDb, type LocalDb } from '../../scripts/lib/mariadb';
import { createOrganization, createUser } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';
import mysql from 'mysql2/promise';

let t: TestContext;
let target: LocalDb;
const work = fs.mkdtempSync(path.join(os.tmpdir(), 'lumenproof-backup-'));
beforeAll(async () => {
  t = await createTestApp();
  const config = loadConfig();
  target = await startLocalDb({
    dataDir: config.dataDir,
    profile: 'restore',
    port: config.dbPort + 3,
    log: () => {},
  });
  await resetDatabase(target);
}, 120_000);
afterAll(async () => {
  await closeTestApp(t);
  await target?.stop();
  fs.rmSync(work, { recursive: true, force: true });
});

describe('backup and restore', () => {
  it('restores into a fresh instance with equal table checksums and files, and notices tampering', async () => {
    const org = await createOrganization(t.ds, 'contractor');
    await createUser(t.ds, org, ['installer']);
    const storage = path.join(work, 'uploads');
    fs.mkdirSync(path.join(storage, 'ab'), { recursive: true });
    fs.writeFileSync(path.join(storage, 'ab', 'photo.jpg'), crypto.randomBytes(50_000));

    const manifest: Manifest = await backup({
      url: (t.ds.options as { url: string }).url,
      storageDir: storage,
      outDir: path.join(work, 'b1'),
    });
    expect(manifest.tables.users.rows).toBeGreaterThan(0);
    expect(Object.keys(manifest.files)).toEqual(['ab/photo.jpg']);

    const restoredStorage = path.join(work, 'restored');
    const report = await restore({
      backupDir: path.join(work, 'b1'),
      url: target.url,
      storageDir: restoredStorage,
    });
    expect(report.mismatches).toEqual([]);
    expect(report.ok).toBe(true);

    // The append-only triggers came along.
    const conn = await mysql.createConnection(target.url);
    const [triggers] = await conn.query<mysql.RowDataPacket[]>(
      "SELECT trigger_name AS name FROM information_schema.triggers WHERE event_object_table = 'audit_events' ORDER BY 1",
    );
    expect(triggers.map((r) => r.name)).toEqual(['audit_events_no_delete', 'audit_events_no_update']);
    await conn.query('UPDATE users SET name = ? LIMIT 1', ['Someone Else']);
    await conn.end();
    fs.writeFileSync(path.join(restoredStorage, 'ab', 'photo.jpg'), 'changed');
    const after = await verify(manifest, target.url, restoredStorage);
    expect(after.ok).toBe(false);
    expect(after.mismatches.join('\n')).toMatch(/table users/);
    expect(after.mismatches.join('\n')).toMatch(/file ab\/photo\.jpg differs/);
  });
});
