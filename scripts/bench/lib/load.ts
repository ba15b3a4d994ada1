import http from 'node:http';

// A small closed-loop load generator: N concurrent loops on keep-alive connections, each sending its next
// request as soon as the last answer arrives, for a fixed time. Loopback only, bounded in time and count.

export type LoadResult = {
  requests: number;
  errors: number;
  seconds: number;
  perSecond: number;
  p50: number;
  p99: number;
  max: number;
};

export type LoadOptions = {
  base: string;
  /** Each loop's next path (may vary per request). */
  path: (n: number) => string;
  headers?: Record<string, string>;
  connections?: number;
  seconds?: number;
  /** A hard cap on requests, whatever the time. */
  maxRequests?: number;
};

export const percentile = (sorted: number[], p: number) =>
  sorted.length
    ? sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))]
    : NaN;

export const median = (xs: number[]) =>
  percentile(
    [...xs].sort((a, b) => a - b),
    50,
  );

export async function runLoad(opts: LoadOptions): Promise<LoadResult> {
  const url = new URL(opts.base);
  if (url.hostname !== '127.0.0.1' && url.hostname !== 'localhost')
    throw new Error('load tests run against 127.0.0.1 only');
  const connections = opts.connections ?? 16;
  const seconds = opts.seconds ?? 10;
  const maxRequests = opts.maxRequests ?? 200_000;
  const agent = new http.Agent({ keepAlive: true, maxSockets: connections });
  const latencies: number[] = [];
  let errors = 0;
  let sent = 0;
  const started = performance.now();
  const deadline = started + seconds * 1000;

  const once = (path: string) =>
    new Promise<number>((resolve) => {
      const req = http.request(
        { host: url.hostname, port: url.port, path, method: 'GET', agent, headers: opts.headers },
        (res) => {
          res.resume();
          res.on('end', () => resolve(res.statusCode ?? 0));
          res.on('error', () => resolve(0));
        },
      );
      req.on('error', () => resolve(0));
      req.end();
    });

  const loop = async () => {
    while (performance.now() < deadline && sent < maxRequests) {
      const n = sent++;
      const t0 = performance.now();
      const status = await once(opts.path(n));
      latencies.push(performance.now() - t0);
      if (status !== 200) errors++;
    }
  };
  await Promise.all(Array.from({ length: connections }, loop));
  const elapsed = (performance.now() - started) / 1000;
  agent.destroy();
  latencies.sort((a, b) => a - b);
  return {
    requests: latencies.length,
    errors,
    seconds: elapsed,
    perSecond: latencies.length / elapsed,
    p50: percentile(latencies, 50),
    p99: percentile(latencies, 99),
    max: latencies[latencies.length - 1] ?? NaN,
  };
}
