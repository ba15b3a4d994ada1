import { z } from 'zod';
import type { AgeingTable, CrossTable, RankedCount } from '../analytics/failure-modes';
import type { KaplanMeierRow } from '../analytics/kaplan-meier';
import type { CohortReserve, CurrencyReserve } from '../analytics/reserve';
import type { ProbabilityPlot, WeibullFit } from '../analytics/weibull';
import { isoDateSchema, lotSchema, PRODUCT_FAMILIES, uuidSchema, type ProductFamily } from './catalogue';

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

export type PopulationDto = {
  kind: 'model' | 'family' | 'lot';
  label: string;
  productModelId?: string;
  family?: ProductFamily;
  lot?: string;
};

export type LifeSummaryDto = {
  unit: 'months' | 'hours';
  age: 'midpoint' | 'completed';
  asOf: string;
  units: number;
  failed: number;
  survivors: number;
  excessFailures: number;
  failureGroups: { time: number; count: number }[];
  suspensionGroups: { time: number; count: number }[];
};

export type LifeAnalysisDto = {
  population: PopulationDto;
  lifeData: LifeSummaryDto;
  /** Null when the data cannot be fitted; fitError says why. */
  fit: WeibullFit | null;
  fitError: { code: string; message: string } | null;
  probabilityPlot: ProbabilityPlot | null;
  kaplanMeier: KaplanMeierRow[];
};

export type FailureModesDto = {
  population: PopulationDto;
  asOf: string;
  claims: number;
  modes: (RankedCount & { label: string })[];
  environment: Record<(typeof ENVIRONMENT_FACTOR_KEYS)[number], RankedCount[]>;
  /** Failure mode x the factor asked for. */
  crossTable: CrossTable & { factor: (typeof ENVIRONMENT_FACTOR_KEYS)[number] };
  lots: RankedCount[];
  contractors: RankedCount[];
  ageing: AgeingTable;
};

export const AGE_BANDS = [
  '0-7 days',
  '8-14 days',
  '15-30 days',
  '31-60 days',
  '61-90 days',
  'over 90 days',
] as const;
export type ClaimsAgeingDto = {
  asOf: string;
  open: { band: (typeof AGE_BANDS)[number]; manufacturer: number; contractor: number; total: number }[];
  throughput: { week: string; approved: number; denied: number; decided: number }[];
};

export type ReserveCohortDto = CohortReserve & {
  productModelId: string;
  modelNumber: string;
  installMonth: string;
  ageMonths: number;
  survivors: number;
  termMonths: number;
  unitCredit: string;
  fitFrom: 'model' | 'family';
};

export type ReserveDto = {
  asOf: string;
  months: number;
  /** YYYY-MM of each forecast month, month 1 first. */
  monthLabels: string[];
  totals: CurrencyReserve[];
  cohorts: ReserveCohortDto[];
  /** Models whose units could not be forecast (too few failures, even for their family). */
  unforecast: { productModelId: string; modelNumber: string; survivors: number; reason: string }[];
  fits: {
    productModelId: string;
    modelNumber: string;
    shape: number;
    scale: number;
    from: 'model' | 'family';
  }[];
};
