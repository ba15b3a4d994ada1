// npm run bench: every benchmark in order, each in its own process, then one table of the figures. Each part
// also prints its own lines as it goes. Never part of npm test; asserts nothing; loopback only, bounded in time.
//   generate-claims.ts  the bench database (profile "bench", DB_PORT + 4): 100,000 claims (BENCH_CLAIMS)
//   api.bench.ts        the list through the API beside raw mysql2; 16-connection load on the list and a page
//   queue.bench.ts      the reviewer's queue (filters, sort, search) through the API beside raw mysql2
//   engine.bench.ts     evaluations per second beside schema validation alone
//   pdf.bench.ts        letters and memos per second beside a bare pdfkit page
//   import.bench.ts     CSV import rows per second beside raw INSERTs (a database of its own, DB_PORT + 5)
//   bundle.ts           the client's gzipped JavaScript for sign-in and the homes
//   seed.bench.ts       npm start's demo seed, with the claims' photos beside without (on the test database too)
// BENCH_ONLY=api,pdf runs some parts only.
import { spawn } from 'node:child_process';
import path from 'node:path';
import { loadConfig } from '../../server/config/env';
import { dbServersOf, stopLeftovers, stopStaleProfiles } from '../lib/db-processes';

type Row = {
  part: string;
  figure: string;
  value: number;
  unit: string;
  baseline?: number;
  ratio?: number;
  aim?: string;
};

const PARTS: { name: string; file: string; parse?: (out: string) => Row[] }[] = [
  { name: 'generate', file: 'generate-claims.ts' },
  { name: 'api', file: 'api.bench.ts' },
  { name: 'queue', file: 'queue.bench.ts' },
  { name: 'engine', file: 'engine.bench.ts', parse: parseEngine },
  { name: 'pdf', file: 'pdf.bench.ts' },
  { name: 'import', file: 'import.bench.ts', parse: parseImport },
  { name: 'bundle', file: 'bundle.ts', parse: parseBundle },
  { name: 'seed', file: 'seed.bench.ts' },
];

const num = (s: string) => Number(s.replace(/,/g, ''));

function parseEngine(out: string): Row[] {
  const rates = new Map<string, number>();
  for (const m of out.matchAll(/^(.+?)\s+([\d,]+) \/s\s+[\d.]+ µs each$/gm))
    rates.set(m[1].trim(), num(m[2]));
  const base = rates.get('schema validation (safeParse)');
  return [...rates].map(([figure, value]) => ({
    part: 'engine',
    figure,
    value,
    unit: '/s',
    ...(base && !figure.startsWith('schema validation') ? { baseline: base, ratio: value / base } : {}),
  }));
}

function parseImport(out: string): Row[] {
  const get = (label: RegExp) => {
    const m = out.match(new RegExp(`^${label.source}.*?([\\d,]+) rows/s$`, 'm'));
    return m ? num(m[1]) : undefined;
  };
  const imp = get(/import \(validate \+ write \+ audit\):/);
  const preview = get(/preview \(dry run, nothing written\):/);
  const raw = get(/baseline raw multi-row INSERT:/);
  const rows: Row[] = [];
  if (preview !== undefined)
    rows.push({
      part: 'import',
      figure: 'CSV preview (dry run)',
      value: preview,
      unit: 'rows/s',
      ...(raw ? { baseline: raw, ratio: preview / raw } : {}),
    });
  if (imp !== undefined)
    rows.push({
      part: 'import',
      figure: 'CSV import (validate, write, audit)',
      value: imp,
      unit: 'rows/s',
      ...(raw ? { baseline: raw, ratio: imp / raw } : {}),
    });
  if (raw !== undefined)
    rows.push({ part: 'import', figure: 'raw multi-row INSERT (baseline)', value: raw, unit: 'rows/s' });
  return rows;
}

function parseBundle(out: string): Row[] {
  const rows: Row[] = [];
  for (const m of out.matchAll(/^(\S.*?)\s{2,}(\d+)\s+([\d.]+) KB\s+([\d.]+) KB/gm)) {
    rows.push({
      part: 'bundle',
      figure: `${m[1].trim()}, gzipped JS (${m[2]} chunks)`,
      value: Number(m[4]),
      unit: 'KB',
      aim: m[1].startsWith('sign-in') ? 'under 150 KB' : undefined,
    });
  }
  return rows;
}

function run(file: string): Promise<{ code: number; out: string }> {
  return new Promise((resolve) => {
    const child = spawn(process.execPath, ['--import', 'tsx', path.resolve('scripts/bench', file)], {
      stdio: ['ignore', 'pipe', 'inherit'],
      env: process.env,
    });
    let out = '';
    child.stdout.on('data', (d: Buffer) => {
      out += d.toString();
      for (const line of d.toString().split('\n'))
        if (line && !line.startsWith('BENCH ')) process.stdout.write(`  ${line}\n`);
    });
    child.on('exit', (code) => resolve({ code: code ?? 1, out }));
  });
}

const fmt = (v: number) =>
  Math.abs(v) >= 100 ? Math.round(v).toLocaleString('en-US') : v.toFixed(v >= 10 ? 1 : 2);

let interrupted = false;
// Ctrl-C reaches the running part too (same process group); the parts left are skipped and the servers stopped.
for (const signal of ['SIGINT', 'SIGTERM'] as const)
  process.on(signal, () => {
    interrupted = true;
  });

async function main() {
  const only = process.env.BENCH_ONLY?.split(',');
  const rows: Row[] = [];
  const { dataDir } = loadConfig();
  // Servers of the benches' own profiles left by a killed run would be reused, and then never stopped.
  await stopStaleProfiles(dataDir, ['bench', 'bench-import']);
  const before = dbServersOf(dataDir);
  try {
    await runParts(only, rows);
  } finally {
    const left = await stopLeftovers(dataDir, before);
    if (left.length) {
      console.error(
        `FAILED: the benchmarks left ${left.length} MariaDB server(s) of ${dataDir} running (now stopped): ` +
          left.map((p) => `${p.profile} (pid ${p.pid})`).join(', '),
      );
      process.exitCode = 1;
    }
  }
  if (interrupted) process.exit(130);
  printTable(rows);
}

async function runParts(only: string[] | undefined, rows: Row[]) {
  for (const part of PARTS) {
    if (interrupted) break;
    if (only && !only.includes(part.name)) continue;
    console.log(`\n== ${part.name} (scripts/bench/${part.file})`);
    const t0 = performance.now();
    const { code, out } = await run(part.file);
    console.log(
      `   ${code === 0 ? 'done' : `FAILED (exit ${code})`} in ${((performance.now() - t0) / 1000).toFixed(1)} s`,
    );
    const found = out
      .split('\n')
      .filter((l) => l.startsWith('BENCH '))
      .map((l) => JSON.parse(l.slice(6)) as Row);
    rows.push(...found, ...(part.parse ? part.parse(out) : []));
    if (code !== 0) rows.push({ part: part.name, figure: 'FAILED', value: NaN, unit: '' });
  }
}

function printTable(rows: Row[]) {
  const head = ['part', 'figure', 'value', 'baseline', 'ratio', 'aim'];
  const table = rows.map((r) => [
    r.part,
    r.figure,
    `${fmt(r.value)} ${r.unit}`,
    r.baseline !== undefined ? `${fmt(r.baseline)} ${r.unit}` : '',
    r.ratio !== undefined ? `${r.ratio.toFixed(2)}x` : '',
    r.aim ?? '',
  ]);
  const widths = head.map((h, i) => Math.max(h.length, ...table.map((row) => row[i].length)));
  const line = (cells: string[]) => `| ${cells.map((c, i) => c.padEnd(widths[i])).join(' | ')} |`;
  console.log(`\n${line(head)}\n|${widths.map((w) => '-'.repeat(w + 2)).join('|')}|`);
  for (const r of table) console.log(line(r));
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
