import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { CreateBucketCommand, ListObjectsV2Command } from '@aws-sdk/client-s3';
import S3rver from 's3rver';
import { createS3Storage } from '../../server/lib/storage';

// A local fake of S3 (s3rver) on 127.0.0.1, a free port and a temporary folder; the bucket is created through
// the S3 API itself, as an operator would.
//
// With { ownProcess: true } the fake runs in a child process with Node's legacy OpenSSL provider, so that it can
// answer a listing of more than one page (its continuation tokens need DES).
export async function startFakeS3(bucket = 'lumenproof-test', opts: { ownProcess?: boolean } = {}) {
  const directory = fs.mkdtempSync(path.join(os.tmpdir(), 'lumenproof-s3-'));
  const { port, close } = opts.ownProcess ? await runInChild(directory) : await runHere(directory);
  const settings = {
    endpoint: `http://127.0.0.1:${port}`,
    region: 'us-east-1',
    bucket,
    // s3rver's fixed development credentials.
    accessKeyId: 'S3RVER',
    secretAccessKey: 'S3RVER',
  };
  const storage = createS3Storage(settings);
  await storage.client.send(new CreateBucketCommand({ Bucket: bucket }));
  return {
    settings,
    storage,
    async keys(): Promise<string[]> {
      const out = await storage.client.send(new ListObjectsV2Command({ Bucket: bucket }));
      return (out.Contents ?? []).map((o) => o.Key!).sort();
    },
    async stop() {
      storage.client.destroy();
      await close();
      fs.rmSync(directory, { recursive: true, force: true });
    },
  };
}

async function runHere(directory: string) {
  const server = new S3rver({ address: '127.0.0.1', port: 0, directory, silent: true });
  const { port } = await server.run();
  return { port, close: () => server.close() };
}

function runInChild(directory: string): Promise<{ port: number; close: () => Promise<void> }> {
  const child = spawn(
    process.execPath,
    [
      '--openssl-legacy-provider',
      '--import',
      'tsx',
      path.resolve('tests/support/s3rver-child.ts'),
      directory,
    ],
    { stdio: ['ignore', 'pipe', 'inherit'] },
  );
  const close = async () => {
    if (child.exitCode !== null || child.signalCode !== null) return;
    const exited = new Promise((r) => child.once('exit', r));
    child.kill('SIGTERM');
    await exited;
  };
  return new Promise((resolve, reject) => {
    let out = '';
    child.stdout!.on('data', (d: Buffer) => {
      out += d.toString();
      const line = out.split('\n').find((l) => l.startsWith('{'));
      if (line) resolve({ port: (JSON.parse(line) as { port: number }).port, close });
    });
    child.once('exit', (code) => reject(new Error(`s3rver exited early (${code})`)));
  });
}
