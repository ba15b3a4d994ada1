import { z } from 'zod';
import type { AgeingTable, CrossTable, RankedCount } from '../analytics/failure-modes';
import type { KaplanMeierRow } from '../analytics/kaplan-meier';
import type { CohortReserve, CurrencyReserve } from '../analytics/reserve';
import type { ProbabilityPlot, WeibullFit } from '../analytics/weibull';
import { isoDateSchema, lotSchema, PRODUCT_FAMILIES, uuidSchema } from './catalogue';

// The reliability analytics and reserve routes: one strict schema per query, the answers' shapes beside them.

export { lotSchema };

export const AGE_UNITS = ['months', 'hours'] as const;
export const FIT_METHODS = ['mle', 'mrr'] as const;
export const FORMATS = ['json', 'csv'] as const;

/** Which units the analysis is about: exactly one of a model, a family or a lot, of the user's manufacturer. */
const populationShape = {
  productModelId: uuidSchema.optional(),
  family: z.enum(PRODUCT_FAMILIES, { error: 'Pick a product family.' }).optional(),
  lot: lotSchema.optional(),
  asOf: isoDateSchema('the analysis date').optional(),
};

function exactlyOnePopulation(
  q: { productModelId?: string; family?: string; lot?: string },
  ctx: z.RefinementCtx,
) {
  const given = [q.productModelId, q.family, q.lot].filter((v) => v !== undefined).length;
  if (given !== 1) {
    ctx.addIssue({
      code: 'custom',
      path: ['productModelId'],
      message: 'Pick exactly one of a product model (productModelId), a family or a lot.',
    });
  }
}

export const LIFE_TABLES = ['fit', 'probability-plot', 'kaplan-meier', 'life-data'] as const;
export const lifeQuerySchema = z
  .strictObject({
    ...populationShape,
    ageUnit: z.enum(AGE_UNITS, { error: 'Ages are in months or hours.' }).default('months'),
    method: z
      .enum(FIT_METHODS, { error: 'The fit is mle (maximum likelihood) or mrr (median-rank regression).' })
      .default('mle'),
    /** midpoint (the default): ages in the middle of the month or day they fell in, so first-month failures fit. */
    age: z.enum(['midpoint', 'completed'], { error: 'Ages are midpoint or completed.' }).default('midpoint'),
    format: z.enum(FORMATS, { error: 'The format is json or csv.' }).default('json'),
    table: z
      .enum(LIFE_TABLES, { error: `The table is one of ${LIFE_TABLES.join(', ')}.` })
      .default('life-data'),
  })
  .superRefine(exactlyOnePopulation);
export type LifeQuery = z.infer<typeof lifeQuerySchema>;

export const FAILURE_TABLES = ['modes', 'environment', 'lot', 'contractor', 'ageing'] as const;
export const ENVIRONMENT_FACTOR_KEYS = ['location', 'enclosure', 'dimmer', 'supply', 'ambientBand'] as const;
export const failureModesQuerySchema = z
  .strictObject({
    ...populationShape,
    format: z.enum(FORMATS, { error: 'The format is json or csv.' }).default('json'),
    table: z
      .enum(FAILURE_TABLES, { error: `The table is one of ${FAILURE_TABLES.join(', ')}.` })
      .default('modes'),
    factor: z
      .enum(ENVIRONMENT_FACTOR_KEYS, { error: `The factor is one of ${ENVIRONMENT_FACTOR_KEYS.join(', ')}.` })
      .default('enclosure'),
  })
  .superRefine(exactlyOnePopulation);
export type FailureModesQuery = z.infer<typeof failureModesQuerySchema>;

export const AGEING_TABLES = ['open', 'throughput'] as const;
export const claimsAgeingQuerySchema = z.strictObject({
  asOf: isoDateSchema('the analysis date').optional(),
  weeks: z.coerce
    .number({ error: 'Weeks is a whole number.' })
    .int('Weeks is a whole number.')
    .min(1, 'At least 1 week.')
    .max(104, 'At most 104 weeks.')
    .default(12),
  format: z.enum(FORMATS, { error: 'The format is json or csv.' }).default('json'),
  table: z.enum(AGEING_TABLES, { error: `The table is one of ${AGEING_TABLES.join(', ')}.` }).default('open'),
});
export type ClaimsAgeingQuery = z.infer<typeof claimsAgeingQuerySchema>;

export const RESERVE_TABLES = ['months', 'cohorts'] as const;
export const reserveQuerySchema = z.strictObject({
  months: z.coerce
    .number({ error: 'Months is a whole number.' })
    .int('Months is a whole number.')
    .min(1, 'Forecast at least 1 month.')
    .max(60, 'Forecast at most 60 months.')
    .default(12),
  asOf: isoDateSchema('the forecast date').optional(),
  format: z.enum(FORMATS, { error: 'The format is json or csv.' }).default('json'),
  table: z
    .enum(RESERVE_TABLES, { error: `The table is one of ${RESERVE_TABLES.join(', ')}.` })
    .default('months'),
});
export type ReserveQuery = z.infer<typeof reserveQuerySchema>;

// ---- answers ----

/** Whether two types are the same both ways: the answer schemas below must not drift from the computations. */
type Same<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;

const count = z.number().int().min(0);

export const populationSchema = z.object({
  kind: z.enum(['model', 'family', 'lot']),
  label: z.string(),
  productModelId: z.uuid().optional(),
  family: z.enum(PRODUCT_FAMILIES).optional(),
  lot: z.string().optional(),
});
export type PopulationDto = z.infer<typeof populationSchema>;

const timeCountSchema = z.object({ time: z.number(), count });

export const lifeSummarySchema = z.object({
  unit: z.enum(AGE_UNITS),
  age: z.enum(['midpoint', 'completed']),
  asOf: z.iso.date(),
  units: count,
  failed: count,
  survivors: count,
  excessFailures: count,
  failureGroups: z.array(timeCountSchema),
  suspensionGroups: z.array(timeCountSchema),
});
export type LifeSummaryDto = z.infer<typeof lifeSummarySchema>;

/** A Weibull fit (shared/analytics/weibull.ts). */
export const weibullFitSchema = z.object({
  shape: z.number(),
  scale: z.number(),
  method: z.enum(FIT_METHODS),
  failures: count,
  units: count,
  b10: z.number(),
  b50: z.number(),
  meanLife: z.number(),
  logLikelihood: z.number(),
});
const plotPointSchema = z.object({ time: z.number(), F: z.number(), x: z.number(), y: z.number() });
export const probabilityPlotSchema = z.object({
  points: z.array(plotPointSchema.extend({ count })),
  line: z.tuple([plotPointSchema, plotPointSchema]),
});
export const kaplanMeierRowSchema = z.object({
  time: z.number(),
  atRisk: count,
  failed: count,
  censored: count,
  survival: z.number(),
  standardError: z.number(),
  lower: z.number(),
  upper: z.number(),
});

export const lifeAnalysisSchema = z.object({
  population: populationSchema,
  lifeData: lifeSummarySchema,
  /** Null when the data cannot be fitted; fitError says why. */
  fit: weibullFitSchema.nullable(),
  fitError: z.object({ code: z.string(), message: z.string() }).nullable(),
  probabilityPlot: probabilityPlotSchema.nullable(),
  kaplanMeier: z.array(kaplanMeierRowSchema),
});
export type LifeAnalysisDto = z.infer<typeof lifeAnalysisSchema>;

/** One key's claims, units and share of all the rows' claims (shared/analytics/failure-modes.ts). */
export const rankedCountSchema = z.object({
  key: z.string(),
  claims: count,
  units: count,
  share: z.number(),
});
export const crossTableSchema = z.object({
  rows: z.array(z.string()),
  columns: z.array(z.string()),
  counts: z.array(z.array(count)),
  rowTotals: z.array(count),
  columnTotals: z.array(count),
  total: count,
});
export const ageingTableSchema = z.object({
  installMonths: z.array(z.string()),
  monthsInService: z.array(count),
  counts: z.array(z.array(count)),
  rowTotals: z.array(count),
  columnTotals: z.array(count),
});

export const failureModesSchema = z.object({
  population: populationSchema,
  asOf: z.iso.date(),
  claims: count,
  modes: z.array(rankedCountSchema.extend({ label: z.string() })),
  environment: z.object(
    Object.fromEntries(ENVIRONMENT_FACTOR_KEYS.map((k) => [k, z.array(rankedCountSchema)])) as Record<
      (typeof ENVIRONMENT_FACTOR_KEYS)[number],
      z.ZodArray<typeof rankedCountSchema>
    >,
  ),
  /** Failure mode x the factor asked for. */
  crossTable: crossTableSchema.extend({ factor: z.enum(ENVIRONMENT_FACTOR_KEYS) }),
  lots: z.array(rankedCountSchema),
  contractors: z.array(rankedCountSchema),
  ageing: ageingTableSchema,
});
export type FailureModesDto = z.infer<typeof failureModesSchema>;

export const AGE_BANDS = [
  '0-7 days',
  '8-14 days',
  '15-30 days',
  '31-60 days',
  '61-90 days',
  'over 90 days',
] as const;
export const claimsAgeingSchema = z.object({
  asOf: z.iso.date(),
  open: z.array(z.object({ band: z.enum(AGE_BANDS), manufacturer: count, contractor: count, total: count })),
  throughput: z.array(z.object({ week: z.iso.date(), approved: count, denied: count, decided: count })),
});
export type ClaimsAgeingDto = z.infer<typeof claimsAgeingSchema>;

/** A forecast's money: decimal strings rounded once to the cent, and the exact cents (shared/analytics/reserve.ts). */
const reserveAmountsShape = {
  currency: z.string().regex(/^[A-Z]{3}$/),
  expectedClaims: z.number(),
  monthlyClaims: z.array(z.number()),
  amount: z.string().regex(/^-?\d+(\.\d+)?$/),
  monthlyAmounts: z.array(z.string().regex(/^-?\d+(\.\d+)?$/)),
  exactCents: z.number(),
  monthlyExactCents: z.array(z.number()),
};
export const currencyReserveSchema = z.object(reserveAmountsShape);
export const cohortReserveSchema = z.object({ key: z.string(), ...reserveAmountsShape });

export const reserveCohortSchema = cohortReserveSchema.extend({
  productModelId: z.uuid(),
  modelNumber: z.string(),
  installMonth: z.string().regex(/^\d{4}-\d{2}$/),
  ageMonths: count,
  survivors: count,
  termMonths: count,
  unitCredit: z.string().regex(/^-?\d+(\.\d+)?$/),
  fitFrom: z.enum(['model', 'family']),
});
export type ReserveCohortDto = z.infer<typeof reserveCohortSchema>;

export const reserveSchema = z.object({
  asOf: z.iso.date(),
  months: z.number().int().min(1),
  /** YYYY-MM of each forecast month, month 1 first. */
  monthLabels: z.array(z.string().regex(/^\d{4}-\d{2}$/)),
  totals: z.array(currencyReserveSchema),
  cohorts: z.array(reserveCohortSchema),
  /** Models whose units could not be forecast (too few failures, even for their family). */
  unforecast: z.array(
    z.object({ productModelId: z.uuid(), modelNumber: z.string(), survivors: count, reason: z.string() }),
  ),
  fits: z.array(
    z.object({
      productModelId: z.uuid(),
      modelNumber: z.string(),
      shape: z.number(),
      scale: z.number(),
      from: z.enum(['model', 'family']),
    }),
  ),
});
export type ReserveDto = z.infer<typeof reserveSchema>;

// The computations' own types and the schemas above are the same shape (tsc fails here if one changes alone).
export const ANSWER_SCHEMAS_MATCH: [
  Same<z.infer<typeof weibullFitSchema>, WeibullFit>,
  Same<z.infer<typeof probabilityPlotSchema>, ProbabilityPlot>,
  Same<z.infer<typeof kaplanMeierRowSchema>, KaplanMeierRow>,
  Same<z.infer<typeof rankedCountSchema>, RankedCount>,
  Same<z.infer<typeof crossTableSchema>, CrossTable>,
  Same<z.infer<typeof ageingTableSchema>, AgeingTable>,
  Same<z.infer<typeof cohortReserveSchema>, CohortReserve>,
  Same<z.infer<typeof currencyReserveSchema>, CurrencyReserve>,
] = [true, true, true, true, true, true, true, true];
