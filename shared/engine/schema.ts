import { z } from 'zod';
import { str } from '../schemas/text';

import { MONEY_PATTERN } from './money';

// The engine's input and output, one schema each: the claim form's resolver, the server's route and the
// command line all validate with evaluationInputSchema. Objects are strict: unknown keys are refused.
// Units: volts, amps, watts, degrees Celsius, hours, calendar dates as YYYY-MM-DD, money as decimal strings.

export const LOCATIONS = ['dry', 'damp', 'wet'] as const;
export const ENCLOSURES = ['open', 'enclosed', 'enclosed_ventilated'] as const;
export const DIMMERS = ['none', 'phase', '0-10v'] as const;
export const NOMINAL_SUPPLY_VOLTS = [120, 208, 240, 277, 347, 480] as const;
/**
 * For `z.literal(NOMINAL_SUPPLY_VOLTS)`: the OpenAPI generator writes a literal of several values as its first
 * value only, so the schema names them all (it changes nothing of what is accepted).
 */
export const NOMINAL_VOLTS_META = { enum: [...NOMINAL_SUPPLY_VOLTS] };
export const SYMPTOMS = [
  'dark',
  'partly_dark',
  'cycling',
  'flicker',
  'dim',
  'color_shift',
  'fan_noise',
  'other',
] as const;
export const CATEGORIES = ['coverage', 'application', 'electrical', 'evidence', 'life'] as const;
export const SEVERITIES = ['pass', 'info', 'warn', 'fail'] as const;
export const VERDICTS = ['covered', 'excluded', 'review'] as const;
export const EFFECTS = ['none', 'review', 'exclude'] as const;

const positive = (max: number) => z.number().positive().max(max);
const nonNegative = (max: number) => z.number().min(0).max(max);
const count = (min: number, max: number) => z.number().int().min(min).max(max);
const isoDate = z.iso.date({ error: 'expected a date as YYYY-MM-DD' });

// A money amount as a decimal string with at most two decimals, at most 1,000,000.00 (which keeps the
// credit's integer-cent arithmetic exact).
const money = str().superRefine((s, ctx) => {
  if (!MONEY_PATTERN.test(s)) ctx.addIssue({ code: 'custom', message: 'expected an amount like "96.00"' });
  else if (Number(s) > 1_000_000) ctx.addIssue({ code: 'custom', message: 'at most 1000000.00' });
});

const fluxPointSchema = z.strictObject({
  hours: nonNegative(1_000_000),
  /** Normalised flux: a fraction of initial output, 1 = initial. */
  flux: z.number().positive().max(2),
});

/**
 * One LM-80 data set at one case temperature: either the measured points (`points`, fitted here inside the
 * TM-21 window; `testHours` defaults to the last point) or a fit already made (`B` and `alpha` per hour,
 * with `testHours` required).
 */
export const lm80DatasetSchema = z
  .strictObject({
    caseTempC: z.number().min(-40).max(200),
    testHours: positive(1_000_000).optional(),
    points: z.array(fluxPointSchema).min(2).max(500).optional(),
    B: z.number().positive().max(2).optional(),
    alpha: z.number().min(-1).max(1).optional(),
  })
  .superRefine((d, ctx) => {
    const fitted = d.B !== undefined || d.alpha !== undefined;
    if (d.points !== undefined && fitted) {
      ctx.addIssue({
        code: 'custom',
        path: ['points'],
        message: 'give either points or B and alpha, not both',
      });
    } else if (d.points === undefined && !fitted) {
      ctx.addIssue({ code: 'custom', path: ['points'], message: 'give points, or B and alpha' });
    } else if (fitted) {
      if (d.B === undefined)
        ctx.addIssue({ code: 'custom', path: ['B'], message: 'B is required with alpha' });
      if (d.alpha === undefined)
        ctx.addIssue({ code: 'custom', path: ['alpha'], message: 'alpha is required with B' });
      if (d.testHours === undefined) {
        ctx.addIssue({
          code: 'custom',
          path: ['testHours'],
          message: 'testHours is required with B and alpha',
        });
      }
    }
  });

/**
 * Lumen maintenance data for TM-21: `sampleSize` units per case temperature, one or two data sets (two
 * different case temperatures allow Arrhenius interpolation), and optionally the LED's case temperature in
 * service (from the manufacturer's in-situ test). Without it the hottest data set is used.
 */
export const lumenMaintenanceSchema = z
  .strictObject({
    sampleSize: count(1, 100_000),
    inServiceCaseTempC: z.number().min(-40).max(200).optional(),
    datasets: z.array(lm80DatasetSchema).min(1).max(2),
  })
  .superRefine((lm, ctx) => {
    if (lm.datasets.length === 2 && lm.datasets[0].caseTempC === lm.datasets[1].caseTempC) {
      ctx.addIssue({
        code: 'custom',
        path: ['datasets', 1, 'caseTempC'],
        message: 'the two case temperatures must differ',
      });
    }
  });

export const productSchema = z
  .strictObject({
    ratedInputWatts: z.number().min(0.1).max(100_000),
    inputVoltage: z.strictObject({ min: positive(1000), max: positive(1000) }),
    ledStrings: count(1, 1000),
    ledsPerString: count(1, 1000),
    /** Nominal forward voltage of one LED at rated current. */
    ledForwardVolts: z.number().min(0.1).max(50),
    /** The driver's rated constant output current, all strings together. */
    driverOutputAmps: z.number().min(0.001).max(100),
    /** Open-circuit output voltage limit of the driver. */
    driverMaxOutputVolts: positive(2000).optional(),
    location: z.enum(LOCATIONS),
    /** Suitable for totally enclosed luminaires. */
    enclosedRated: z.boolean(),
    dimmable: z.boolean(),
    ambientMaxC: z.number().min(-60).max(150),
    ratedLifeHours: positive(10_000_000),
    lumenMaintenance: lumenMaintenanceSchema.optional(),
  })
  .superRefine((p, ctx) => {
    if (p.inputVoltage.min >= p.inputVoltage.max) {
      ctx.addIssue({
        code: 'custom',
        path: ['inputVoltage', 'max'],
        message: 'must be above inputVoltage.min',
      });
    }
  });

export const policySchema = z
  .strictObject({
    termMonths: count(1, 600),
    fullCoverageMonths: count(0, 600),
    filingWindowDays: count(0, 3650),
    /** Share of a unit's LEDs that must be dark for the failure to count, in per cent. */
    darkLedFailurePercent: z.number().positive().max(100),
    unitCredit: money,
    currency: str().regex(/^[A-Z]{3}$/, 'expected a three-letter currency code like "USD"'),
    requiredPhotos: count(0, 100),
    proofOfPurchaseRequired: z.boolean(),
  })
  .superRefine((p, ctx) => {
    if (p.fullCoverageMonths > p.termMonths) {
      ctx.addIssue({ code: 'custom', path: ['fullCoverageMonths'], message: 'must not exceed termMonths' });
    }
  });

export const installationSchema = z.strictObject({
  installedOn: isoDate,
  location: z.enum(LOCATIONS),
  enclosure: z.enum(ENCLOSURES),
  dimmer: z.enum(DIMMERS),
  nominalSupplyVolts: z.literal(NOMINAL_SUPPLY_VOLTS).meta(NOMINAL_VOLTS_META),
  hoursPerDay: nonNegative(24),
  ambientC: z.number().min(-60).max(100),
});

export const stringReadingSchema = z.strictObject({
  /** Volts across this string alone at its share of the rated current. */
  volts: nonNegative(2000).optional(),
  amps: nonNegative(100).optional(),
  /** LEDs seen dark on this string. */
  darkLeds: count(0, 1000).optional(),
});

export const measurementsSchema = z.strictObject({
  supplyVolts: nonNegative(1000).optional(),
  inputWatts: nonNegative(100_000).optional(),
  powerFactor: z.number().positive().max(1).optional(),
  driverOutputVolts: nonNegative(2000).optional(),
  driverOutputAmps: nonNegative(100).optional(),
  /** Measured light output as a per cent of the unit's initial output. */
  lightOutputPercent: nonNegative(200).optional(),
  strings: z.array(stringReadingSchema).max(1000).optional(),
});

export const observationsSchema = z.strictObject({
  debrisIngress: z.boolean().optional(),
  waterIngress: z.boolean().optional(),
  physicalDamage: z.boolean().optional(),
  fanStopped: z.boolean().optional(),
});

export const evidenceSchema = z.strictObject({
  photos: count(0, 1000),
  proofOfPurchase: z.boolean(),
  serial: str().trim().max(100).optional(),
});

export const claimSchema = z.strictObject({
  failedOn: isoDate,
  filedOn: isoDate,
  units: count(1, 10_000),
  symptoms: z.array(z.enum(SYMPTOMS)).max(SYMPTOMS.length),
  measurements: measurementsSchema.optional(),
  observations: observationsSchema.optional(),
  evidence: evidenceSchema,
});

const ISO_DATE_SHAPE = /^\d{4}-\d{2}-\d{2}$/;

export const evaluationInputSchema = z
  .strictObject({
    product: productSchema,
    policy: policySchema,
    installation: installationSchema,
    claim: claimSchema,
  })
  .superRefine((input, ctx) => {
    const { installedOn } = input.installation;
    const { failedOn, filedOn } = input.claim;
    // ISO dates compare as strings; skip the comparison when a date is already reported as malformed.
    if (ISO_DATE_SHAPE.test(installedOn) && ISO_DATE_SHAPE.test(failedOn) && failedOn < installedOn) {
      ctx.addIssue({
        code: 'custom',
        path: ['claim', 'failedOn'],
        message: 'must not be before installation.installedOn',
      });
    }
    if (ISO_DATE_SHAPE.test(failedOn) && ISO_DATE_SHAPE.test(filedOn) && filedOn < failedOn) {
      ctx.addIssue({
        code: 'custom',
        path: ['claim', 'filedOn'],
        message: 'must not be before claim.failedOn',
      });
    }
    const strings = input.claim.measurements?.strings;
    if (strings !== undefined) {
      if (strings.length > input.product.ledStrings) {
        ctx.addIssue({
          code: 'custom',
          path: ['claim', 'measurements', 'strings'],
          message: `at most product.ledStrings (${input.product.ledStrings}) strings`,
        });
      }
      for (let i = 0; i < strings.length; i++) {
        const dark = strings[i].darkLeds;
        if (dark !== undefined && dark > input.product.ledsPerString) {
          ctx.addIssue({
            code: 'custom',
            path: ['claim', 'measurements', 'strings', i, 'darkLeds'],
            message: `at most product.ledsPerString (${input.product.ledsPerString})`,
          });
        }
      }
    }
  });

export type EvaluationInput = z.infer<typeof evaluationInputSchema>;
export type Lm80Dataset = z.infer<typeof lm80DatasetSchema>;
export type LumenMaintenanceData = z.infer<typeof lumenMaintenanceSchema>;

// Output

const findingValue = z.union([z.number(), str(), z.boolean(), z.null()]);

export const findingSchema = z.strictObject({
  /** Stable, dotted lowercase: `category.what_was_found`. */
  code: str().regex(/^[a-z]+\.[a-z0-9_]+$/),
  category: z.enum(CATEGORIES),
  severity: z.enum(SEVERITIES),
  /** What this finding does to the verdict. */
  effect: z.enum(EFFECTS),
  message: str(),
  reference: str().optional(),
  /** The values the rule used; each key names its unit (Volts, Watts, Hours, Percent, C...). */
  values: z.record(str(), findingValue),
});

const lumenLifeSchema = z.strictObject({
  p: z.number(),
  hours: z.number().nullable(),
  reported: str(),
  limited: z.boolean(),
});

export const lumenProjectionSchema = z.strictObject({
  method: z.enum(['fit', 'given', 'arrhenius']),
  caseTempC: z.number(),
  B: z.number(),
  alpha: z.number(),
  testHours: z.number(),
  sampleSize: z.number(),
  projectionLimitHours: z.number(),
  lifetimes: z.array(lumenLifeSchema),
  /** Output the model gives at the unit's operating hours, in per cent; null past the projection limit. */
  projectedOutputPercent: z.number().nullable(),
});

export const computedSchema = z.strictObject({
  serviceVoltageRange: z.enum(['A', 'B', 'outside']).nullable(),
  driverOutputWatts: z.number().nullable(),
  driverEfficiency: z.number().nullable(),
  inputPowerDeviationPercent: z.number().nullable(),
  expectedStringVolts: z.number(),
  shortedLedsByString: z.array(z.number().nullable()),
  currentShareByString: z.array(z.number().nullable()),
  totalLeds: z.number(),
  darkLeds: z.number(),
  darkLedPercent: z.number(),
  ageMonths: z.number(),
  operatingHours: z.number(),
  daysToFiling: z.number(),
  coveragePercent: z.number(),
  credit: str(),
  currency: str(),
  qualifies: z.boolean(),
  lumenMaintenance: lumenProjectionSchema.nullable(),
});

export const evaluationSchema = z.strictObject({
  engineVersion: str(),
  verdict: z.enum(VERDICTS),
  findings: z.array(findingSchema),
  computed: computedSchema,
});

export type Category = (typeof CATEGORIES)[number];
export type Severity = (typeof SEVERITIES)[number];
export type Verdict = (typeof VERDICTS)[number];
export type Effect = (typeof EFFECTS)[number];
export type Finding = z.infer<typeof findingSchema>;
export type FindingValues = Finding['values'];
export type LumenProjection = z.infer<typeof lumenProjectionSchema>;
export type Computed = z.infer<typeof computedSchema>;
export type Evaluation = z.infer<typeof evaluationSchema>;
