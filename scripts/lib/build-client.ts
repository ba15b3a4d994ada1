import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';

/** The newest modification time under a path (0 when it is missing): what a build is compared against. */
export function newestMtime(p: string): number {
  if (!fs.existsSync(p)) return 0;
  const st = fs.statSync(p);
  if (!st.isDirectory()) return st.mtimeMs;
  let newest = st.mtimeMs;
  for (const entry of fs.readdirSync(p)) newest = Math.max(newest, newestMtime(path.join(p, entry)));
  return newest;
}

/** Builds the client with Vite when dist/ is missing or older than its sources. */
export function buildClientIfNeeded(log: (s: string) => void = console.log, force = false) {
  const built = path.resolve('dist/index.html');
  const sources = [
    'src',
    'shared',
    'index.html',
    'vite.config.ts',
    'tailwind.config.ts',
    'package.json',
    'public',
  ];
  const newestSource = Math.max(...sources.map((s) => newestMtime(path.resolve(s))));
  if (!force && fs.existsSync(built) && fs.statSync(built).mtimeMs >= newestSource) return false;
  log('Building the client (vite build)...');
  execFileSync(
    process.execPath,
    [path.resolve('node_modules/vite/bin/vite.js'), 'build', '--logLevel', 'warn'],
    {
      stdio: 'inherit',
    },
  );
  return true;
}
