import { formatMeterNumber, parseMeterNumber, type AmpUnit } from '../../../../shared/claims/meter-number';
import {
  claimFieldsSchema,
  OBSERVATIONS,
  type ClaimDetailDto,
  type ClaimFields,
  type ClaimFieldsInput,
  type FilingIssue,
  type ObservationKey,
  type Symptom,
} from '../../../../shared/schemas/claims';

// The form holds what the user typed (text, as a meter shows it); the API takes numbers in base units. These
// two functions go between them, and the resolver checks the result with the very schema the server uses.

export type StringRow = { volts: string; amps: string; darkLeds: string };
export type ClaimFormValues = {
  serials: string[];
  units: string;
  failedOn: string;
  symptoms: Symptom[];
  measurements: {
    supplyVolts: string;
    inputWatts: string;
    powerFactor: string;
    driverOutputVolts: string;
    driverOutputAmps: string;
    strings: StringRow[];
  };
  observations: Record<ObservationKey, boolean>;
  narrative: string;
};
export type ReadingUnits = { driverOutputAmps: AmpUnit; stringAmps: AmpUnit };
export const DEFAULT_UNITS: ReadingUnits = { driverOutputAmps: 'A', stringAmps: 'mA' };

/** Rows shown in the per-string table: one per string of the product, up to a screenful of them. */
export const MAX_STRING_ROWS = 48;

export function valuesFromClaim(c: ClaimDetailDto, units: ReadingUnits): ClaimFormValues {
  const m = c.measurements ?? {};
  const rows = Math.min(c.engineContext.product.ledStrings, MAX_STRING_ROWS);
  return {
    serials: c.serials,
    units: c.units ? String(c.units) : '',
    failedOn: c.failedOn ?? '',
    symptoms: c.symptoms,
    measurements: {
      supplyVolts: formatMeterNumber(m.supplyVolts, 'V'),
      inputWatts: formatMeterNumber(m.inputWatts, 'W'),
      powerFactor: formatMeterNumber(m.powerFactor),
      driverOutputVolts: formatMeterNumber(m.driverOutputVolts, 'V'),
      driverOutputAmps: formatMeterNumber(m.driverOutputAmps, units.driverOutputAmps),
      strings: Array.from({ length: rows }, (_, i) => {
        const s = m.strings?.[i] ?? {};
        return {
          volts: formatMeterNumber(s.volts, 'V'),
          amps: formatMeterNumber(s.amps, units.stringAmps),
          darkLeds: s.darkLeds === undefined ? '' : String(s.darkLeds),
        };
      }),
    },
    observations: Object.fromEntries(OBSERVATIONS.map((k) => [k, c.observations?.[k] ?? false])) as Record<
      ObservationKey,
      boolean
    >,
    narrative: c.narrative,
  };
}

/** Typed text to API fields. Text that is not a number is left out of the fields and reported by path. */
export function fieldsFromValues(
  v: ClaimFormValues,
  units: ReadingUnits,
): { fields: ClaimFieldsInput; issues: FilingIssue[] } {
  const issues: FilingIssue[] = [];
  const num = (path: string, text: string, unit: Parameters<typeof parseMeterNumber>[1] = '') => {
    const r = parseMeterNumber(text, unit);
    if (r.ok) return r.value;
    if (!r.empty) issues.push({ path, message: r.message });
    return undefined;
  };
  const strings = v.measurements.strings.map((s, i) => {
    const p = `measurements.strings.${i}`;
    const out: { volts?: number; amps?: number; darkLeds?: number } = {};
    const volts = num(`${p}.volts`, s.volts, 'V');
    const amps = num(`${p}.amps`, s.amps, units.stringAmps);
    const dark = num(`${p}.darkLeds`, s.darkLeds);
    if (volts !== undefined) out.volts = volts;
    if (amps !== undefined) out.amps = amps;
    if (dark !== undefined) out.darkLeds = dark;
    return out;
  });
  while (strings.length && Object.keys(strings[strings.length - 1]).length === 0) strings.pop();
  const measurements: NonNullable<ClaimFieldsInput['measurements']> = {};
  const put = (
    k: 'supplyVolts' | 'inputWatts' | 'powerFactor' | 'driverOutputVolts' | 'driverOutputAmps',
    unit: Parameters<typeof parseMeterNumber>[1],
  ) => {
    const x = num(`measurements.${k}`, v.measurements[k], unit);
    if (x !== undefined) measurements[k] = x;
  };
  put('supplyVolts', 'V');
  put('inputWatts', 'W');
  put('powerFactor', '');
  put('driverOutputVolts', 'V');
  put('driverOutputAmps', units.driverOutputAmps);
  if (strings.length) measurements.strings = strings;
  const unitsCount = num('units', v.units);
  return {
    fields: {
      serials: v.serials,
      ...(unitsCount !== undefined ? { units: unitsCount } : {}),
      failedOn: v.failedOn || null,
      symptoms: v.symptoms,
      measurements,
      observations: v.observations,
      narrative: v.narrative,
    },
    issues,
  };
}

/** The fields checked by the shared schema: the typed-text problems first, then the schema's, each by path. */
export function checkValues(
  v: ClaimFormValues,
  units: ReadingUnits,
): { fields: ClaimFields | null; input: ClaimFieldsInput; issues: FilingIssue[] } {
  const { fields, issues } = fieldsFromValues(v, units);
  const parsed = claimFieldsSchema.safeParse(fields);
  if (parsed.success) return { fields: parsed.data, input: fields, issues };
  const schemaIssues = parsed.error.issues.map((i) => ({
    path: i.path.map(String).join('.'),
    message: i.message,
  }));
  return { fields: null, input: fields, issues: [...issues, ...schemaIssues] };
}
