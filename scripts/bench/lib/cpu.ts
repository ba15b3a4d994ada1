import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';

// Where a load run's CPU goes on this machine: the API's processes, MariaDB and the load generator (this process),
// in milliseconds of CPU per request, from /proc (Linux only; elsewhere the figures are NaN). With two cores shared
// by all three, requests per second follow from these: a process that needs a whole core is the ceiling for one
// Node process, and the sum over two cores is the ceiling for the machine. The host's steal (time the virtual
// machine's cores were taken by others) is reported beside them, as it moves every figure.

let ticksPerSecond: number | undefined;
function hz() {
  if (ticksPerSecond === undefined) {
    try {
      ticksPerSecond = Number(execFileSync('getconf', ['CLK_TCK']).toString().trim()) || 100;
    } catch {
      ticksPerSecond = 100;
    }
  }
  return ticksPerSecond;
}

/** utime + stime of one process, in clock ticks (0 once it is gone). */
function ownTicks(pid: number) {
  try {
    const fields = fs.readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1].split(' ');
    return Number(fields[11]) + Number(fields[12]);
  } catch {
    return 0;
  }
}

/** A process and its descendants (a cluster's workers), by /proc's children lists. */
function tree(pid: number): number[] {
  const out = [pid];
  let tasks: string[] = [];
  try {
    tasks = fs.readdirSync(`/proc/${pid}/task`);
  } catch {
    return out;
  }
  for (const tid of tasks) {
    let children = '';
    try {
      children = fs.readFileSync(`/proc/${pid}/task/${tid}/children`, 'utf8');
    } catch {
      continue;
    }
    for (const c of children.split(/\s+/).filter(Boolean)) out.push(...tree(Number(c)));
  }
  return out;
}

const treeTicks = (pid: number) => tree(pid).reduce((sum, p) => sum + ownTicks(p), 0);

/** utime + stime of a process's threads other than its main one (V8's compiler and GC helpers, libuv's pool). */
function backgroundTicks(pid: number) {
  let sum = 0;
  let tasks: string[] = [];
  try {
    tasks = fs.readdirSync(`/proc/${pid}/task`);
  } catch {
    return 0;
  }
  for (const tid of tasks) {
    if (Number(tid) === pid) continue;
    try {
      const fields = fs.readFileSync(`/proc/${pid}/task/${tid}/stat`, 'utf8').split(') ')[1].split(' ');
      sum += Number(fields[11]) + Number(fields[12]);
    } catch {
      // the thread ended
    }
  }
  return sum;
}

const treeBackgroundTicks = (pid: number) => tree(pid).reduce((sum, p) => sum + backgroundTicks(p), 0);

/** The machine's steal ticks (all cores), the eighth value of /proc/stat's cpu line. */
function stealTicks() {
  try {
    return Number(fs.readFileSync('/proc/stat', 'utf8').split('\n')[0].trim().split(/\s+/)[8]) || 0;
  } catch {
    return NaN;
  }
}

export type CpuShare = {
  /** CPU per request, ms: the API's processes, MariaDB, the load generator. */
  server: number;
  /**
   * The part of `server` spent outside the processes' main threads. A few hundredths of a millisecond normally
   * (garbage collection's helpers); V8's optimiser once spun here at 1-2 ms per request (server/db/data-source.ts).
   */
  serverBackground: number;
  db: number;
  generator: number;
  /** Share of the machine's core time taken by the host (steal), percent. */
  steal: number;
};

/** Starts counting; the returned function ends the count for `requests` requests over `seconds`. */
export function cpuMeter(pids: { server: number; db: number }) {
  const msPerTick = 1000 / hz();
  const start = {
    server: treeTicks(pids.server),
    serverBackground: treeBackgroundTicks(pids.server),
    db: ownTicks(pids.db),
    self: process.cpuUsage(),
    steal: stealTicks(),
  };
  return (requests: number, seconds: number): CpuShare => {
    const self = process.cpuUsage(start.self);
    const per = (ticks: number) => (ticks * msPerTick) / requests;
    return {
      server: per(treeTicks(pids.server) - start.server),
      serverBackground: per(treeBackgroundTicks(pids.server) - start.serverBackground),
      db: per(ownTicks(pids.db) - start.db),
      generator: (self.user + self.system) / 1000 / requests,
      steal:
        (((stealTicks() - start.steal) * msPerTick) / (seconds * 1000 * os.availableParallelism())) * 100,
    };
  };
}
