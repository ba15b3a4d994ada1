import autocannon from 'autocannon';

// Load with autocannon: N keep-alive connections, each sending its next request as soon as the last answer
// arrives, for a fixed time. Loopback only, bounded in time and count.

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
  let n = 0;
  const result = await autocannon({
    url: opts.base,
    connections: opts.connections ?? 16,
    duration: opts.seconds ?? 10,
    amount: opts.maxRequests,
    headers: opts.headers,
    // Each request may ask for another path (a record page cycling through ids).
    requests: [{ method: 'GET', setupRequest: (req) => ({ ...req, path: opts.path(n++) }) }],
  });
  return {
    requests: result.requests.total,
    errors: result.errors + result.timeouts + result.non2xx,
    seconds: result.duration,
    perSecond: result.requests.total / result.duration,
    p50: result.latency.p50,
    p99: result.latency.p99,
    max: result.latency.max,
  };
}
