import { execFile } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { afterAll, afterEach, beforeAll, describe, expect, inject, it } from 'vitest';
import { ClaimDocument } from '../../server/db/entities/claim-document.entity';
import { CreditMemo } from '../../server/db/entities/credit-memo.entity';
import { OutboxMessage } from '../../server/db/entities/outbox-message.entity';
import { loadConfig } from '../../server/config/env';
import { startServer } from '../../server/index';
import { clock } from '../../server/lib/clock';
import { createLogger } from '../../server/lib/logger';
import { createDiskStorage, type Storage } from '../../server/lib/storage';
import {
  NOT_STORAGE_KEY_COLUMNS,
  STORAGE_KEY_COLUMNS,
  startStorageSweeper,
  sweepStorage,
} from '../../server/lib/storage-sweep';
import { pendingObjectKeys, putForTransaction } from '../../server/lib/transaction-objects';
import { saveAttachment } from '../../server/modules/attachments/attachments.service';
import { createApprovedClaim } from '../support/credit-factories';
import { createOrganization, createUser } from '../support/factories';
import { until } from '../support/crash-harness';
import { startFakeS3 } from '../support/fake-s3';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';
import { pngImage } from '../support/upload-fixtures';

// The orphan sweep: it removes a stored object only when no row names it and it is older than the grace
// period; and the rollback clean-up removes what a failed transaction wrote.

const HOUR = 60 * 60_000;
const execFileAsync = promisify(execFile);
const logger = createLogger('silent');
let t: TestContext;
let diskDir: string;
let s3: Awaited<ReturnType<typeof startFakeS3>>;
beforeAll(async () => {
  t = await createTestApp();
  diskDir = fs.mkdtempSync(path.join(os.tmpdir(), 'lumenproof-sweep-'));
  s3 = await startFakeS3('lumenproof-sweep');
});
afterEach(() => clock.reset());
afterAll(async () => {
  await s3?.stop();
  await closeTestApp(t);
  fs.rmSync(diskDir, { recursive: true, force: true });
});

const keysOf = async (storage: Storage) => {
  const out: string[] = [];
  for await (const o of storage.list()) out.push(o.key);
  return out.sort();
};

/** One object named by each kind of row that names stored objects, written the way the product writes them. */
async function referencedObjects(storage: Storage) {
  const c = await createOrganization(t.ds, 'contractor');
  const m = await createOrganization(t.ds, 'manufacturer');
  const installer = await createUser(t.ds, c, ['installer']);
  const claim = await createApprovedClaim(t.ds, { manufacturer: m, contractor: c, amount: '10.00' });
  // An attachment with its thumbnail (attachments.storage_key, attachments.thumbnail_key).
  const a = await saveAttachment(
    { ds: t.ds, storage, logger },
    {
      owner: { type: 'claim', id: claim.id },
      uploader: { id: installer.id, organizationId: c.id },
      purpose: 'site',
      file: { buffer: await pngImage(), originalname: 'site.png' },
    },
  );
  expect(a.thumbnailKey).not.toBeNull();
  // A letter (claim_documents.storage_key).
  const docId = crypto.randomUUID();
  const docKey = `claims/${claim.id}/documents/${docId}.pdf`;
  await storage.put(docKey, Buffer.from('%PDF-letter'), 'application/pdf');
  await t.ds.getRepository(ClaimDocument).insert({
    id: docId,
    claimId: claim.id,
    kind: 'letter',
    filename: 'letter.pdf',
    storageKey: docKey,
    sha256: '0'.repeat(64),
    byteSize: 11,
  });
  // A memo (credit_memos.pdf_storage_key).
  const memoId = crypto.randomUUID();
  const memoKey = `credit-memos/${m.id}/${memoId}.pdf`;
  await storage.put(memoKey, Buffer.from('%PDF-memo'), 'application/pdf');
  await t.ds.getRepository(CreditMemo).insert({
    id: memoId,
    number: `CM-T-${crypto.randomBytes(6).toString('hex')}`,
    kind: 'credit',
    manufacturerId: m.id,
    contractorId: c.id,
    claimId: claim.id,
    creditedClaimId: null,
    reversesMemoId: null,
    amount: '10.00',
    currency: 'USD',
    reason: null,
    pdfStorageKey: memoKey,
    pdfSha256: '0'.repeat(64),
    issuedById: installer.id,
    issuedAt: new Date(),
  });
  // An e-mail waiting with an attachment that only the outbox names (outbox_messages.attachments).
  const mailKey = `claims/${claim.id}/documents/${crypto.randomUUID()}.pdf`;
  await storage.put(mailKey, Buffer.from('%PDF-mail'), 'application/pdf');
  await t.ds.getRepository(OutboxMessage).insert({
    template: 'test',
    to: 'nobody@example.test',
    subject: 'test',
    text: 'test',
    html: '<p>test</p>',
    attachments: [{ filename: 'x.pdf', contentType: 'application/pdf', storageKey: mailKey }],
    status: 'sent',
    nextAttemptAt: new Date(),
  });
  return [a.storageKey, a.thumbnailKey!, docKey, memoKey, mailKey].sort();
}

function sweepContract(name: string, make: () => Storage) {
  describe(`the sweep on ${name}`, () => {
    it('never removes a referenced object, keeps a fresh orphan, removes an old one', async () => {
      const storage = make();
      const referenced = await referencedObjects(storage);
      const fresh = `claims/${crypto.randomUUID()}/documents/${crypto.randomUUID()}.pdf`;
      await storage.put(fresh, Buffer.from('fresh'), 'application/pdf');

      // Inside the grace period everything stays, referenced or not.
      let r = await sweepStorage(t.ds, storage, { graceMs: HOUR, batchSize: 2 });
      expect(r.removed).toEqual([]);
      expect(r.fresh).toBe(referenced.length + 1);
      expect(await keysOf(storage)).toEqual([...referenced, fresh].sort());

      // Two hours on, the orphan is old: it goes, and only it; a dry run first says so and removes nothing.
      clock.advance(2 * HOUR);
      r = await sweepStorage(t.ds, storage, { graceMs: HOUR, batchSize: 2, dryRun: true });
      expect(r.removed).toEqual([fresh]);
      expect(await keysOf(storage)).toEqual([...referenced, fresh].sort());
      r = await sweepStorage(t.ds, storage, { graceMs: HOUR, batchSize: 2 });
      expect(r).toMatchObject({ listed: referenced.length + 1, fresh: 0, referenced: referenced.length });
      expect(r.removed).toEqual([fresh]);
      expect(await keysOf(storage)).toEqual(referenced);

      // With no grace at all, still nothing referenced is touched.
      r = await sweepStorage(t.ds, storage, { graceMs: 0 });
      expect(r.removed).toEqual([]);
      expect(await keysOf(storage)).toEqual(referenced);
      for (const k of referenced) await storage.delete(k);
    });
  });
}

sweepContract('the disk', () => createDiskStorage(diskDir));
sweepContract('S3 (s3rver)', () => s3.storage);

describe('the sweep on the disk, specifically', () => {
  it('removes the temporary file of a write a crash cut off, once it is older than the grace period', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'lumenproof-sweep-tmp-'));
    const storage = createDiskStorage(dir);
    fs.mkdirSync(path.join(dir, 'attachments'));
    const temp = `attachments/.tmp-${crypto.randomUUID()}`;
    fs.writeFileSync(path.join(dir, temp), 'half a photo');
    expect((await sweepStorage(t.ds, storage, { graceMs: HOUR })).temporaries).toEqual([]);
    expect(fs.existsSync(path.join(dir, temp))).toBe(true);
    clock.advance(2 * HOUR);
    expect((await sweepStorage(t.ds, storage, { graceMs: HOUR })).temporaries).toEqual([temp]);
    expect(fs.existsSync(path.join(dir, temp))).toBe(false);
    fs.rmSync(dir, { recursive: true, force: true });
  });

  it(
    'runs as a script (npm run storage:sweep): a dry run names the orphan, the sweep removes it',
    { timeout: 60_000 },
    async () => {
      const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'lumenproof-sweep-script-'));
      const storage = createDiskStorage(dir);
      const orphan = `claims/${crypto.randomUUID()}/documents/${crypto.randomUUID()}.pdf`;
      await storage.put(orphan, Buffer.from('orphan'), 'application/pdf');
      const run = (...args: string[]) =>
        execFileAsync(process.execPath, ['--import', 'tsx', 'scripts/storage-sweep.ts', ...args], {
          env: { ...process.env, DATABASE_URL: inject('databaseUrl'), STORAGE_DIR: dir, NODE_ENV: 'test' },
        });
      // Inside the default grace period (an hour) it stays.
      expect((await run()).stdout).toContain('1 inside the grace period, removed 0');
      const dry = await run('--dry-run', '--grace-minutes', '0');
      expect(dry.stdout).toContain('would remove 1');
      expect(dry.stdout).toContain(orphan);
      expect(await storage.exists(orphan)).toBe(true);
      expect((await run('--grace-minutes', '0')).stdout).toContain('removed 1');
      expect(await storage.exists(orphan)).toBe(false);
      await expect(run('--grace-minutes', 'soon')).rejects.toMatchObject({ code: 2 });
      fs.rmSync(dir, { recursive: true, force: true });
    },
  );
});

describe('what the sweep counts as a reference', () => {
  it('knows every column that holds a storage key (a new `*_key` column must be listed)', () => {
    const listed = [...STORAGE_KEY_COLUMNS, ...NOT_STORAGE_KEY_COLUMNS].map((c) => `${c.table}.${c.column}`);
    const keyColumns = t.ds.entityMetadatas.flatMap((e) =>
      e.columns
        .filter((c) => /(_key|_keys|key)$/i.test(c.databaseName))
        .map((c) => `${e.tableName}.${c.databaseName}`),
    );
    expect(keyColumns.sort()).toEqual(listed.sort());
    // The one JSON place: e-mail attachments in the outbox (checked in the contract above).
    const outbox = t.ds.getMetadata(OutboxMessage).findColumnWithPropertyName('attachments');
    expect(outbox?.type).toBe('json');
  });
});

describe('the sweeper in the server', () => {
  it('sweeps at start-up, then on its interval; a second sweep at once waits its turn (skipped)', async () => {
    const storage = createDiskStorage(fs.mkdtempSync(path.join(os.tmpdir(), 'lumenproof-sweeper-')));
    await storage.put('claims/old/documents/orphan.pdf', Buffer.from('x'), 'application/pdf');
    clock.advance(2 * HOUR);
    const sweeper = startStorageSweeper(t.ds, storage, logger, { graceMs: HOUR, intervalMs: 60_000 });
    const [first, second] = await Promise.all([
      sweeper.first,
      sweepStorage(t.ds, storage, { graceMs: HOUR }).catch(() => null),
    ]);
    await sweeper.stop();
    expect(first?.removed.length ?? 0).toBeLessThanOrEqual(1);
    // Either the start-up sweep removed it, or the other one did while the start-up one found the lock taken.
    expect([first?.removed, second?.removed].flat().filter(Boolean)).toEqual([
      'claims/old/documents/orphan.pdf',
    ]);
    expect(await keysOf(storage)).toEqual([]);
  });
});

describe('the server', () => {
  it('sweeps at start-up (startServer)', { timeout: 60_000 }, async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'lumenproof-sweep-start-'));
    const storage = createDiskStorage(dir);
    const orphan = `credit-memos/${crypto.randomUUID()}/${crypto.randomUUID()}.pdf`;
    await storage.put(orphan, Buffer.from('orphan'), 'application/pdf');
    clock.advance(2 * HOUR);
    const config = loadConfig({
      NODE_ENV: 'test',
      LOG_LEVEL: 'silent',
      PORT: '0',
      OUTBOX_WORKER: 'false',
      STORAGE_DIR: dir,
      DATA_DIR: '.data/test-run',
    });
    const srv = await startServer(config, inject('databaseUrl'));
    try {
      await until('the start-up sweep', async () => !(await storage.exists(orphan)));
    } finally {
      await srv.stop();
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe('objects written for a transaction', () => {
  const storage = () => createDiskStorage(diskDir);

  it('are removed when the transaction rolls back', async () => {
    const s = storage();
    const key = `claims/${crypto.randomUUID()}/documents/rolled-back.pdf`;
    await expect(
      t.ds.transaction(async (m) => {
        await putForTransaction(m, s, key, Buffer.from('x'), 'application/pdf');
        expect(await s.exists(key)).toBe(true);
        throw new Error('refused after the write');
      }),
    ).rejects.toThrow('refused after the write');
    expect(await s.exists(key)).toBe(false);
  });

  it('stay when it commits, and are forgotten by the connection', async () => {
    const s = storage();
    const key = `claims/${crypto.randomUUID()}/documents/committed.pdf`;
    let qr: Parameters<typeof pendingObjectKeys>[0] | undefined;
    await t.ds.transaction(async (m) => {
      qr = m.queryRunner!;
      await putForTransaction(m, s, key, Buffer.from('x'), 'application/pdf');
      expect(pendingObjectKeys(qr)).toEqual([key]);
    });
    expect(pendingObjectKeys(qr!)).toEqual([]);
    expect(await s.exists(key)).toBe(true);
    await s.delete(key);
  });

  it('under a savepoint that rolls back go; those of the transaction around it stay', async () => {
    const s = storage();
    const outer = `claims/${crypto.randomUUID()}/documents/outer.pdf`;
    const inner = `claims/${crypto.randomUUID()}/documents/inner.pdf`;
    const kept = `claims/${crypto.randomUUID()}/documents/kept.pdf`;
    await t.ds.transaction(async (m) => {
      await putForTransaction(m, s, outer, Buffer.from('o'), 'application/pdf');
      await m
        .transaction(async (n) => {
          await putForTransaction(n, s, inner, Buffer.from('i'), 'application/pdf');
          throw new Error('inner refused');
        })
        .catch(() => undefined);
      await m.transaction(async (n) => putForTransaction(n, s, kept, Buffer.from('k'), 'application/pdf'));
    });
    expect(await s.exists(outer)).toBe(true);
    expect(await s.exists(inner)).toBe(false);
    expect(await s.exists(kept)).toBe(true);
    for (const k of [outer, kept]) await s.delete(k);
  });

  it('cannot be written outside a transaction', async () => {
    await expect(
      putForTransaction(
        t.ds.manager,
        storage(),
        'claims/x/documents/y.pdf',
        Buffer.from('x'),
        'application/pdf',
      ),
    ).rejects.toThrow('open transaction');
  });
});
