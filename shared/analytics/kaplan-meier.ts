// Kaplan-Meier product-limit survival for right-censored life data, with Greenwood's variance and a plain
// normal band on S itself: S +/- z SE, clipped to [0, 1]. (The log and log-log transformed bands give other,
// asymmetric limits; this plain form is the one the reliability library reports.)
//
// S(t) = prod over failure times t_i <= t of (1 - d_i / n_i), n_i the units at risk just before t_i;
// Var S(t) = S(t)^2 sum d_i / (n_i (n_i - d_i)). At a tie, failures come before censorings.

import { z } from 'zod';

import { check, checkLifeData, finite } from './validation';
import type { LifeData, LifeGroup } from './weibull';

/** Two-sided 95 % normal quantile. */
export const Z_95 = 1.959964;

export interface KaplanMeierRow {
  time: number;
  /** Units still at risk just before this time. */
  atRisk: number;
  failed: number;
  censored: number;
  survival: number;
  standardError: number;
  lower: number;
  upper: number;
}

export interface KaplanMeierOptions {
  /** The band's normal quantile; 1.959964 (95 %) by default. */
  z?: number;
}

function countsByTime(data: LifeData): Map<number, { failed: number; censored: number }> {
  const byTime = new Map<number, { failed: number; censored: number }>();
  const add = (entry: number | LifeGroup, failed: boolean) => {
    const { time, count } = typeof entry === 'number' ? { time: entry, count: 1 } : entry;
    if (count === 0) return;
    const row = byTime.get(time) ?? { failed: 0, censored: 0 };
    if (failed) row.failed += count;
    else row.censored += count;
    byTime.set(time, row);
  };
  for (const f of data.failures) add(f, true);
  for (const s of data.suspensions ?? []) add(s, false);
  return byTime;
}

function clip(value: number): number {
  return value < 0 ? 0 : value > 1 ? 1 : value;
}

/** One row per distinct time (failures or censorings), in time order. */
const kaplanMeierOptionsSchema = z.object({
  z: finite('a normal quantile')
    .refine((v) => v > 0, 'Expected a normal quantile above 0.')
    .optional(),
});

export function kaplanMeier(data: LifeData, options: KaplanMeierOptions = {}): KaplanMeierRow[] {
  checkLifeData('kaplanMeier', data, 'data');
  check('kaplanMeier', kaplanMeierOptionsSchema, options, 'options');
  const z = options.z ?? Z_95;
  const byTime = countsByTime(data);
  const times = Float64Array.from(byTime.keys()).sort();
  let atRisk = 0;
  for (const row of byTime.values()) atRisk += row.failed + row.censored;
  let survival = 1;
  let greenwood = 0;
  const rows: KaplanMeierRow[] = [];
  for (const time of times) {
    const { failed, censored } = byTime.get(time)!;
    if (failed > 0) {
      survival *= 1 - failed / atRisk;
      // Once every unit at risk has failed S is 0 and so is its variance; the sum's term would divide by 0.
      greenwood = failed < atRisk ? greenwood + failed / (atRisk * (atRisk - failed)) : 0;
    }
    const standardError = survival > 0 ? survival * Math.sqrt(greenwood) : 0;
    rows.push({
      time,
      atRisk,
      failed,
      censored,
      survival,
      standardError,
      lower: clip(survival - z * standardError),
      upper: clip(survival + z * standardError),
    });
    atRisk -= failed + censored;
  }
  return rows;
}

/** S(t) from the table: the survival of the last row at or before t (1 before the first). */
const survivalAtArgs = z.tuple([
  z.array(z.object({ time: finite('a time'), survival: finite('a survival') })),
  finite('a time'),
]);

export function survivalAt(rows: readonly KaplanMeierRow[], t: number): number {
  check('survivalAt', survivalAtArgs, [rows, t], ['rows', 't']);
  let low = 0;
  let high = rows.length;
  while (low < high) {
    const mid = (low + high) >> 1;
    if (rows[mid].time <= t) low = mid + 1;
    else high = mid;
  }
  return low === 0 ? 1 : rows[low - 1].survival;
}
