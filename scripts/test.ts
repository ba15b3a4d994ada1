// npm test: lint, formatting (Prettier), typecheck, unit and component tests, API tests against the real test database, then the
// browser tests in Debian's Chromium on the freshly built client. Stops at the first failing step and exits
// non-zero; prints one closing line "Tests: N passed, N failed". Every database server the run starts is
// stopped when it ends, passed, failed or interrupted; one still running at the end fails the run.
import { type ChildProcess, execFileSync, spawn } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { loadConfig } from '../server/config/env';
import { buildClientIfNeeded } from './lib/build-client';
import { type DbServerProcess, dbServersOf, stopLeftovers, stopStaleProfiles } from './lib/db-processes';
import { ensureMariadbInstalled } from './lib/mariadb';

const bin = (name: string) => path.resolve('node_modules/.bin', name);
const results = { passed: 0, failed: 0, skipped: 0 };
const reportDir = path.resolve('.data/test-reports');
fs.mkdirSync(reportDir, { recursive: true });

const { dataDir } = loadConfig();
// The profiles whose servers this run starts: the API tests' (and the migration check's), the browser tests',
// the restore test's, the replication tests' primary and replica.
const PROFILES = ['test', 'e2e', 'restore', 'repl-test', 'repl-test-replica'] as const;
let before: DbServerProcess[] = [];
let current: ChildProcess | null = null;
let interrupted = false;

async function step(title: string, cmd: string, args: string[], env: NodeJS.ProcessEnv = {}) {
  if (interrupted) return false;
  console.log(`\n=== ${title} ===`);
  const started = Date.now();
  const child = spawn(cmd, args, { stdio: 'inherit', env: { ...process.env, ...env } });
  current = child;
  const status = await new Promise<number | null>((resolve) => {
    child.on('error', () => resolve(null));
    child.on('exit', (code) => resolve(code));
  });
  current = null;
  console.log(
    `--- ${title}: ${status === 0 ? 'ok' : 'FAILED'} in ${((Date.now() - started) / 1000).toFixed(1)} s`,
  );
  return status === 0 && !interrupted;
}

function ensureChromium() {
  if (fs.existsSync('/usr/bin/chromium')) return;
  if (process.getuid?.() !== 0) {
    throw new Error(
      'Chromium is missing. Install it with:\n  sudo apt-get install -y chromium\nthen run npm test again.',
    );
  }
  console.log("Chromium not found; installing Debian's package with apt-get...");
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  try {
    execFileSync('apt-get', ['install', '-y', '-q', 'chromium'], { stdio: 'inherit', env });
  } catch {
    execFileSync('apt-get', ['update', '-q'], { stdio: 'inherit', env });
    execFileSync('apt-get', ['install', '-y', '-q', 'chromium'], { stdio: 'inherit', env });
  }
}

function countVitest(file: string) {
  if (!fs.existsSync(file)) return;
  const j = JSON.parse(fs.readFileSync(file, 'utf8'));
  results.passed += j.numPassedTests ?? 0;
  results.failed += j.numFailedTests ?? 0;
  results.skipped += (j.numPendingTests ?? 0) + (j.numTodoTests ?? 0);
}

function countPlaywright(file: string) {
  if (!fs.existsSync(file)) return;
  const s = JSON.parse(fs.readFileSync(file, 'utf8')).stats ?? {};
  results.passed += (s.expected ?? 0) + (s.flaky ?? 0);
  results.failed += s.unexpected ?? 0;
  results.skipped += s.skipped ?? 0;
}

let finishing: Promise<never> | null = null;
function finish(ok: boolean): Promise<never> {
  finishing ??= end(ok);
  return finishing;
}

async function end(ok: boolean): Promise<never> {
  const left = await stopLeftovers(dataDir, before);
  if (left.length) {
    ok = false;
    results.failed += 1;
    console.error(
      `\nFAILED: the run left ${left.length} MariaDB server(s) of ${dataDir} running (now stopped): ` +
        left.map((p) => `${p.profile} (pid ${p.pid})`).join(', '),
    );
  }
  console.log(
    `\nTests: ${results.passed} passed, ${results.failed} failed${results.skipped ? `, ${results.skipped} skipped` : ''}`,
  );
  process.exit(ok ? 0 : 1);
}

// Ctrl-C reaches the running step too (same process group); SIGTERM is passed on. Either way the step is let
// end, its servers are stopped, and the run fails.
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.on(signal, () => {
    if (interrupted) return;
    interrupted = true;
    console.error(`\n${signal}: stopping the tests`);
    if (signal === 'SIGTERM') current?.kill('SIGTERM');
    if (!current) void finish(false);
  });
}

try {
  ensureMariadbInstalled();
  ensureChromium();
} catch (err) {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
}

// A server left by an earlier killed run would be reused, and then never stopped by this one.
await stopStaleProfiles(dataDir, [...PROFILES]);
before = dbServersOf(dataDir);

const vitestJson = path.join(reportDir, 'vitest.json');
const playwrightJson = path.join(reportDir, 'playwright.json');
fs.rmSync(vitestJson, { force: true });
fs.rmSync(playwrightJson, { force: true });

if (!(await step('lint', bin('eslint'), ['.', '--max-warnings=0']))) await finish(false);
if (!(await step('format', bin('prettier'), ['--check', '--log-level=warn', '.']))) await finish(false);
if (!(await step('typecheck', bin('tsc'), ['--noEmit', '-p', 'tsconfig.json']))) await finish(false);
const unitOk = await step('unit, component and API tests (vitest)', bin('vitest'), [
  'run',
  '--reporter=default',
  '--reporter=json',
  `--outputFile.json=${vitestJson}`,
]);
countVitest(vitestJson);
if (!unitOk) await finish(false);

console.log('\n=== build the client ===');
buildClientIfNeeded(console.log, true);
const browserOk = await step(
  'browser tests (Playwright in Debian Chromium)',
  bin('playwright'),
  ['test', '--reporter=list,json'],
  {
    PLAYWRIGHT_JSON_OUTPUT_NAME: playwrightJson,
  },
);
countPlaywright(playwrightJson);
await finish(browserOk);
