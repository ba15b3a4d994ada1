import { z } from 'zod';
import { str } from './text';
import { STAGE_LABELS, STAGES, type Stage } from '../claims/stages';
import { SYMPTOMS, VERDICTS } from '../engine';
import { DIMMERS, ENCLOSURES, evaluationSchema, LOCATIONS, NOMINAL_SUPPLY_VOLTS } from '../engine/schema';
import {
  calendarDateSchema,
  currencySchema,
  decimalSchema,
  historyEventSchema,
  idSchema,
  instantSchema,
  orgRefSchema,
} from './answer-parts';
import { attachmentSchema } from './attachments';
import { isoDateSchema, uuidSchema, PRODUCT_FAMILIES } from './catalogue';
import { listQuerySchema } from './users';

// Claims: one strict schema per payload, shared by the claim form (its resolver and the live checks), the CSV
// batch import and the server. Readings are stored in base units (V, A, W); the form converts what meters show.

// The stage names and their wording come from the stage machine (shared/claims/stages.ts), defined once.
export const CLAIM_STAGES = STAGES;
export type ClaimStage = Stage;
export const CLAIM_STAGE_LABELS: Record<ClaimStage, string> = STAGE_LABELS;

/** Stages where the claim is still open: something is left to do by one side or the other. */
export const OPEN_STAGES: readonly ClaimStage[] = [
  'draft',
  'filed',
  'in_review',
  'needs_info',
  'return_requested',
  'unit_received',
  'approved',
];

export const WAITING_ON = ['manufacturer', 'contractor'] as const;
export type WaitingOn = (typeof WAITING_ON)[number];

export { SYMPTOMS };
export type Symptom = (typeof SYMPTOMS)[number];
export const SYMPTOM_LABELS: Record<Symptom, string> = {
  dark: 'Completely dark',
  partly_dark: 'Some LEDs or strings dark',
  cycling: 'Cycles on and off',
  flicker: 'Flickers',
  dim: 'Dimmer than it should be',
  color_shift: 'Colour has shifted',
  fan_noise: 'Fan noisy or stopped',
  other: 'Something else (say in the narrative)',
};

export const OBSERVATIONS = [
  'debrisIngress',
  'waterIngress',
  'physicalDamage',
  'fanStopped',
  'burnMarks',
] as const;
export type ObservationKey = (typeof OBSERVATIONS)[number];
export const OBSERVATION_LABELS: Record<ObservationKey, string> = {
  debrisIngress: 'Debris or insects inside',
  waterIngress: 'Water inside or water marks',
  physicalDamage: 'Physical damage (cracked lens, bent housing)',
  fanStopped: 'Cooling fan stopped',
  burnMarks: 'Burn or scorch marks',
};

const reading = (what: string, unit: string, max: number) =>
  z
    .number({ error: `Enter ${what} as a number of ${unit}.` })
    .refine(Number.isFinite, `Enter ${what} as a number of ${unit}.`)
    .min(0, `${what[0].toUpperCase()}${what.slice(1)} cannot be negative.`)
    .max(
      max,
      `${what[0].toUpperCase()}${what.slice(1)} must be at most ${max.toLocaleString('en-US')} ${unit}: check the meter's range.`,
    )
    .optional();

export const stringReadingInputSchema = z.strictObject({
  volts: reading('the string voltage', 'V', 2000),
  amps: reading('the string current', 'A', 100),
  darkLeds: z
    .number({ error: 'Enter the dark LEDs as a whole number.' })
    .int('Enter the dark LEDs as a whole number.')
    .min(0, 'Dark LEDs cannot be negative.')
    .max(1000, 'At most 1,000 dark LEDs on one string.')
    .optional(),
});

export const claimMeasurementsSchema = z.strictObject({
  supplyVolts: reading('the supply voltage', 'V', 1000),
  inputWatts: reading('the input power', 'W', 100_000),
  powerFactor: z
    .number({ error: 'Enter the power factor as a number between 0 and 1, like 0.93.' })
    .gt(0, 'The power factor must be above 0.')
    .max(1, 'The power factor is at most 1 (a reading like 93 % is 0.93).')
    .optional(),
  driverOutputVolts: reading('the driver output voltage', 'V', 2000),
  driverOutputAmps: reading('the driver output current', 'A', 100),
  strings: z.array(stringReadingInputSchema).max(1000, 'At most 1,000 strings.').optional(),
});
export type ClaimMeasurements = z.output<typeof claimMeasurementsSchema>;
export type ClaimMeasurementsInput = z.input<typeof claimMeasurementsSchema>;

export const claimObservationsSchema = z.strictObject(
  Object.fromEntries(
    OBSERVATIONS.map((k) => [
      k,
      z.boolean({ error: `Say yes or no: ${OBSERVATION_LABELS[k].toLowerCase()}.` }).optional(),
    ]),
  ) as Record<ObservationKey, z.ZodOptional<z.ZodBoolean>>,
);
export type ClaimObservations = z.infer<typeof claimObservationsSchema>;

const claimSerialSchema = str({ error: 'A serial number is text.' })
  .trim()
  .min(1, 'A serial number cannot be empty.')
  .max(64, 'A serial number or date code has at most 64 characters.');

/** The fields a draft holds; each may be left out while the draft is being written. */
export const claimFieldsSchema = z.strictObject({
  serials: z
    .array(claimSerialSchema)
    .max(1000, 'At most 1,000 serial numbers on one claim; file larger failures as a batch.')
    .refine((a) => new Set(a.map((s) => s.toUpperCase())).size === a.length, 'Each serial number once.')
    .optional(),
  units: z
    .number({ error: 'Enter how many units failed.' })
    .int('The number of failed units is a whole number.')
    .min(1, 'At least one unit failed.')
    .max(100_000, 'At most 100,000 units on one claim.')
    .optional(),
  failedOn: isoDateSchema('the failure date').nullish(),
  symptoms: z
    .array(z.enum(SYMPTOMS, { error: 'Pick a listed symptom.' }))
    .max(SYMPTOMS.length)
    .refine((a) => new Set(a).size === a.length, 'Each symptom once.')
    .optional(),
  measurements: claimMeasurementsSchema.optional(),
  observations: claimObservationsSchema.optional(),
  narrative: str({ error: 'The narrative is text.' })
    .max(5000, 'The narrative has at most 5,000 characters.')
    .optional(),
});
export type ClaimFields = z.output<typeof claimFieldsSchema>;
export type ClaimFieldsInput = z.input<typeof claimFieldsSchema>;

export const createClaimSchema = claimFieldsSchema.extend({ installationId: uuidSchema });
export type CreateClaimInput = z.input<typeof createClaimSchema>;

/** A draft autosave: the version the client last saw, and the fields that changed. */
export const updateClaimSchema = claimFieldsSchema.extend({
  version: z.number({ error: 'Send the version of the draft you are changing.' }).int().min(1),
});
export type UpdateClaimInput = z.input<typeof updateClaimSchema>;

export const fileClaimSchema = z.strictObject({
  /** Optional: file only if the draft is still at this version (what the user last saw). */
  version: z.number().int().min(1).optional(),
});

const stageList = str()
  .transform((s) =>
    s
      .split(',')
      .map((x) => x.trim())
      .filter(Boolean),
  )
  .pipe(
    z
      .array(z.enum(CLAIM_STAGES, { error: 'Pick a known stage.' }))
      .min(1)
      .max(CLAIM_STAGES.length),
  );

export const claimListQuerySchema = listQuerySchema.extend({
  sort: z
    .enum([
      'filedAt',
      '-filedAt',
      'updatedAt',
      '-updatedAt',
      'createdAt',
      '-createdAt',
      'failedOn',
      '-failedOn',
      'number',
      '-number',
    ])
    .default('-updatedAt'),
  stage: stageList.optional(),
  manufacturerId: uuidSchema.optional(),
  contractorId: uuidSchema.optional(),
  installationId: uuidSchema.optional(),
  productModelId: uuidSchema.optional(),
  /** Site name or city, contains. */
  site: str().trim().max(120).optional(),
  /** Model number or product name, contains. */
  product: str().trim().max(120).optional(),
  verdict: z.enum(['covered', 'excluded', 'review']).optional(),
  filedFrom: isoDateSchema('the first filing date').optional(),
  filedTo: isoDateSchema('the last filing date').optional(),
  open: z
    .enum(['true', 'false'])
    .transform((v) => v === 'true')
    .optional(),
  batchId: uuidSchema.optional(),
});
export type ClaimListQuery = z.infer<typeof claimListQuerySchema>;

// ---------------------------------------------------------------------------------------------------------
// What filing needs, checked the same way in the form (to say what is missing) and on the server (to refuse).

export type FilingIssue = { path: string; message: string };

export type FilingContext = {
  installDate: string;
  quantity: number;
  /** The installation's registered serials (empty when it registered none). */
  serials: readonly string[];
  today: string;
  hasPolicy: boolean;
  ledStrings: number;
  ledsPerString: number;
};

export function filingIssues(c: ClaimFields, ctx: FilingContext): FilingIssue[] {
  const out: FilingIssue[] = [];
  if (!ctx.hasPolicy)
    out.push({
      path: 'installation',
      message:
        'No warranty policy of the manufacturer covered this model on its purchase date, so there is nothing to claim against.',
    });
  const serials = c.serials ?? [];
  if (ctx.serials.length > 0) {
    if (serials.length === 0)
      out.push({ path: 'serials', message: 'Pick the serial number of each failed unit.' });
    const known = new Set(ctx.serials.map((s) => s.toUpperCase()));
    const strangers = serials.filter((s) => !known.has(s.toUpperCase()));
    if (strangers.length)
      out.push({
        path: 'serials',
        message: `Not registered on this installation: ${strangers.slice(0, 10).join(', ')}.`,
      });
  }
  const units = c.units ?? serials.length;
  if (!units) out.push({ path: 'units', message: 'Enter how many units failed.' });
  else if (units > ctx.quantity)
    out.push({
      path: 'units',
      message: `The installation has ${ctx.quantity} units; a claim cannot name more.`,
    });
  else if (serials.length > units)
    out.push({
      path: 'units',
      message: `${serials.length} serial numbers for ${units} failed units: list one serial per unit.`,
    });
  if (!c.failedOn) out.push({ path: 'failedOn', message: 'Enter the date the unit failed.' });
  else {
    if (c.failedOn < ctx.installDate)
      out.push({
        path: 'failedOn',
        message: `The failure date is before the install date (${ctx.installDate}).`,
      });
    if (c.failedOn > ctx.today)
      out.push({ path: 'failedOn', message: 'The failure date cannot be in the future.' });
  }
  if (!c.symptoms?.length) out.push({ path: 'symptoms', message: 'Pick at least one symptom.' });
  const strings = c.measurements?.strings ?? [];
  if (strings.length > ctx.ledStrings) {
    out.push({
      path: 'measurements.strings',
      message: `The product has ${ctx.ledStrings} LED strings; ${strings.length} string readings were given.`,
    });
  }
  strings.forEach((r, i) => {
    if (r.darkLeds !== undefined && r.darkLeds > ctx.ledsPerString) {
      out.push({
        path: `measurements.strings.${i}.darkLeds`,
        message: `String ${i + 1}: a string has ${ctx.ledsPerString} LEDs, so at most ${ctx.ledsPerString} can be dark.`,
      });
    }
  });
  if ((c.narrative ?? '').trim().length < 10)
    out.push({
      path: 'narrative',
      message: 'Describe the failure in a sentence or two (at least 10 characters).',
    });
  return out;
}

// ---------------------------------------------------------------------------------------------------------
// Answers

export const claimProductRefSchema = z.object({
  id: idSchema,
  modelNumber: z.string(),
  name: z.string(),
  family: z.enum(PRODUCT_FAMILIES),
});
export type ClaimProductRef = z.infer<typeof claimProductRefSchema>;

export const claimListItemSchema = z.object({
  id: idSchema,
  number: z.string().nullable(),
  stage: z.enum(CLAIM_STAGES),
  waitingOn: z.enum(WAITING_ON).nullable(),
  contractor: orgRefSchema,
  manufacturer: orgRefSchema,
  product: claimProductRefSchema,
  installation: z.object({ id: idSchema, siteName: z.string(), siteCity: z.string() }),
  serials: z.array(z.string()),
  units: z.number().int(),
  failedOn: calendarDateSchema.nullable(),
  filedAt: instantSchema.nullable(),
  stageChangedAt: instantSchema,
  evaluation: z.object({ verdict: z.enum(VERDICTS), engineVersion: z.string() }).nullable(),
  expectedCredit: decimalSchema.nullable(),
  currency: currencySchema.nullable(),
  createdAt: instantSchema,
  updatedAt: instantSchema,
  version: z.number().int().min(1),
});
export type ClaimListItemDto = z.infer<typeof claimListItemSchema>;

/** What the engine needs besides the claim itself, in the engine's own shape (ENGINE.md input). */
export const claimEngineContextSchema = z.object({
  product: z.object({
    ratedInputWatts: z.number(),
    inputVoltage: z.object({ min: z.number(), max: z.number() }),
    ledStrings: z.number().int(),
    ledsPerString: z.number().int(),
    ledForwardVolts: z.number(),
    driverOutputAmps: z.number(),
    driverMaxOutputVolts: z.number().optional(),
    location: z.enum(LOCATIONS),
    enclosedRated: z.boolean(),
    dimmable: z.boolean(),
    ambientMaxC: z.number(),
    ratedLifeHours: z.number(),
  }),
  policy: z
    .object({
      termMonths: z.number().int(),
      fullCoverageMonths: z.number().int(),
      filingWindowDays: z.number().int(),
      darkLedFailurePercent: z.number(),
      unitCredit: decimalSchema,
      currency: currencySchema,
      requiredPhotos: z.number().int(),
      proofOfPurchaseRequired: z.boolean(),
    })
    .nullable(),
  installation: z.object({
    installedOn: calendarDateSchema,
    location: z.enum(LOCATIONS),
    enclosure: z.enum(ENCLOSURES),
    dimmer: z.enum(DIMMERS),
    // The generator writes only the first value of a many-valued literal; the list is spelt out for it.
    nominalSupplyVolts: z.literal(NOMINAL_SUPPLY_VOLTS).meta({ enum: [...NOMINAL_SUPPLY_VOLTS] }),
    hoursPerDay: z.number(),
    ambientC: z.number(),
  }),
});
export type ClaimEngineContext = z.infer<typeof claimEngineContextSchema>;

export const filingIssueSchema = z.object({ path: z.string(), message: z.string() });

/** GET /api/claims/:id (and the answers that change a claim): the list's fields and everything on its page. */
export const claimDetailSchema = claimListItemSchema.extend({
  symptoms: z.array(z.enum(SYMPTOMS)),
  measurements: claimMeasurementsSchema,
  observations: claimObservationsSchema,
  narrative: z.string(),
  installationDetail: z.object({
    id: idSchema,
    siteName: z.string(),
    siteAddress: z.string(),
    siteCity: z.string(),
    siteRegion: z.string(),
    quantity: z.number().int(),
    installDate: calendarDateSchema,
    purchaseDate: calendarDateSchema.nullable(),
    serials: z.array(z.string()),
    policyVersion: z
      .object({
        id: idSchema,
        policyName: z.string(),
        versionNumber: z.number().int(),
        effectiveFrom: calendarDateSchema,
      })
      .nullable(),
  }),
  engineContext: claimEngineContextSchema,
  evaluation: evaluationSchema.extend({ evaluatedAt: instantSchema }).nullable(),
  attachments: z.array(attachmentSchema),
  /** What the manufacturer asked for (information or a return); the review issue fills this in. */
  requests: z.array(
    z.object({
      id: idSchema,
      kind: z.string(),
      message: z.string(),
      createdAt: instantSchema,
      answeredAt: instantSchema.nullable(),
    }),
  ),
  /** Not filled in here (null): GET /api/claims/:id/workflow carries the decision. */
  decision: z.record(z.string(), z.unknown()).nullable(),
  /** Not filled in here (null): GET /api/credits lists the claim's memos. */
  credit: z.record(z.string(), z.unknown()).nullable(),
  history: z.array(historyEventSchema),
  filingIssues: z.array(filingIssueSchema),
  /** Named to the creator's own organisation; to the other side, the organisation's name and no id. */
  createdBy: z.object({ id: idSchema.nullable(), name: z.string() }).nullable(),
});
export type ClaimDetailDto = z.infer<typeof claimDetailSchema>;

// ---------------------------------------------------------------------------------------------------------
// Batches (bulk filing from a spreadsheet)

export const CLAIM_BATCH_MAX_ROWS = 2000;

/** The spreadsheet: CSV text or JSON rows (as the installations import takes them), and the file's name. */
export const batchRequestSchema = z
  .strictObject({
    csv: str().max(5_000_000, 'The file is larger than 5 MB.').optional(),
    rows: z
      .array(z.record(str(), z.union([str(), z.number(), z.boolean(), z.null()])))
      .max(CLAIM_BATCH_MAX_ROWS, `At most ${CLAIM_BATCH_MAX_ROWS} rows at once.`)
      .optional(),
    filename: str().trim().max(200).optional(),
  })
  .refine((v) => (v.csv === undefined) !== (v.rows === undefined), 'Send either csv or rows.');

export const claimBatchRowErrorSchema = z.object({
  row: z.number().int(),
  column: z.string(),
  message: z.string(),
});
export type ClaimBatchRowError = z.infer<typeof claimBatchRowErrorSchema>;

/** POST /api/claims/batches: what the spreadsheet held and what each good row became (or would become). */
export const claimBatchResultSchema = z.object({
  dryRun: z.boolean(),
  batchId: idSchema.nullable(),
  total: z.number().int().min(0),
  valid: z.number().int().min(0),
  invalid: z.number().int().min(0),
  created: z.number().int().min(0),
  errors: z.array(claimBatchRowErrorSchema),
  errorsTruncated: z.boolean(),
  /** Each good row: what it became (or would become). */
  rows: z.array(
    z.object({
      row: z.number().int(),
      claimId: idSchema.nullable(),
      installationId: idSchema,
      siteName: z.string(),
      modelNumber: z.string(),
      serials: z.array(z.string()),
      failedOn: calendarDateSchema,
      verdict: z.enum(VERDICTS).nullable(),
    }),
  ),
});
export type ClaimBatchResult = z.infer<typeof claimBatchResultSchema>;

/** POST /api/claims/batches/:id/file: each draft of the batch filed, or refused with the reason. */
export const claimBatchFileResultSchema = z.object({
  batchId: idSchema,
  results: z.array(
    z.object({
      claimId: idSchema,
      number: z.string().nullable(),
      stage: z.enum(CLAIM_STAGES),
      ok: z.boolean(),
      replayed: z.boolean(),
      error: z
        .object({ code: z.string(), message: z.string(), details: z.array(filingIssueSchema).optional() })
        .optional(),
    }),
  ),
});
export type ClaimBatchFileResult = z.infer<typeof claimBatchFileResultSchema>;
