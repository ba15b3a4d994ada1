// s3rver in a process of its own, for tests that page through listings: its continuation tokens are made with
// DES, which Node's OpenSSL 3 offers only with --openssl-legacy-provider (tests/support/fake-s3.ts passes it).
import S3rver from 's3rver';

const directory = process.argv[2];
const server = new S3rver({ address: '127.0.0.1', port: 0, directory, silent: true });
const { port } = await server.run();
process.stdout.write(`${JSON.stringify({ port })}\n`);
process.on('SIGTERM', () => void server.close().then(() => process.exit(0)));
