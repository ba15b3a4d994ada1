// A webhook receiver for trying Lumenproof's webhooks locally (README, "Integrating with Lumenproof"): checks
// each delivery's Lumenproof-Signature and prints the event. It imports nothing from Lumenproof, so an integrator
// can copy it as a starting point.
//
//   WEBHOOK_SECRET=lpwhsec_… npx tsx scripts/webhook-receiver.ts [port, default 4545]
import crypto from 'node:crypto';
import http from 'node:http';

/** Refuse deliveries signed longer ago than this: a captured delivery cannot be replayed later. */
export const TOLERANCE_SECONDS = 300;

/**
 * Whether `header` (`t=<unix seconds>,v1=<hex>`) signs `body` under `secret`: HMAC-SHA256 over "<t>.<body>",
 * compared in constant time, with the timestamp within the tolerance of `nowSeconds`.
 */
export function verifySignature(
  secret: string,
  header: string | undefined,
  body: string,
  nowSeconds = Math.floor(Date.now() / 1000),
): boolean {
  const parts = Object.fromEntries(
    (header ?? '').split(',').map((p) => p.trim().split('=', 2) as [string, string]),
  );
  const t = Number(parts.t);
  if (!Number.isInteger(t) || !/^[0-9a-f]{64}$/.test(parts.v1 ?? '')) return false;
  if (Math.abs(nowSeconds - t) > TOLERANCE_SECONDS) return false;
  const expected = crypto.createHmac('sha256', secret).update(`${t}.${body}`).digest();
  return crypto.timingSafeEqual(expected, Buffer.from(parts.v1, 'hex'));
}

function main() {
  const secret = process.env.WEBHOOK_SECRET;
  if (!secret) {
    console.error(
      'Set WEBHOOK_SECRET to the signing secret Lumenproof showed when you registered the endpoint.',
    );
    process.exit(2);
  }
  const port = Number(process.argv[2] ?? 4545);
  const server = http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => {
      const body = Buffer.concat(chunks).toString('utf8');
      if (
        req.method !== 'POST' ||
        !verifySignature(secret, req.headers['lumenproof-signature'] as string, body)
      ) {
        console.log(`refused: ${req.method} ${req.url} (bad or stale signature)`);
        res.writeHead(400).end();
        return;
      }
      const event = JSON.parse(body) as { id: string; type: string; data: Record<string, unknown> };
      console.log(`${event.type} ${event.id}\n${JSON.stringify(event.data, null, 2)}`);
      res.writeHead(204).end();
    });
  });
  server.listen(port, '127.0.0.1', () => console.log(`listening on http://127.0.0.1:${port}/`));
  const stop = () => server.close(() => process.exit(0));
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

if (import.meta.url === `file://${process.argv[1]}`) main();
