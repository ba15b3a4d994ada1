// npm run bench:analytics
// Fits a Weibull to an installed base of 1,000,000 units (invented demo data) and prints each step's time beside
// a baseline measured in the same run on the same data: one pass summing count x ln t over the groups. The
// ratio is what to compare between machines; the milliseconds depend on the machine. Prints; asserts nothing.
import { installedLifeData, type InstalledUnits } from '../../shared/analytics/life-data';
import { fitWeibull, type LifeData, type LifeGroup } from '../../shared/analytics/weibull';

const UNITS = 1_000_000;
const INSTALLATIONS = 10_000;
const RUNS = Number(process.env.BENCH_RUNS ?? 15);

// A small deterministic PRNG (mulberry32) so every run times the same data.
function prng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const rand = prng(20240601);
const pad = (n: number) => String(n).padStart(2, '0');
// Only the benchmark's set-up uses Date; the analytics never do.
const dayAfter = (startMs: number, days: number) => {
  const d = new Date(startMs + days * 86_400_000);
  return `${d.getUTCFullYear()}-${pad(d.getUTCMonth() + 1)}-${pad(d.getUTCDate())}`;
};

// Installed over five years before asOf; true life Weibull(shape 1.6, scale 180 months); 12 h a day.
const AS_OF = '2025-06-30';
const START = Date.UTC(2020, 6, 1);
const SPAN_DAYS = 1825;
const installations: InstalledUnits[] = [];
for (let i = 0; i < INSTALLATIONS; i++) {
  const installedDay = Math.floor(rand() * SPAN_DAYS);
  const quantity = UNITS / INSTALLATIONS;
  const failures = [];
  for (let u = 0; u < quantity; u++) {
    const lifeDays = 180 * 30.44 * Math.pow(-Math.log(1 - rand()), 1 / 1.6);
    const failedDay = installedDay + Math.floor(lifeDays);
    if (failedDay < SPAN_DAYS) failures.push({ failedOn: dayAfter(START, failedDay) });
  }
  installations.push({ installedOn: dayAfter(START, installedDay), quantity, hoursPerDay: 12, failures });
}

let sink = 0;
function median(label: string, op: () => number): number {
  for (let i = 0; i < 3; i++) sink += op(); // warm up the JIT
  const times: number[] = [];
  for (let i = 0; i < RUNS; i++) {
    const start = process.hrtime.bigint();
    sink += op();
    times.push(Number(process.hrtime.bigint() - start) / 1e6);
  }
  times.sort((a, b) => a - b);
  const ms = times[Math.floor(times.length / 2)];
  console.log(`${label.padEnd(52)} ${ms.toFixed(3).padStart(10)} ms`);
  return ms;
}

function sumLogs(data: LifeData): number {
  let sum = 0;
  for (const list of [data.failures, data.suspensions ?? []]) {
    for (const entry of list as readonly LifeGroup[]) sum += entry.count * Math.log(entry.time);
  }
  return sum;
}

function groups(data: LifeData): number {
  return data.failures.length + (data.suspensions?.length ?? 0);
}

function report(name: string, data: LifeData) {
  const fit = fitWeibull(data);
  if (!fit.ok) throw new Error(fit.message);
  console.log(
    `\n${name}: ${groups(data).toLocaleString('en-US')} groups, ${fit.fit.failures.toLocaleString('en-US')} failures; MLE shape ${fit.fit.shape.toFixed(4)}, scale ${fit.fit.scale.toFixed(1)}`,
  );
  const baseline = median('baseline: one pass summing count x ln t', () => sumLogs(data));
  const mle = median('fitWeibull, maximum likelihood', () => (fitWeibull(data).ok ? 1 : 0));
  const mrr = median('fitWeibull, median-rank regression', () =>
    fitWeibull(data, { method: 'mrr' }).ok ? 1 : 0,
  );
  console.log(`MLE ${(mle / baseline).toFixed(1)}x the baseline; MRR ${(mrr / baseline).toFixed(1)}x`);
}

console.log(
  `analytics benchmark: ${UNITS.toLocaleString('en-US')} units in ${INSTALLATIONS.toLocaleString('en-US')} installations, median of ${RUNS} runs, one core`,
);
median(
  'installedLifeData (months), 1,000,000 units',
  () => installedLifeData(installations, { asOf: AS_OF, unit: 'months' }).units,
);
const months = installedLifeData(installations, { asOf: AS_OF, unit: 'months', age: 'midpoint' });
const hours = installedLifeData(installations, { asOf: AS_OF, unit: 'hours', age: 'midpoint' });
report('ages in months (midpoint)', months);
report('ages in operating hours (midpoint)', hours);

// The same million units with no grouping at all: one entry of count 1 per unit.
const expand = (list: readonly LifeGroup[]) =>
  list.flatMap((g) => Array.from({ length: g.count }, () => ({ time: g.time, count: 1 })));
const asGroups: LifeData = { failures: expand(months.failures), suspensions: expand(months.suspensions) };
report('1,000,000 ungrouped times (count 1 each)', asGroups);
if (sink === -1) console.log(sink);
