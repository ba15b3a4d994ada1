// A claim's failure mode, from its symptoms, the site observations and the engine's findings: the first rule that matches wins, so
// the physical evidence (insects, water, a stopped fan) outranks what the user saw (dark, flickering).
// Rules are data so the server can build the same classification as one SQL CASE.

import { z } from 'zod';

import type { FindingCode } from '../engine/codes';
import { check } from './validation';
import type { ObservationKey, Symptom } from '../schemas/claims';

export interface FailureModeRule {
  mode: string;
  label: string;
  findings: readonly FindingCode[];
  symptoms: readonly Symptom[];
  /** What the installer saw on site (the engine's evidence findings come from these). */
  observations?: readonly ObservationKey[];
}

export const FAILURE_MODE_RULES: readonly FailureModeRule[] = [
  {
    mode: 'insects_debris',
    label: 'Insects or debris inside',
    findings: ['evidence.debris_ingress'],
    symptoms: [],
    observations: ['debrisIngress'],
  },
  {
    mode: 'water',
    label: 'Water inside',
    findings: ['evidence.water_ingress'],
    symptoms: [],
    observations: ['waterIngress'],
  },
  {
    mode: 'fan',
    label: 'Cooling fan',
    findings: ['evidence.fan_stopped'],
    symptoms: ['fan_noise'],
    observations: ['fanStopped'],
  },
  {
    mode: 'damage',
    label: 'Physical damage',
    findings: ['evidence.physical_damage'],
    symptoms: [],
    observations: ['physicalDamage'],
  },
  {
    mode: 'led_strings',
    label: 'LEDs or strings dark',
    findings: ['electrical.string_open', 'electrical.string_shorted_leds'],
    symptoms: ['partly_dark'],
  },
  {
    mode: 'driver',
    label: 'Driver (dark, cycling, flicker)',
    findings: ['electrical.driver_at_voltage_limit'],
    symptoms: ['dark', 'cycling', 'flicker'],
  },
  {
    mode: 'light_output',
    label: 'Light output or colour',
    findings: ['life.output_below_projection'],
    symptoms: ['dim', 'color_shift'],
  },
];

export const OTHER_FAILURE_MODE = { mode: 'other', label: 'Other' } as const;

export const FAILURE_MODE_LABELS: Record<string, string> = Object.fromEntries([
  ...FAILURE_MODE_RULES.map((r) => [r.mode, r.label]),
  [OTHER_FAILURE_MODE.mode, OTHER_FAILURE_MODE.label],
]);

const failureModeArgs = z.tuple([
  z.array(z.string(), { error: 'Expected a list of symptoms.' }),
  z.array(z.string(), { error: 'Expected a list of finding codes.' }),
  z.record(z.string(), z.boolean().optional(), { error: 'Expected the observations as true or false.' }),
]);

export function failureModeOf(
  symptoms: readonly string[],
  findingCodes: readonly string[],
  observations: Partial<Record<ObservationKey, boolean>> = {},
): string {
  check(
    'failureModeOf',
    failureModeArgs,
    [symptoms, findingCodes, observations],
    ['symptoms', 'findingCodes', 'observations'],
  );
  for (const rule of FAILURE_MODE_RULES) {
    if (
      rule.findings.some((f) => findingCodes.includes(f)) ||
      (rule.observations ?? []).some((o) => observations[o] === true) ||
      rule.symptoms.some((s) => symptoms.includes(s))
    ) {
      return rule.mode;
    }
  }
  return OTHER_FAILURE_MODE.mode;
}
