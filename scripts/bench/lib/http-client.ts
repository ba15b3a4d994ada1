import http from 'node:http';

/**
 * GET with one keep-alive connection and the body parsed as JSON: what the benches time an API call with. Node's
 * fetch added about 0.65 ms of its own to a 41 KB list answer on this machine (its web streams and body mixin),
 * which is the client's cost, not the API's; the raw queries it is compared with are timed with mysql2's client.
 */
export function createBenchClient(base: string, cookie: string) {
  const agent = new http.Agent({ keepAlive: true, maxSockets: 1 });
  return {
    getJson<T>(path: string): Promise<{ status: number; body: T }> {
      return new Promise((resolve, reject) => {
        http
          .get(`${base}${path}`, { agent, headers: { cookie, accept: 'application/json' } }, (res) => {
            const chunks: Buffer[] = [];
            res.on('data', (c: Buffer) => chunks.push(c));
            res.on('end', () => {
              try {
                resolve({
                  status: res.statusCode ?? 0,
                  body: JSON.parse(Buffer.concat(chunks).toString('utf8')),
                });
              } catch (err) {
                reject(err as Error);
              }
            });
            res.on('error', reject);
          })
          .on('error', reject);
      });
    },
    close: () => agent.destroy(),
  };
}
