// npm run bench:bundle: the gzipped JavaScript a browser loads for the sign-in screen and for each role's home,
// from the Vite build manifest (entry + the route's lazy module + everything they import, each counted once).
import fs from 'node:fs';
import path from 'node:path';
import zlib from 'node:zlib';
import { buildClientIfNeeded } from '../lib/build-client';

type Chunk = { file: string; imports?: string[]; css?: string[] };
const dist = path.resolve('dist');

export function routeBytes(routeModules: string[]) {
  const manifest: Record<string, Chunk> = JSON.parse(
    fs.readFileSync(path.join(dist, '.vite/manifest.json'), 'utf8'),
  );
  const seen = new Set<string>();
  const visit = (key: string) => {
    if (seen.has(key) || !manifest[key]) return;
    seen.add(key);
    for (const i of manifest[key].imports ?? []) visit(i);
  };
  visit('index.html');
  for (const m of routeModules) visit(m);
  let raw = 0;
  let gzip = 0;
  for (const key of seen) {
    const buf = fs.readFileSync(path.join(dist, manifest[key].file));
    raw += buf.length;
    gzip += zlib.gzipSync(buf, { level: 9 }).length;
  }
  return { chunks: seen.size, raw, gzip };
}

const ROUTES: [string, string[]][] = [
  ['sign-in', ['src/app/routes/sign-in.tsx']],
  ['home (any role, shell + home)', ['src/app/routes/app-root.tsx', 'src/app/routes/home.tsx']],
];

function main() {
  buildClientIfNeeded(console.log);
  const kb = (n: number) => `${(n / 1024).toFixed(1)} KB`;
  console.log('route'.padEnd(34), 'chunks', 'raw'.padStart(10), 'gzip'.padStart(10), '  aim');
  for (const [name, mods] of ROUTES) {
    const r = routeBytes(mods);
    const aim = name === 'sign-in' ? (r.gzip < 150 * 1024 ? 'under 150 KB: met' : 'over 150 KB') : '';
    console.log(
      name.padEnd(34),
      String(r.chunks).padStart(6),
      kb(r.raw).padStart(10),
      kb(r.gzip).padStart(10),
      ' ',
      aim,
    );
  }
}

main();
