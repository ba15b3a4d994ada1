import { spawn } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { build } from 'esbuild';
import { newestMtime } from './build-client';

// The server compiled ahead of time: esbuild bundles server/index.ts (the production entry) and server/worker.ts
// (a cluster's serving process) with the project's own code and `shared/` into dist-server/, each file whole,
// leaving every npm package to be imported from node_modules at run time. Plain `node dist-server/index.js` then
// serves with no TypeScript compiler in the process. Decorators are compiled as TypeScript's experimental ones
// (tsconfig.json), without design-type metadata: every entity column names its type. Paths to templates and fonts
// are found from the project's root (server/lib/paths.ts), wherever the code runs from.

export const SERVER_OUT_DIR = 'dist-server';
const SOURCES = ['server', 'shared', 'package.json', 'tsconfig.json'];

/** Bundles the server into dist-server/ (index.js and worker.js, with source maps). */
export async function buildServer() {
  await build({
    entryPoints: { index: 'server/index.ts', worker: 'server/worker.ts' },
    outdir: SERVER_OUT_DIR,
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    packages: 'external',
    sourcemap: true,
    tsconfig: 'tsconfig.json',
    logLevel: 'warning',
    banner: { js: '// Built by scripts/build-server.ts from server/ and shared/; do not edit.' },
  });
}

/** Builds the server when dist-server/ is missing or older than its sources; true when it built. */
export async function buildServerIfNeeded(log: (s: string) => void = console.log, force = false) {
  const built = path.resolve(SERVER_OUT_DIR, 'index.js');
  const newestSource = Math.max(...SOURCES.map((s) => newestMtime(path.resolve(s))));
  if (!force && fs.existsSync(built) && fs.statSync(built).mtimeMs >= newestSource) return false;
  log('Building the server (esbuild)...');
  await buildServer();
  return true;
}

/**
 * Serves with the compiled server under plain `node` (dist-server/index.js, WEB_CONCURRENCY processes), as a child
 * process; resolves when it listens. `stop` ends it with SIGTERM and waits for it.
 */
export async function startCompiledServer(opts: { databaseUrl: string; env: NodeJS.ProcessEnv }) {
  const child = spawn(process.execPath, [path.resolve(SERVER_OUT_DIR, 'index.js')], {
    env: { ...process.env, ...opts.env, DATABASE_URL: opts.databaseUrl },
    stdio: ['ignore', 'inherit', 'inherit', 'ipc'],
  });
  const exited = new Promise<number | null>((resolve) => child.once('exit', (code) => resolve(code)));
  const url = await new Promise<string>((resolve, reject) => {
    child.on('message', (m: { type?: string; url?: string }) => {
      if (m?.type === 'listening' && m.url) resolve(m.url);
    });
    void exited.then((code) => reject(new Error(`the server exited (${code}) before it listened`)));
  });
  return {
    url,
    async stop() {
      if (child.exitCode === null && child.signalCode === null) child.kill('SIGTERM');
      await exited;
    },
  };
}
