// Installed units as life data for the Weibull fit and Kaplan-Meier: a unit named by a covered claim is a
// failure at its age on the failure date; every other unit is a suspension at its age on `asOf`. Units of the
// same age and status are one group with a count, so a million installed units stay a few hundred groups.
//
// Ages are whole calendar months completed (the engine's ageMonths), or operating hours (whole days in service x
// the installation's hours a day). A failure within its first month (or on its first day, in hours) is 0 old,
// which no Weibull fit accepts: `age: 'midpoint'` places every age, failures and suspensions alike, in the middle
// of the month (or day) it fell in, half a month (or half a day's hours) later.

import { z } from 'zod';

import { daysBetween, wholeMonthsBetween } from '../engine/dates';
import { AnalyticsInputError, check, finite } from './validation';
import type { LifeGroup } from './weibull';

const ISO_DATE = /^\d{4}-(0[1-9]|1[0-2])-(0[1-9]|[12]\d|3[01])$/;
const date = z
  .string({ error: 'Expected a date like 2024-03-31.' })
  .regex(ISO_DATE, 'Expected a date like 2024-03-31.');
const wholeCount = z
  .number({ error: 'Expected a whole number >= 0.' })
  .int('Expected a whole number >= 0.')
  .min(0, 'Expected a whole number >= 0.');

const installationsSchema = z.array(
  z.object({
    installedOn: date,
    quantity: wholeCount,
    hoursPerDay: finite('hours a day')
      .refine((h) => h >= 0 && h <= 24, 'Expected hours a day between 0 and 24.')
      .optional(),
    failures: z.array(z.object({ failedOn: date, units: wholeCount.optional() })).optional(),
  }),
);

const optionsSchema = z.object({
  asOf: date,
  unit: z.enum(['months', 'hours']),
  age: z.enum(['completed', 'midpoint']).optional(),
});

export interface UnitFailure {
  /** YYYY-MM-DD. */
  failedOn: string;
  /** Units of the installation this claim names; 1 by default. */
  units?: number;
}

/** One installation: a quantity of one product model installed on one day. */
export interface InstalledUnits {
  /** YYYY-MM-DD. */
  installedOn: string;
  quantity: number;
  /** Needed when ages are in hours. */
  hoursPerDay?: number;
  /** Covered claims only: the caller leaves out denied or excluded claims. */
  failures?: readonly UnitFailure[];
}

export type AgeUnit = 'months' | 'hours';

export interface LifeDataOptions {
  /** The day the analysis looks from, YYYY-MM-DD: survivors are aged to it. */
  asOf: string;
  unit: AgeUnit;
  /** 'completed' (the default): whole months or days completed; 'midpoint': half a month or day more. */
  age?: 'completed' | 'midpoint';
}

export interface InstalledLifeData {
  unit: AgeUnit;
  /** Sorted by time; each group is one age with how many units share it. */
  failures: LifeGroup[];
  suspensions: LifeGroup[];
  /** Units installed on or before asOf, and how many of them failed. */
  units: number;
  failed: number;
  /** Installations dated after asOf, left out. */
  notYetInstalled: number;
  /** Claimed units beyond an installation's quantity, left out (the data need a look). */
  excessFailures: number;
}

const wholeAtLeast0 = (v: unknown) => typeof v === 'number' && Number.isInteger(v) && v >= 0;
const dateLike = (v: unknown) => typeof v === 'string' && ISO_DATE.test(v);

/** A fast scan for the plain good case (a subset of what installationsSchema accepts); zod decides the rest. */
function plainInstallations(list: unknown): boolean {
  if (!Array.isArray(list)) return false;
  for (const inst of list as unknown[]) {
    if (typeof inst !== 'object' || inst === null) return false;
    const i = inst as Record<string, unknown>;
    if (!dateLike(i.installedOn) || !wholeAtLeast0(i.quantity)) return false;
    const h = i.hoursPerDay;
    if (h !== undefined && !(typeof h === 'number' && Number.isFinite(h) && h >= 0 && h <= 24)) return false;
    if (i.failures !== undefined) {
      if (!Array.isArray(i.failures)) return false;
      for (const f of i.failures as unknown[]) {
        if (typeof f !== 'object' || f === null) return false;
        const u = (f as Record<string, unknown>).units;
        if (!dateLike((f as Record<string, unknown>).failedOn) || (u !== undefined && !wholeAtLeast0(u)))
          return false;
      }
    }
  }
  return true;
}

function sortedGroups(counts: Map<number, number>): LifeGroup[] {
  return [...counts.entries()].map(([time, count]) => ({ time, count })).sort((a, b) => a.time - b.time);
}

function addTo(counts: Map<number, number>, time: number, count: number): void {
  if (count > 0) counts.set(time, (counts.get(time) ?? 0) + count);
}

/**
 * A failure dated after asOf had not happened yet as of that day: the unit counts as a suspension at asOf.
 * One dated before its installation (a typing error) is aged 0.
 */
export function installedLifeData(
  installations: readonly InstalledUnits[],
  options: LifeDataOptions,
): InstalledLifeData {
  if (!plainInstallations(installations)) {
    check('installedLifeData', installationsSchema, installations, 'installations');
  }
  check('installedLifeData', optionsSchema, options, 'options');
  const { asOf, unit } = options;
  if (unit === 'hours') {
    const missing = installations.flatMap((inst, i) =>
      inst.hoursPerDay === undefined
        ? [{ path: `installations.${i}.hoursPerDay`, message: 'Ages in hours need hours a day (0 to 24).' }]
        : [],
    );
    if (missing.length > 0) throw new AnalyticsInputError('installedLifeData', missing);
  }
  const midpoint = options.age === 'midpoint' ? 0.5 : 0;
  const failures = new Map<number, number>();
  const suspensions = new Map<number, number>();
  let units = 0;
  let failed = 0;
  let notYetInstalled = 0;
  let excessFailures = 0;

  for (const installation of installations) {
    const { installedOn, quantity, hoursPerDay } = installation;
    if (daysBetween(installedOn, asOf) < 0) {
      notYetInstalled += quantity;
      continue;
    }
    const ageOn = (day: string) => {
      if (unit === 'months') return wholeMonthsBetween(installedOn, day) + midpoint;
      const days = daysBetween(installedOn, day);
      return ((days < 0 ? 0 : days) + midpoint) * (hoursPerDay as number);
    };
    let working = quantity;
    for (const failure of installation.failures ?? []) {
      const claimed = failure.units ?? 1;
      if (daysBetween(failure.failedOn, asOf) < 0) continue;
      const counted = Math.min(claimed, working);
      excessFailures += claimed - counted;
      working -= counted;
      failed += counted;
      addTo(failures, ageOn(failure.failedOn), counted);
    }
    addTo(suspensions, ageOn(asOf), working);
    units += quantity;
  }
  return {
    unit,
    failures: sortedGroups(failures),
    suspensions: sortedGroups(suspensions),
    units,
    failed,
    notYetInstalled,
    excessFailures,
  };
}
