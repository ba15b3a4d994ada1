import { z } from 'zod';
import { str } from './text';
import { DIMMERS, ENCLOSURES, LOCATIONS, NOMINAL_SUPPLY_VOLTS, NOMINAL_VOLTS_META } from '../engine/schema';
import { listQuerySchema } from './users';
import {
  calendarDateSchema,
  decimalSchema,
  currencySchema,
  historyEventSchema,
  idSchema,
  instantSchema,
  orgRefSchema,
} from './answer-parts';

// Product models, warranty policies and installations: one strict schema per payload, shared by the forms,
// the CSV import and the server. Units are in the field names' labels (W, V, A, lm, °C, h).

export const PRODUCT_FAMILIES = [
  'high_bay',
  'wall_pack',
  'troffer',
  'corn_lamp',
  'flood',
  'strip',
  'other',
] as const;
export type ProductFamily = (typeof PRODUCT_FAMILIES)[number];
export const FAMILY_LABELS: Record<ProductFamily, string> = {
  high_bay: 'High-bay',
  wall_pack: 'Wall pack',
  troffer: 'Troffer',
  corn_lamp: 'Corn-lamp retrofit',
  flood: 'Flood',
  strip: 'Strip',
  other: 'Other',
};

export { LOCATIONS, ENCLOSURES, DIMMERS, NOMINAL_SUPPLY_VOLTS };
export type RatedLocation = (typeof LOCATIONS)[number];
export type Enclosure = (typeof ENCLOSURES)[number];
export type Dimmer = (typeof DIMMERS)[number];
export const LOCATION_LABELS: Record<RatedLocation, string> = { dry: 'Dry', damp: 'Damp', wet: 'Wet' };
export const ENCLOSURE_LABELS: Record<Enclosure, string> = {
  open: 'Open',
  enclosed: 'Totally enclosed',
  enclosed_ventilated: 'Enclosed and ventilated',
};
export const DIMMER_LABELS: Record<Dimmer, string> = {
  none: 'No dimmer',
  phase: 'Phase-cut dimmer',
  '0-10v': '0-10 V dimmer',
};

/** How a product dims: not at all, by phase-cut (forward or reverse), by 0-10 V, or either. */
export const DIMMINGS = ['none', 'phase', '0-10v', 'phase_or_0-10v'] as const;
export type Dimming = (typeof DIMMINGS)[number];
export const DIMMING_LABELS: Record<Dimming, string> = {
  none: 'Not dimmable',
  phase: 'Phase-cut',
  '0-10v': '0-10 V',
  'phase_or_0-10v': 'Phase-cut or 0-10 V',
};

export const EXCLUSIONS = [
  'location_misapplication',
  'enclosed_misapplication',
  'dimmer_misapplication',
  'supply_outside_rating',
  'ambient_above_rating',
  'physical_damage',
  'debris_or_water_ingress',
  'field_modification',
  'improper_installation',
  'power_surge_or_lightning',
] as const;
export type Exclusion = (typeof EXCLUSIONS)[number];
export const EXCLUSION_LABELS: Record<Exclusion, string> = {
  location_misapplication: 'Installed in a wetter location than rated',
  enclosed_misapplication: 'Used in a totally enclosed fixture without an enclosed rating',
  dimmer_misapplication: 'Dimmer on a non-dimmable product',
  supply_outside_rating: 'Supply voltage outside the rated input range',
  ambient_above_rating: 'Ambient temperature above the rated maximum',
  physical_damage: 'Physical damage',
  debris_or_water_ingress: 'Debris, insect or water ingress',
  field_modification: 'Field modification (bypassed LEDs, swapped driver)',
  improper_installation: 'Installation not to code or instructions',
  power_surge_or_lightning: 'Power surge or lightning',
};

// Helpers with plain messages. Number fields name their unit in the message.
const num = (
  what: string,
  unit: string,
  min: number,
  max: number,
  opts: { int?: boolean; exclusiveMin?: boolean } = {},
) => {
  let s = z.number({ error: `Enter ${what}${unit ? ` in ${unit}` : ''}.` });
  if (opts.int) s = s.int(`${cap(what)} must be a whole number.`);
  s = opts.exclusiveMin
    ? s.gt(min, `${cap(what)} must be above ${min}${unit ? ` ${unit}` : ''}.`)
    : s.min(min, `${cap(what)} must be at least ${min}${unit ? ` ${unit}` : ''}.`);
  return s.max(max, `${cap(what)} must be at most ${max.toLocaleString('en-US')}${unit ? ` ${unit}` : ''}.`);
};
const cap = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);
const text = (what: string, max: number) =>
  str({ error: `Enter ${what}.` })
    .trim()
    .min(1, `Enter ${what}.`)
    .max(max, `${cap(what)} has at most ${max} characters.`);
const optionalText = (what: string, max: number) =>
  str()
    .trim()
    .max(max, `${cap(what)} has at most ${max} characters.`)
    .nullish()
    .transform((v) => (v ? v : null));

export const isoDateSchema = (what: string) =>
  str({ error: `Enter ${what} as YYYY-MM-DD.` })
    .regex(/^\d{4}-\d{2}-\d{2}$/, `Enter ${what} as YYYY-MM-DD.`)
    .refine(
      (s) => {
        const d = new Date(`${s}T00:00:00Z`);
        return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s;
      },
      `${cap(what)} is not a calendar date.`,
    )
    .refine((s) => s >= '1990-01-01' && s <= '2100-12-31', `${cap(what)} must be between 1990 and 2100.`);

const MONEY = /^\d{1,10}(\.\d{1,2})?$/;
const money = (what: string) =>
  str({ error: `Enter ${what} as an amount like "96.00".` })
    .trim()
    .regex(MONEY, `Enter ${what} as an amount like "96.00" (at most two decimals).`)
    .refine((s) => Number(s) <= 1_000_000, `${cap(what)} must be at most 1,000,000.00.`)
    .transform((s) => Number(s).toFixed(2));

export const uuidSchema = z.uuid({ error: 'Not a valid id.' });

// ---------------------------------------------------------------------------------------------------------
// Product models

const productFields = {
  modelNumber: str({ error: 'Enter the model number.' })
    .trim()
    .min(1, 'Enter the model number.')
    .max(64, 'A model number has at most 64 characters.')
    .regex(/^[A-Za-z0-9][A-Za-z0-9 ._/+-]*$/, 'Use letters, digits, spaces and . _ / + - in a model number.'),
  name: text('a name', 160),
  family: z.enum(PRODUCT_FAMILIES, { error: 'Pick a family.' }),
  ratedInputWatts: num('the rated input power', 'W', 0, 5000, { exclusiveMin: true }),
  inputVoltsMin: num('the lowest rated input voltage', 'V', 12, 1000),
  inputVoltsMax: num('the highest rated input voltage', 'V', 12, 1000),
  ratedLumens: num('the rated light output', 'lm', 1, 1_000_000, { int: true }),
  ledStrings: num('the number of LED strings', '', 1, 1000, { int: true }),
  ledsPerString: num('the number of LEDs per string', '', 1, 1000, { int: true }),
  ledForwardVolts: num('the nominal forward voltage of one LED', 'V', 1.5, 50),
  driverOutputAmps: num('the driver output current', 'A', 0, 100, { exclusiveMin: true }),
  driverMaxOutputVolts: num('the driver open-circuit limit', 'V', 1, 2000)
    .nullish()
    .transform((v) => v ?? null),
  location: z.enum(LOCATIONS, { error: 'Pick the location rating: dry, damp or wet.' }),
  enclosedRated: z.boolean({ error: 'Say whether it is rated for totally enclosed luminaires.' }),
  dimming: z.enum(DIMMINGS, { error: 'Pick how it dims, or not dimmable.' }),
  ambientMaxC: num('the rated maximum ambient temperature', '°C', -40, 100),
  ratedLifeHours: num('the rated life', 'h', 1000, 1_000_000, { int: true }),
  activeCooling: z.boolean({ error: 'Say whether it has active cooling (a fan).' }),
};

type RatingCheck = {
  inputVoltsMin?: number;
  inputVoltsMax?: number;
  ledsPerString?: number;
  ledForwardVolts?: number;
  driverOutputAmps?: number;
  driverMaxOutputVolts?: number | null;
  ratedInputWatts?: number;
};

/** Cross-field bounds: the ratings have to describe a fixture that can work. */
function checkRatings(p: RatingCheck, ctx: z.RefinementCtx) {
  if (p.inputVoltsMin !== undefined && p.inputVoltsMax !== undefined && p.inputVoltsMin >= p.inputVoltsMax) {
    ctx.addIssue({
      code: 'custom',
      path: ['inputVoltsMax'],
      message: 'The highest input voltage must be above the lowest.',
    });
  }
  if (p.ledsPerString !== undefined && p.ledForwardVolts !== undefined) {
    // String voltage = n x Vf (LED application-note practice); the driver must be able to reach it.
    const stringVolts = Math.round(p.ledsPerString * p.ledForwardVolts * 100) / 100;
    if (p.driverMaxOutputVolts != null && p.driverMaxOutputVolts < stringVolts) {
      ctx.addIssue({
        code: 'custom',
        path: ['driverMaxOutputVolts'],
        message: `The open-circuit limit must be at least the string voltage (${p.ledsPerString} LEDs x ${p.ledForwardVolts} V = ${stringVolts} V).`,
      });
    }
    if (p.driverOutputAmps !== undefined && p.ratedInputWatts !== undefined) {
      // Output power cannot exceed input power: a driver's efficiency is below 1.
      const outWatts = Math.round(stringVolts * p.driverOutputAmps * 10) / 10;
      if (outWatts > p.ratedInputWatts) {
        ctx.addIssue({
          code: 'custom',
          path: ['driverOutputAmps'],
          message: `The LEDs would draw ${outWatts} W (${stringVolts} V x ${p.driverOutputAmps} A), more than the rated input power of ${p.ratedInputWatts} W.`,
        });
      }
    }
  }
}

export const productInputSchema = z.strictObject(productFields).superRefine(checkRatings);
export type ProductInput = z.input<typeof productInputSchema>;
export type ProductValues = z.output<typeof productInputSchema>;

export const updateProductSchema = z
  .strictObject({
    ...Object.fromEntries(Object.entries(productFields).map(([k, v]) => [k, v.optional()])),
  } as {
    [K in keyof typeof productFields]: z.ZodOptional<(typeof productFields)[K]>;
  })
  .refine((v) => Object.values(v).some((x) => x !== undefined), 'Nothing to change.');
export type UpdateProductInput = z.input<typeof updateProductSchema>;

const boolParam = z.enum(['true', 'false']).transform((v) => v === 'true');

export const productListQuerySchema = listQuerySchema.extend({
  sort: z
    .enum([
      'modelNumber',
      '-modelNumber',
      'name',
      '-name',
      'family',
      '-family',
      'ratedInputWatts',
      '-ratedInputWatts',
      'ratedLumens',
      '-ratedLumens',
      'createdAt',
      '-createdAt',
    ])
    .default('modelNumber'),
  manufacturerId: uuidSchema.optional(),
  family: z.enum(PRODUCT_FAMILIES).optional(),
  location: z.enum(LOCATIONS).optional(),
  dimming: z.enum(DIMMINGS).optional(),
  enclosedRated: boolParam.optional(),
});
export type ProductListQuery = z.infer<typeof productListQuerySchema>;

export type OrgRef = { id: string; name: string };

export const productSchema = z.object({
  id: idSchema,
  manufacturer: orgRefSchema,
  modelNumber: z.string(),
  name: z.string(),
  family: z.enum(PRODUCT_FAMILIES),
  ratedInputWatts: z.number(),
  inputVoltsMin: z.number(),
  inputVoltsMax: z.number(),
  ratedLumens: z.number(),
  ledStrings: z.number().int(),
  ledsPerString: z.number().int(),
  ledForwardVolts: z.number(),
  driverOutputAmps: z.number(),
  driverMaxOutputVolts: z.number().nullable(),
  location: z.enum(LOCATIONS),
  enclosedRated: z.boolean(),
  dimming: z.enum(DIMMINGS),
  ambientMaxC: z.number(),
  ratedLifeHours: z.number(),
  activeCooling: z.boolean(),
  createdAt: instantSchema,
  updatedAt: instantSchema,
  version: z.number().int().min(1),
});
export type ProductDto = z.infer<typeof productSchema>;

// ---------------------------------------------------------------------------------------------------------
// Warranty policies

const DENIAL_CODE = /^[A-Z][A-Z0-9-]{1,15}$/;

export const policyTermsSchema = z
  .strictObject({
    effectiveFrom: isoDateSchema('the effective date'),
    termMonths: num('the warranty term', 'months', 1, 360, { int: true }),
    fullCoverageMonths: num('the full-coverage period', 'months', 0, 360, { int: true }),
    filingWindowDays: num('the filing window', 'days', 1, 3650, { int: true }),
    darkLedFailurePercent: num('the failure threshold', '% of LEDs dark', 0, 100, {
      exclusiveMin: true,
    }).refine((v) => Math.round(v * 100) === v * 100, 'The failure threshold has at most two decimals.'),
    unitCredit: money('the unit credit'),
    currency: str({ error: 'Enter a currency code like USD.' })
      .trim()
      .toUpperCase()
      .regex(/^[A-Z]{3}$/, 'Use a three-letter ISO 4217 currency code like USD or CAD.'),
    labourAllowance: money('the labour allowance'),
    requiredPhotos: num('the number of required photos', '', 0, 20, { int: true }),
    proofOfPurchaseRequired: z.boolean({ error: 'Say whether proof of purchase is required.' }),
    exclusions: z
      .array(z.enum(EXCLUSIONS, { error: 'Pick a known exclusion.' }))
      .max(EXCLUSIONS.length)
      .refine((a) => new Set(a).size === a.length, 'Each exclusion once.'),
    denialReasons: z
      .array(
        z.strictObject({
          code: str()
            .trim()
            .toUpperCase()
            .regex(DENIAL_CODE, 'A reason code is 2-16 capitals, digits or dashes, like MISAPP-WET.'),
          label: text('the reason in words', 200),
        }),
      )
      .max(40, 'At most 40 denial reasons.')
      .refine((a) => new Set(a.map((r) => r.code)).size === a.length, 'Each reason code once.'),
    changeNote: optionalText('the change note', 500),
  })
  .superRefine((t, ctx) => {
    if (t.fullCoverageMonths > t.termMonths) {
      ctx.addIssue({
        code: 'custom',
        path: ['fullCoverageMonths'],
        message: 'The full-coverage period cannot be longer than the term.',
      });
    }
  });
export type PolicyTermsInput = z.input<typeof policyTermsSchema>;
export type PolicyTerms = z.output<typeof policyTermsSchema>;

const modelIds = z
  .array(uuidSchema)
  .min(1, 'Attach the policy to at least one product model.')
  .max(500)
  .refine((a) => new Set(a).size === a.length, 'Each model once.');

export const createPolicySchema = z.strictObject({
  name: text('a policy name', 160),
  productModelIds: modelIds,
  terms: policyTermsSchema,
});
export type CreatePolicyInput = z.input<typeof createPolicySchema>;

export const updatePolicySchema = z
  .strictObject({ name: text('a policy name', 160).optional(), productModelIds: modelIds.optional() })
  .refine((v) => v.name !== undefined || v.productModelIds !== undefined, 'Nothing to change.');
export type UpdatePolicyInput = z.input<typeof updatePolicySchema>;

export const policyListQuerySchema = listQuerySchema.extend({
  sort: z.enum(['name', '-name', 'updatedAt', '-updatedAt', 'createdAt', '-createdAt']).default('name'),
  manufacturerId: uuidSchema.optional(),
  productModelId: uuidSchema.optional(),
});
export type PolicyListQuery = z.infer<typeof policyListQuerySchema>;

export const denialReasonSchema = z.object({ code: z.string(), label: z.string() });
export type DenialReason = z.infer<typeof denialReasonSchema>;

/** One version of a policy's terms as the answers show it (policies.presenter.ts). */
export const policyVersionSchema = z.object({
  id: idSchema,
  policyId: idSchema,
  versionNumber: z.number().int().min(1),
  effectiveFrom: calendarDateSchema,
  termMonths: z.number().int(),
  fullCoverageMonths: z.number().int(),
  filingWindowDays: z.number().int(),
  darkLedFailurePercent: z.number(),
  unitCredit: decimalSchema,
  currency: currencySchema,
  labourAllowance: decimalSchema,
  requiredPhotos: z.number().int(),
  proofOfPurchaseRequired: z.boolean(),
  exclusions: z.array(z.enum(EXCLUSIONS)),
  denialReasons: z.array(denialReasonSchema),
  changeNote: z.string().nullable(),
  createdAt: instantSchema,
});
export type PolicyVersionDto = z.infer<typeof policyVersionSchema>;

/** A policy in a list: its products and its current terms (null before the first version). */
export const policySchema = z.object({
  id: idSchema,
  manufacturer: orgRefSchema,
  name: z.string(),
  latestVersionNumber: z.number().int().min(0),
  latestVersion: policyVersionSchema.nullable(),
  models: z.array(z.object({ id: idSchema, modelNumber: z.string(), name: z.string() })),
  createdAt: instantSchema,
  updatedAt: instantSchema,
  version: z.number().int().min(1),
});
export type PolicyDto = z.infer<typeof policySchema>;

/** A policy with every version of its terms, the oldest first. */
export const policyDetailSchema = policySchema.extend({ versions: z.array(policyVersionSchema) });
export type PolicyDetailDto = z.infer<typeof policyDetailSchema>;

// ---------------------------------------------------------------------------------------------------------
// Installations

const serialSchema = str()
  .trim()
  .min(1, 'A serial number or date code cannot be empty.')
  .max(64, 'A serial number or date code has at most 64 characters.')
  .regex(
    /^[A-Za-z0-9][A-Za-z0-9._/-]*$/,
    'Use letters, digits and . _ / - in serial numbers and date codes.',
  );

export const serialsSchema = z
  .array(serialSchema)
  .max(10_000, 'At most 10,000 serial numbers per installation.')
  .superRefine((list, ctx) => {
    const seen = new Set<string>();
    const dup = new Set<string>();
    for (const s of list) {
      const k = s.toUpperCase();
      if (seen.has(k)) dup.add(s);
      seen.add(k);
    }
    if (dup.size) ctx.addIssue({ code: 'custom', message: `Listed twice: ${[...dup].join(', ')}.` });
  });

const conditionFields = {
  location: z.enum(LOCATIONS, { error: 'Pick the location: dry, damp or wet.' }),
  enclosure: z.enum(ENCLOSURES, { error: 'Pick the enclosure: open, enclosed, or enclosed and ventilated.' }),
  dimmer: z.enum(DIMMERS, { error: 'Pick the dimmer: none, phase-cut or 0-10 V.' }),
  nominalSupplyVolts: z
    .literal(NOMINAL_SUPPLY_VOLTS, {
      error: 'Pick a nominal supply: 120, 208, 240, 277, 347 or 480 V.',
    })
    .meta(NOMINAL_VOLTS_META),
  hoursPerDay: num('the hours of use a day', 'h', 0, 24),
  ambientC: num('the ambient temperature', '°C', -50, 80),
};

/** A date code as printed on the label: the manufacturing lot (the failure analysis groups by it). */
export const lotSchema = str({ error: 'A lot (date code) is text.' })
  .trim()
  .min(1, 'A lot (date code) cannot be empty.')
  .max(32, 'A lot (date code) has at most 32 characters.')
  .regex(/^[A-Za-z0-9][A-Za-z0-9._/-]*$/, 'Use letters, digits and . _ / - in a lot (date code).');

const optionalLot = str({ error: 'A lot (date code) is text.' })
  .trim()
  .nullish()
  .transform((v) => (v ? v : null))
  .pipe(lotSchema.nullable());

const DAY_MS = 86_400_000;

/**
 * The latest install date accepted at `now`: the next UTC calendar day. Local dates run from UTC-12 to UTC+14,
 * never more than one day ahead of UTC, so "today" passes wherever the installer stands; later is the future.
 */
export function latestInstallDate(now: Date): string {
  return new Date(now.getTime() + DAY_MS).toISOString().slice(0, 10);
}

export const FUTURE_INSTALL_DATE_MESSAGE =
  'The install date is in the future. Enter the day the fixtures were installed.';

const installDateField = (latest: string | undefined) =>
  latest === undefined
    ? isoDateSchema('the install date')
    : isoDateSchema('the install date').refine((s) => s <= latest, FUTURE_INSTALL_DATE_MESSAGE);

const installationFieldsUpTo = (latest: string | undefined) => ({
  siteName: text('the site name', 160),
  siteAddress: text('the street address', 200),
  siteCity: text('the city', 120),
  siteRegion: text('the state or province', 80),
  sitePostalCode: text('the postal code', 20),
  quantity: num('the quantity', 'units', 1, 100_000, { int: true }),
  serials: serialsSchema,
  installDate: installDateField(latest),
  purchaseDate: isoDateSchema('the purchase date')
    .nullish()
    .transform((v) => v ?? null),
  distributor: optionalText('the distributor', 160),
  invoiceNumber: optionalText('the invoice number', 64),
  lot: optionalLot,
  ...conditionFields,
});

type InstallationCheck = { quantity?: number; serials?: string[] };
function checkInstallation(v: InstallationCheck, ctx: z.RefinementCtx) {
  if (v.quantity !== undefined && v.serials !== undefined && v.serials.length > v.quantity) {
    ctx.addIssue({
      code: 'custom',
      path: ['serials'],
      message: `${v.serials.length} serial numbers for a quantity of ${v.quantity}: list at most one per unit.`,
    });
  }
}

/**
 * The installation payloads. Given the latest install date accepted (`latestInstallDate(clock.now())` on the
 * server, which decides), an install date after it is refused; without one (the demo seed, the form's first
 * check) any calendar date passes.
 */
export function installationSchemas(latest?: string) {
  const fields = installationFieldsUpTo(latest);
  const input = z.strictObject({ productModelId: uuidSchema, ...fields }).superRefine(checkInstallation);
  const update = z
    .strictObject(
      Object.fromEntries(Object.entries(fields).map(([k, v]) => [k, v.optional()])) as {
        [K in keyof typeof fields]: z.ZodOptional<(typeof fields)[K]>;
      },
    )
    .refine((v) => Object.values(v).some((x) => x !== undefined), 'Nothing to change.')
    .superRefine(checkInstallation);
  return { input, update };
}

export const { input: installationInputSchema, update: updateInstallationSchema } = installationSchemas();
export type InstallationInput = z.input<typeof installationInputSchema>;
export type InstallationValues = z.output<typeof installationInputSchema>;
export type UpdateInstallationInput = z.input<typeof updateInstallationSchema>;

export const installationConditionsSchema = z.strictObject(conditionFields);
export type InstallationConditions = z.infer<typeof installationConditionsSchema>;

export const installationListQuerySchema = listQuerySchema.extend({
  sort: z
    .enum([
      'installDate',
      '-installDate',
      'siteName',
      '-siteName',
      'quantity',
      '-quantity',
      'createdAt',
      '-createdAt',
    ])
    .default('-installDate'),
  productModelId: uuidSchema.optional(),
  manufacturerId: uuidSchema.optional(),
  contractorId: uuidSchema.optional(),
  location: z.enum(LOCATIONS).optional(),
  enclosure: z.enum(ENCLOSURES).optional(),
  nominalSupplyVolts: z.coerce.number().pipe(z.literal(NOMINAL_SUPPLY_VOLTS)).optional(),
});
export type InstallationListQuery = z.infer<typeof installationListQuerySchema>;

export const fitWarningSchema = z.object({
  code: z.string(),
  message: z.string(),
  reference: z.string().optional(),
});
export type FitWarning = z.infer<typeof fitWarningSchema>;

/** An installation in a list (installations.presenter.ts). */
export const installationSchema = z.object({
  id: idSchema,
  contractor: orgRefSchema,
  manufacturer: orgRefSchema,
  product: z.object({
    id: idSchema,
    modelNumber: z.string(),
    name: z.string(),
    family: z.enum(PRODUCT_FAMILIES),
  }),
  siteName: z.string(),
  siteAddress: z.string(),
  siteCity: z.string(),
  siteRegion: z.string(),
  sitePostalCode: z.string(),
  quantity: z.number().int().min(1),
  serialCount: z.number().int().min(0),
  installDate: calendarDateSchema,
  purchaseDate: calendarDateSchema.nullable(),
  distributor: z.string().nullable(),
  invoiceNumber: z.string().nullable(),
  lot: z.string().nullable(),
  location: z.enum(LOCATIONS),
  enclosure: z.enum(ENCLOSURES),
  dimmer: z.enum(DIMMERS),
  nominalSupplyVolts: z.literal(NOMINAL_SUPPLY_VOLTS).meta(NOMINAL_VOLTS_META),
  hoursPerDay: z.number(),
  ambientC: z.number(),
  policyVersion: z
    .object({
      id: idSchema,
      policyId: idSchema,
      policyName: z.string(),
      versionNumber: z.number().int().min(1),
      effectiveFrom: calendarDateSchema,
    })
    .nullable(),
  createdAt: instantSchema,
  updatedAt: instantSchema,
  version: z.number().int().min(1),
});
export type InstallationDto = z.infer<typeof installationSchema>;

/** One installation: its serials, the fit warnings of its conditions against the product, the product's ratings. */
export const installationDetailSchema = installationSchema.extend({
  serials: z.array(z.string()),
  fit: z.array(fitWarningSchema),
  productRatings: productSchema,
});
export type InstallationDetailDto = z.infer<typeof installationDetailSchema>;

// ---------------------------------------------------------------------------------------------------------
// History and import

// A record's history (server/lib/history.ts) is one shape everywhere: answer-parts' historyEventSchema.
export { historyEventSchema };
export type HistoryEventDto = z.infer<typeof historyEventSchema>;

export const importRequestSchema = z
  .strictObject({
    csv: str().max(20_000_000, 'The file is larger than 20 MB.').optional(),
    rows: z
      .array(z.record(str(), z.union([str(), z.number(), z.boolean(), z.null()])))
      .max(50_000, 'At most 50,000 rows at once.')
      .optional(),
    /** The spreadsheet row number of the first row sent (the header is row 1), for previews sent in chunks. */
    firstRowNumber: z.number().int().min(2).max(10_000_000).optional(),
  })
  .refine((v) => (v.csv === undefined) !== (v.rows === undefined), 'Send either csv or rows.');
export type ImportRequest = z.infer<typeof importRequestSchema>;

export const importQuerySchema = z.strictObject({
  dryRun: z
    .enum(['true', 'false'])
    .default('false')
    .transform((v) => v === 'true'),
});

export const importRowErrorSchema = z.object({
  row: z.number().int().min(1),
  column: z.string(),
  message: z.string(),
});
export type ImportRowError = z.infer<typeof importRowErrorSchema>;

/** An import's outcome (server/lib/csv-import.ts importResult). */
export const importResultSchema = z.object({
  dryRun: z.boolean(),
  total: z.number().int().min(0),
  valid: z.number().int().min(0),
  invalid: z.number().int().min(0),
  imported: z.number().int().min(0),
  errors: z.array(importRowErrorSchema),
  /** Errors beyond this many are counted, not listed. */
  errorsTruncated: z.boolean(),
});
export type ImportResult = z.infer<typeof importResultSchema>;
