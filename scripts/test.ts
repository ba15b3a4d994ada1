// npm test: lint, formatting (Prettier), typecheck, unit and component tests, API tests against the real test database, then the
// browser tests in Debian's Chromium on the freshly built client. Stops at the first failing step and exits
// non-zero; prints one closing line "Tests: N passed, N failed".
import { execFileSync, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { buildClientIfNeeded } from './lib/build-client';
import { ensureMariadbInstalled } from './lib/mariadb';

const bin = (name: string) => path.resolve('node_modules/.bin', name);
const results = { passed: 0, failed: 0, skipped: 0 };
const reportDir = path.resolve('.data/test-reports');
fs.mkdirSync(reportDir, { recursive: true });

function step(title: string, cmd: string, args: string[], env: NodeJS.ProcessEnv = {}) {
  console.log(`\n=== ${title} ===`);
  const started = Date.now();
  const r = spawnSync(cmd, args, { stdio: 'inherit', env: { ...process.env, ...env } });
  console.log(
    `--- ${title}: ${r.status === 0 ? 'ok' : 'FAILED'} in ${((Date.now() - started) / 1000).toFixed(1)} s`,
  );
  return r.status === 0;
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

function finish(ok: boolean): never {
  console.log(
    `\nTests: ${results.passed} passed, ${results.failed} failed${results.skipped ? `, ${results.skipped} skipped` : ''}`,
  );
  process.exit(ok ? 0 : 1);
}

try {
  ensureMariadbInstalled();
  ensureChromium();
} catch (err) {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
}

const vitestJson = path.join(reportDir, 'vitest.json');
const playwrightJson = path.join(reportDir, 'playwright.json');
fs.rmSync(vitestJson, { force: true });
fs.rmSync(playwrightJson, { force: true });

if (!step('lint', bin('eslint'), ['.', '--max-warnings=0'])) finish(false);
if (!step('format', bin('prettier'), ['--check', '--log-level=warn', '.'])) finish(false);
if (!step('typecheck', bin('tsc'), ['--noEmit', '-p', 'tsconfig.json'])) finish(false);
const unitOk = step('unit, component and API tests (vitest)', bin('vitest'), [
  'run',
  '--reporter=default',
  '--reporter=json',
  `--outputFile.json=${vitestJson}`,
]);
countVitest(vitestJson);
if (!unitOk) finish(false);

console.log('\n=== build the client ===');
buildClientIfNeeded(console.log, true);
const browserOk = step(
  'browser tests (Playwright in Debian Chromium)',
  bin('playwright'),
  ['test', '--reporter=list,json'],
  {
    PLAYWRIGHT_JSON_OUTPUT_NAME: playwrightJson,
  },
);
countPlaywright(playwrightJson);
finish(browserOk);
