import net from 'node:net';

/** A TCP port on 127.0.0.1 that was free a moment ago (for a child process that must be told its port). */
export function freePort() {
  return new Promise<number>((resolve, reject) => {
    const s = net.createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const { port } = s.address() as net.AddressInfo;
      s.close(() => resolve(port));
    });
  });
}

/** Polls `${base}/api/health` until it answers 200 (or the deadline passes). */
export async function waitForHealth(base: string, timeoutMs = 60_000) {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const ok = await fetch(`${base}/api/health`).then(
      (r) => r.ok,
      () => false,
    );
    if (ok) return;
    if (Date.now() > deadline)
      throw new Error(`${base} did not answer /api/health within ${timeoutMs / 1000} s`);
    await new Promise((r) => setTimeout(r, 200));
  }
}
