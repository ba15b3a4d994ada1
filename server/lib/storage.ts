import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadObjectCommand,
  ListObjectsV2Command,
  PutObjectCommand,
  S3Client,
  type S3ClientConfig,
} from '@aws-sdk/client-s3';
import { Upload } from '@aws-sdk/lib-storage';
import type { AppConfig } from '../config/env';

// Where uploaded files live: a folder on this machine by default, S3-compatible object storage past one machine.
// Keys are ours (random ids), never a user's file name; both adapters refuse anything that is not a plain key.

export interface Storage {
  readonly driver: 'disk' | 's3';
  put(key: string, body: Buffer | Readable, contentType: string): Promise<void>;
  get(key: string): Promise<Readable>;
  getBuffer(key: string): Promise<Buffer>;
  delete(key: string): Promise<void>;
  exists(key: string): Promise<boolean>;
  /**
   * Every stored object whose key starts with prefix (all of them without one), with its last-modified time, in
   * pages as the store hands them out: the orphan sweep walks a whole store without holding it in memory.
   */
  list(prefix?: string): AsyncIterable<StoredObject>;
  /**
   * Disk only: removes the temporary files of writes cut off by a crash, last touched before `before`, and
   * returns their paths. (On S3 an upload cut off never becomes an object; its parts are for the bucket's
   * lifecycle rule, AbortIncompleteMultipartUpload.)
   */
  removeStaleTemporaries?(before: Date): Promise<string[]>;
}

export type StoredObject = { key: string; lastModified: Date; size: number };

export class StorageKeyError extends Error {}
export class StorageObjectMissing extends Error {
  constructor(public key: string) {
    super(`No stored object under ${key}.`);
  }
}

const KEY = /^[A-Za-z0-9][A-Za-z0-9._-]{0,127}(\/[A-Za-z0-9][A-Za-z0-9._-]{0,127}){0,7}$/;

/** A key is one to eight segments of letters, digits, dot, dash and underscore; no segment starts with a dot. */
export function assertStorageKey(key: string): void {
  if (typeof key !== 'string' || !KEY.test(key) || key.split('/').some((s) => s === '.' || s === '..')) {
    throw new StorageKeyError(`Not a valid storage key: ${JSON.stringify(key)}`);
  }
}

async function toBuffer(stream: Readable): Promise<Buffer> {
  const chunks: Buffer[] = [];
  for await (const chunk of stream)
    chunks.push(Buffer.isBuffer(chunk) ? chunk : Buffer.from(chunk as Uint8Array));
  return Buffer.concat(chunks);
}

export function createDiskStorage(root: string): Storage {
  const base = path.resolve(root);
  const fileOf = (key: string) => {
    assertStorageKey(key);
    const file = path.resolve(base, ...key.split('/'));
    // Belt and braces: the key pattern already rules out traversal.
    if (!file.startsWith(base + path.sep))
      throw new StorageKeyError(`Key escapes the storage folder: ${key}`);
    return file;
  };
  const missing = (err: unknown) => (err as NodeJS.ErrnoException)?.code === 'ENOENT';

  return {
    driver: 'disk',
    async put(key, body) {
      const file = fileOf(key);
      await fs.promises.mkdir(path.dirname(file), { recursive: true, mode: 0o750 });
      // Written beside the target under a temporary name, then renamed: readers never see half a file.
      const temp = path.join(path.dirname(file), `.tmp-${crypto.randomUUID()}`);
      try {
        if (Buffer.isBuffer(body)) await fs.promises.writeFile(temp, body, { mode: 0o640, flag: 'wx' });
        else await pipeline(body, fs.createWriteStream(temp, { mode: 0o640, flags: 'wx' }));
        await fs.promises.rename(temp, file);
      } catch (err) {
        await fs.promises.rm(temp, { force: true });
        throw err;
      }
    },
    async get(key) {
      const file = fileOf(key);
      // Opened before returning, so that a missing object is an error here and not on the first read.
      const handle = await fs.promises.open(file, 'r').catch((err) => {
        throw missing(err) ? new StorageObjectMissing(key) : err;
      });
      return handle.createReadStream();
    },
    async getBuffer(key) {
      return fs.promises.readFile(fileOf(key)).catch((err) => {
        throw missing(err) ? new StorageObjectMissing(key) : err;
      });
    },
    async delete(key) {
      await fs.promises.rm(fileOf(key), { force: true });
    },
    async exists(key) {
      try {
        return (await fs.promises.stat(fileOf(key))).isFile();
      } catch (err) {
        if (missing(err)) return false;
        throw err;
      }
    },
    async *list(prefix = '') {
      // Walks the folder depth first in name order; temporary files of writes in flight (and anything else that
      // is not a key) are not objects and are never listed.
      async function* walk(dir: string, keyPrefix: string): AsyncGenerator<StoredObject> {
        const entries = await fs.promises.readdir(dir, { withFileTypes: true }).catch((err) => {
          if (missing(err)) return [];
          throw err;
        });
        entries.sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
        for (const e of entries) {
          const key = `${keyPrefix}${e.name}`;
          if (e.isDirectory()) {
            if (prefix.startsWith(`${key}/`) || `${key}/`.startsWith(prefix))
              yield* walk(path.join(dir, e.name), `${key}/`);
          } else if (e.isFile() && key.startsWith(prefix) && KEY.test(key)) {
            const stat = await fs.promises.stat(path.join(dir, e.name)).catch(() => null);
            // Gone between the listing and the stat: deleted meanwhile, so not there.
            if (stat) yield { key, lastModified: stat.mtime, size: stat.size };
          }
        }
      }
      yield* walk(base, '');
    },
    async removeStaleTemporaries(before) {
      const removed: string[] = [];
      const walk = async (dir: string, rel: string) => {
        const entries = await fs.promises.readdir(dir, { withFileTypes: true }).catch(() => []);
        for (const e of entries) {
          const file = path.join(dir, e.name);
          if (e.isDirectory()) await walk(file, `${rel}${e.name}/`);
          else if (e.isFile() && e.name.startsWith('.tmp-')) {
            const stat = await fs.promises.stat(file).catch(() => null);
            if (stat && stat.mtime.getTime() < before.getTime()) {
              await fs.promises.rm(file, { force: true });
              removed.push(`${rel}${e.name}`);
            }
          }
        }
      };
      await walk(base, '');
      return removed;
    },
  };
}

export type S3StorageOptions = {
  bucket: string;
  region: string;
  endpoint?: string;
  accessKeyId?: string;
  secretAccessKey?: string;
  /** Keys per ListObjectsV2 page (S3's own limit and default is 1,000); tests set it small to page. */
  listPageSize?: number;
};

export function createS3Storage(opts: S3StorageOptions): Storage & { client: S3Client } {
  const clientConfig: S3ClientConfig = {
    region: opts.region,
    endpoint: opts.endpoint,
    // Path-style addressing works with every S3-compatible server (no bucket subdomains needed).
    forcePathStyle: true,
    // Checksums only where the API requires them: S3-compatible servers (and the local fake) otherwise
    // store the aws-chunked framing of streamed uploads as if it were the object.
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
    ...(opts.accessKeyId && opts.secretAccessKey
      ? { credentials: { accessKeyId: opts.accessKeyId, secretAccessKey: opts.secretAccessKey } }
      : {}),
  };
  const client = new S3Client(clientConfig);
  const Bucket = opts.bucket;
  const notFound = (err: unknown) => {
    const e = err as { name?: string; $metadata?: { httpStatusCode?: number } };
    return e?.name === 'NoSuchKey' || e?.name === 'NotFound' || e?.$metadata?.httpStatusCode === 404;
  };

  return {
    driver: 's3',
    client,
    async put(key, body, contentType) {
      assertStorageKey(key);
      if (Buffer.isBuffer(body)) {
        await client.send(new PutObjectCommand({ Bucket, Key: key, Body: body, ContentType: contentType }));
      } else {
        // Streams of unknown length go up in parts.
        await new Upload({
          client,
          params: { Bucket, Key: key, Body: body, ContentType: contentType },
        }).done();
      }
    },
    async get(key) {
      assertStorageKey(key);
      try {
        const out = await client.send(new GetObjectCommand({ Bucket, Key: key }));
        if (out.Body instanceof Readable) return out.Body;
        throw new Error('The object store answered without a readable body.');
      } catch (err) {
        throw notFound(err) ? new StorageObjectMissing(key) : err;
      }
    },
    async getBuffer(key) {
      return toBuffer(await this.get(key));
    },
    async delete(key) {
      assertStorageKey(key);
      await client.send(new DeleteObjectCommand({ Bucket, Key: key }));
    },
    async exists(key) {
      assertStorageKey(key);
      try {
        await client.send(new HeadObjectCommand({ Bucket, Key: key }));
        return true;
      } catch (err) {
        if (notFound(err)) return false;
        throw err;
      }
    },
    async *list(prefix) {
      let ContinuationToken: string | undefined;
      do {
        const page = await client.send(
          new ListObjectsV2Command({
            Bucket,
            Prefix: prefix || undefined,
            MaxKeys: opts.listPageSize ?? 1000,
            ContinuationToken,
          }),
        );
        for (const o of page.Contents ?? []) {
          if (!o.Key) continue;
          // A store that gives no time is taken as "just written": the sweep then leaves the object alone.
          yield { key: o.Key, lastModified: o.LastModified ?? new Date(), size: o.Size ?? 0 };
        }
        ContinuationToken = page.IsTruncated ? page.NextContinuationToken : undefined;
      } while (ContinuationToken);
    },
  };
}

export function createStorage(config: Pick<AppConfig, 'storage'>): Storage {
  const s = config.storage;
  if (s.driver === 's3') {
    if (!s.s3.bucket) throw new Error('S3_BUCKET is required when STORAGE_DRIVER=s3.');
    return createS3Storage({ ...s.s3, bucket: s.s3.bucket });
  }
  return createDiskStorage(s.dir);
}
