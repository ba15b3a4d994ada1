import { spawn } from 'node:child_process';
import path from 'node:path';

/** Starts scripts/bench/lib/bench-server.ts as a child process on the given database; resolves with its base URL. */
export async function startServerProcess(databaseUrl: string) {
  const child = spawn(
    path.resolve('node_modules/.bin/tsx'),
    [path.resolve('scripts/bench/lib/bench-server.ts')],
    { env: { ...process.env, BENCH_DATABASE_URL: databaseUrl }, stdio: ['ignore', 'pipe', 'inherit'] },
  );
  const port = await new Promise<number>((resolve, reject) => {
    let out = '';
    child.stdout.on('data', (d: Buffer) => {
      out += d.toString();
      const m = out.match(/LISTENING (\d+)/);
      if (m) resolve(Number(m[1]));
    });
    child.once('exit', (code) => reject(new Error(`the bench server exited (${code}) before listening`)));
  });
  return {
    base: `http://127.0.0.1:${port}`,
    stop: () =>
      new Promise<void>((resolve) => {
        if (child.exitCode !== null) return resolve();
        child.once('exit', () => resolve());
        child.kill('SIGTERM');
      }),
  };
}
