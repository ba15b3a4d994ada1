import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { Readable } from 'node:stream';
import { ListObjectsV2Command } from '@aws-sdk/client-s3';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { loadConfig } from '../../server/config/env';
import {
  assertStorageKey,
  createDiskStorage,
  createS3Storage,
  createStorage,
  StorageKeyError,
  StorageObjectMissing,
  type Storage,
} from '../../server/lib/storage';
import { startFakeS3 } from '../support/fake-s3';

const sha256 = (b: Buffer) => crypto.createHash('sha256').update(b).digest('hex');

/** A body of 3 MB in 64 KiB chunks, as a stream of unknown length. */
function streamedBody(bytes = 3 * 1024 * 1024) {
  const data = crypto.randomBytes(bytes);
  const chunks: Buffer[] = [];
  for (let i = 0; i < data.length; i += 64 * 1024) chunks.push(data.subarray(i, i + 64 * 1024));
  return { data, stream: Readable.from(chunks) };
}

async function readAll(s: Readable) {
  const parts: Buffer[] = [];
  for await (const c of s) parts.push(c as Buffer);
  return Buffer.concat(parts);
}

function listFiles(dir: string): string[] {
  if (!fs.existsSync(dir)) return [];
  return fs
    .readdirSync(dir, { recursive: true, withFileTypes: true })
    .filter((e) => e.isFile())
    .map((e) => path.relative(dir, path.join(e.parentPath, e.name)))
    .sort();
}

describe('storage keys', () => {
  it.each([
    '../etc/passwd',
    'a/../../b',
    '/abs/path',
    'a\\b',
    '.hidden',
    'a//b',
    '',
    'a/./b',
    'ok\u0000',
    'é',
  ])('refuses %j', (key) => {
    expect(() => assertStorageKey(key)).toThrow(StorageKeyError);
  });
  it.each(['attachments/0f8c.jpg', 'a', 'attachments/2025/x_y-z.thumb.webp'])('accepts %j', (key) => {
    expect(() => assertStorageKey(key)).not.toThrow();
  });
});

// The same behaviour from both adapters.
function contract(name: string, make: () => { storage: Storage; listing: () => Promise<string[]> }) {
  describe(`${name} adapter`, () => {
    it('puts a buffer, reads it back as a stream and as a buffer, then deletes it', async () => {
      const { storage, listing } = make();
      const body = crypto.randomBytes(1000);
      await storage.put('attachments/one.bin', body, 'application/octet-stream');
      expect(await storage.exists('attachments/one.bin')).toBe(true);
      expect(sha256(await storage.getBuffer('attachments/one.bin'))).toBe(sha256(body));
      expect(sha256(await readAll(await storage.get('attachments/one.bin')))).toBe(sha256(body));
      expect(await listing()).toEqual(['attachments/one.bin']);
      await storage.delete('attachments/one.bin');
      expect(await storage.exists('attachments/one.bin')).toBe(false);
      expect(await listing()).toEqual([]);
      // Deleting what is not there is not an error (a clean-up may run twice).
      await storage.delete('attachments/one.bin');
    });

    it('stores a 3 MB streamed body byte for byte', async () => {
      const { storage, listing } = make();
      const { data, stream } = streamedBody();
      await storage.put('attachments/streamed.bin', stream, 'application/octet-stream');
      const back = await storage.getBuffer('attachments/streamed.bin');
      expect(back.length).toBe(data.length);
      expect(sha256(back)).toBe(sha256(data));
      await storage.delete('attachments/streamed.bin');
      expect(await listing()).toEqual([]);
    });

    it('reports a missing object as missing', async () => {
      const { storage } = make();
      await expect(storage.get('attachments/nothing-here')).rejects.toBeInstanceOf(StorageObjectMissing);
      await expect(storage.getBuffer('attachments/nothing-here')).rejects.toBeInstanceOf(
        StorageObjectMissing,
      );
      expect(await storage.exists('attachments/nothing-here')).toBe(false);
    });

    it('refuses keys that could leave the store, and writes nothing', async () => {
      const { storage, listing } = make();
      await expect(storage.put('../escape.txt', Buffer.from('x'), 'text/plain')).rejects.toBeInstanceOf(
        StorageKeyError,
      );
      await expect(storage.get('a/../../etc/passwd')).rejects.toBeInstanceOf(StorageKeyError);
      expect(await listing()).toEqual([]);
    });

    it('lists every object with its size and last-modified time, or those under a prefix', async () => {
      const { storage, listing } = make();
      // Stores keep seconds at least; the window allows for a store that truncates to the second.
      const before = Date.now() - 1000;
      const keys = [
        'claims/c1/documents/d1.pdf',
        'claims/c1/documents/d2.pdf',
        'claims/c2/x',
        'credit-memos/m/1.pdf',
      ];
      for (const k of keys) await storage.put(k, Buffer.from(k), 'application/pdf');
      const after = Date.now() + 1000;
      const all = await collect(storage.list());
      expect(all.map((o) => o.key).sort()).toEqual(keys);
      for (const o of all) {
        expect(o.size).toBe(Buffer.byteLength(o.key));
        expect(o.lastModified.getTime()).toBeGreaterThanOrEqual(before);
        expect(o.lastModified.getTime()).toBeLessThanOrEqual(after);
      }
      expect((await collect(storage.list('claims/c1/'))).map((o) => o.key).sort()).toEqual(keys.slice(0, 2));
      // A prefix is a prefix of the key, not a folder: it may end inside a segment.
      expect((await collect(storage.list('claims/c'))).map((o) => o.key).sort()).toEqual(keys.slice(0, 3));
      expect(await collect(storage.list('nothing/'))).toEqual([]);
      for (const k of keys) await storage.delete(k);
      expect(await listing()).toEqual([]);
      expect(await collect(storage.list())).toEqual([]);
    });
  });
}

async function collect<T>(it: AsyncIterable<T>) {
  const out: T[] = [];
  for await (const x of it) out.push(x);
  return out;
}

let diskDir: string;
let s3: Awaited<ReturnType<typeof startFakeS3>>;
beforeAll(async () => {
  diskDir = fs.mkdtempSync(path.join(os.tmpdir(), 'lumenproof-disk-'));
  s3 = await startFakeS3();
});
afterAll(async () => {
  await s3?.stop();
  fs.rmSync(diskDir, { recursive: true, force: true });
});

contract('disk', () => ({ storage: createDiskStorage(diskDir), listing: async () => listFiles(diskDir) }));
contract('S3 (against s3rver)', () => ({ storage: s3.storage, listing: () => s3.keys() }));

describe('S3 listing', () => {
  it('follows continuation tokens across pages (ListObjectsV2)', { timeout: 60_000 }, async () => {
    const own = await startFakeS3('lumenproof-paged', { ownProcess: true });
    const storage = createS3Storage({ ...own.settings, listPageSize: 2 });
    const keys = ['paged/a', 'paged/b', 'paged/c', 'paged/d', 'paged/e'];
    for (const k of keys) await storage.put(k, Buffer.from(k), 'text/plain');
    const send = vi.spyOn(storage.client, 'send');
    const listed = await collect(storage.list('paged/'));
    expect(listed.map((o) => o.key)).toEqual(keys);
    // 5 keys at 2 a page: three requests.
    expect(send.mock.calls.filter(([c]) => c instanceof ListObjectsV2Command)).toHaveLength(3);
    send.mockRestore();
    for (const k of keys) await storage.delete(k);
    storage.client.destroy();
    expect(await own.keys()).toEqual([]);
    await own.stop();
  });
});

describe('disk adapter specifics', () => {
  it('leaves no temporary file behind when a streamed write fails', async () => {
    const storage = createDiskStorage(diskDir);
    const failing = new Readable({
      read() {
        this.push(Buffer.alloc(1024));
        this.destroy(new Error('connection dropped'));
      },
    });
    await expect(storage.put('attachments/broken.bin', failing, 'application/octet-stream')).rejects.toThrow(
      'connection dropped',
    );
    expect(listFiles(diskDir)).toEqual([]);
  });

  it('does not list a write in flight (its temporary file) or anything that is not a key', async () => {
    const storage = createDiskStorage(diskDir);
    fs.mkdirSync(path.join(diskDir, 'attachments'), { recursive: true });
    fs.writeFileSync(path.join(diskDir, 'attachments', `.tmp-${crypto.randomUUID()}`), 'half');
    await storage.put('attachments/whole', Buffer.from('whole'), 'text/plain');
    expect((await collect(storage.list())).map((o) => o.key)).toEqual(['attachments/whole']);
    fs.rmSync(path.join(diskDir, 'attachments'), { recursive: true, force: true });
  });
});

describe('createStorage', () => {
  it('uses the disk by default, under the configured folder', () => {
    const storage = createStorage(loadConfig({ NODE_ENV: 'test', STORAGE_DIR: diskDir }));
    expect(storage.driver).toBe('disk');
  });

  it('uses S3 when configured, and it reaches the fake', async () => {
    const storage = createStorage(
      loadConfig({
        NODE_ENV: 'test',
        STORAGE_DRIVER: 's3',
        S3_ENDPOINT: s3.settings.endpoint,
        S3_BUCKET: s3.settings.bucket,
        S3_ACCESS_KEY_ID: s3.settings.accessKeyId,
        S3_SECRET_ACCESS_KEY: s3.settings.secretAccessKey,
      }),
    );
    expect(storage.driver).toBe('s3');
    await storage.put('attachments/configured.txt', Buffer.from('hello'), 'text/plain');
    expect(await s3.keys()).toEqual(['attachments/configured.txt']);
    await storage.delete('attachments/configured.txt');
    expect(await s3.keys()).toEqual([]);
  });
});
