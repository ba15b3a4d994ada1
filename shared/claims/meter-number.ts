// Numbers as a meter or a person in the field writes them: "118,4", " 0.44 ", "350 mA", "1.2e-1". Pure, for
// the claim form (as the user types), the CSV batch import and the server's tests alike.

export type AmpUnit = 'A' | 'mA';
export type VoltUnit = 'V' | 'mV';
export type MeterUnit = AmpUnit | VoltUnit | 'W' | '';

export type MeterParse = { ok: true; value: number } | { ok: false; empty: boolean; message: string };

const SCALE: Record<string, number> = { a: 1, ma: 0.001, v: 1, mv: 0.001, w: 1, kw: 1000 };

/**
 * Parses one reading. A decimal comma or point is accepted ("0,44" = "0.44"); a thousands separator is not
 * (a meter never shows one, and "1,234" would be ambiguous). The text may end with its own unit ("350 mA"),
 * which wins over `unit`, the unit chosen beside the field. Answers the value in base units (A, V, W).
 */
export function parseMeterNumber(text: string, unit: MeterUnit = ''): MeterParse {
  const s = text.trim().replace(/\s+/g, ' ');
  if (s === '') return { ok: false, empty: true, message: 'Empty.' };
  const m = /^([+-]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:[eE][+-]?\d+)?)\s*([a-zA-Z]{1,2})?$/.exec(s);
  if (!m)
    return {
      ok: false,
      empty: false,
      message: `"${s}" is not a number. Type the digits the meter shows, like 118.4 or 118,4.`,
    };
  const digits = m[1].replace(',', '.');
  const suffix = (m[2] ?? '').toLowerCase();
  const chosen = unit.toLowerCase();
  let factor = 1;
  if (suffix) {
    const f = SCALE[suffix];
    // The suffix must be the same kind of unit as the field: "mA" in a volts field is a typo worth telling.
    if (f === undefined || (chosen && suffix.slice(-1) !== chosen.slice(-1))) {
      return {
        ok: false,
        empty: false,
        message: `"${m[2]}" is not a unit for this reading${unit ? ` (${unitKind(unit)})` : ''}.`,
      };
    }
    factor = f;
  } else if (chosen) {
    factor = SCALE[chosen] ?? 1;
  }
  const value = Number(digits) * factor;
  if (!Number.isFinite(value)) return { ok: false, empty: false, message: `"${s}" is not a number.` };
  // Scaling by 0.001 in binary floating point leaves tails (350 * 0.001 = 0.35000000000000003): trim them.
  return { ok: true, value: Number(value.toPrecision(12)) };
}

function unitKind(unit: MeterUnit) {
  if (unit === 'A' || unit === 'mA') return 'amps';
  if (unit === 'V' || unit === 'mV') return 'volts';
  return 'watts';
}

/** A stored base-unit value written back for a field showing `unit` (0.35 A in mA → "350"). */
export function formatMeterNumber(value: number | null | undefined, unit: MeterUnit = ''): string {
  if (value === null || value === undefined) return '';
  const f = SCALE[unit.toLowerCase()] ?? 1;
  return String(Number((value / f).toPrecision(12)));
}
