import fs from 'node:fs';
import path from 'node:path';
import { type DbProfile, profileDir } from './mariadb';

// The MariaDB servers that this checkout's scripts started, found from the processes themselves rather than from
// pid files: a run killed at the wrong moment leaves a server whose pid file is gone or stale, and such a server
// is exactly what must be found. Linux only (reads /proc), like the rest of the scripts.

export type DbServerProcess = { pid: number; datadir: string; profile: string };

function cmdlineOf(pid: number): string[] | null {
  try {
    return fs.readFileSync(`/proc/${pid}/cmdline`, 'utf8').split('\0').filter(Boolean);
  } catch {
    return null;
  }
}

/** Every running mariadbd whose data directory lies inside `dataDir` (each profile's is DATA_DIR/PROFILE/mariadb). */
export function dbServersOf(dataDir: string): DbServerProcess[] {
  const root = path.resolve(dataDir) + path.sep;
  const found: DbServerProcess[] = [];
  for (const entry of fs.readdirSync('/proc')) {
    if (!/^\d+$/.test(entry)) continue;
    const pid = Number(entry);
    const argv = cmdlineOf(pid);
    if (!argv?.length || !/(mariadbd|mysqld)$/.test(path.basename(argv[0]))) continue;
    const flag = argv.find((a) => a.startsWith('--datadir='));
    if (!flag) continue;
    const datadir = path.resolve(flag.slice('--datadir='.length));
    if (!datadir.startsWith(root)) continue;
    found.push({ pid, datadir, profile: path.relative(root, datadir).split(path.sep)[0] });
  }
  return found;
}

const pidFileOf = (dataDir: string, profile: string) =>
  path.join(path.resolve(profileDir(dataDir, profile as DbProfile)), 'mariadbd.pid');

function alive(pid: number) {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

/** Stops a server by its pid (SIGTERM, then SIGKILL after 30 s), whether or not its pid file still names it. */
export async function stopDbProcess(pid: number) {
  if (!alive(pid)) return;
  process.kill(pid, 'SIGTERM');
  const started = Date.now();
  while (alive(pid) && Date.now() - started < 30_000) await new Promise((r) => setTimeout(r, 100));
  if (alive(pid)) process.kill(pid, 'SIGKILL');
}

/**
 * Stops what an earlier, killed run of these profiles left running, so that this run starts its own servers
 * (a reused server would be left running at the end, as it was not started here).
 */
export async function stopStaleProfiles(dataDir: string, profiles: DbProfile[]) {
  const stale = dbServersOf(dataDir).filter((p) => (profiles as string[]).includes(p.profile));
  for (const p of stale) {
    console.log(`Stopping a MariaDB server still running (${p.profile}, pid ${p.pid})`);
    await stopDbProcess(p.pid);
  }
  // A pid file that outlived its server could name some other process by now: remove it, never signal it.
  for (const profile of profiles) fs.rmSync(pidFileOf(dataDir, profile), { force: true });
  return stale;
}

/**
 * The servers of `dataDir` running now that were not running at `before`: what a run left behind. They are
 * stopped, and returned so that the caller can fail the run.
 */
export async function stopLeftovers(dataDir: string, before: DbServerProcess[]) {
  const known = new Set(before.map((p) => p.pid));
  const left = dbServersOf(dataDir).filter((p) => !known.has(p.pid));
  for (const p of left) await stopDbProcess(p.pid);
  for (const p of left) fs.rmSync(pidFileOf(dataDir, p.profile), { force: true });
  return left;
}

/** Where the browser tests' server (scripts/e2e-server.ts) writes its pid while it runs. */
export const e2eServerPidFile = (dataDir: string) => path.join(path.resolve(dataDir), 'e2e', 'server.pid');

/** Ends the browser tests' server with SIGTERM and waits for it to stop what it started (at most `ms`). */
export async function endE2eServer(dataDir: string, ms = 20_000) {
  const file = e2eServerPidFile(dataDir);
  const pid = fs.existsSync(file) ? Number(fs.readFileSync(file, 'utf8').trim()) : 0;
  if (!pid || !alive(pid) || !cmdlineOf(pid)?.some((a) => a.includes('e2e-server'))) return;
  process.kill(pid, 'SIGTERM');
  const started = Date.now();
  while (alive(pid) && Date.now() - started < ms) await new Promise((r) => setTimeout(r, 100));
}
