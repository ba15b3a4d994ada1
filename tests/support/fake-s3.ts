import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { CreateBucketCommand, ListObjectsV2Command } from '@aws-sdk/client-s3';
import S3rver from 's3rver';
import { createS3Storage } from '../../server/lib/storage';

// A local fake of S3 (s3rver) on 127.0.0.1, a free port and a temporary folder; the bucket is created through
// the S3 API itself, as an operator would.
export async function startFakeS3(bucket = 'lumenproof-test') {
  const directory = fs.mkdtempSync(path.join(os.tmpdir(), 'lumenproof-s3-'));
  const server = new S3rver({ address: '127.0.0.1', port: 0, directory, silent: true });
  const { port } = await server.run();
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
      await server.close();
      fs.rmSync(directory, { recursive: true, force: true });
    },
  };
}
