import { finding, num, plural, runRules, stringList, type Rule, type RuleContext } from '../finding';
import type { Finding } from '../schema';

// Electrical: input power against the rating, the driver's output and efficiency, power factor, and the
// per-string analysis (expected voltage, shorted and open LEDs, current share).

export const DLC_POWER_FACTOR = 'DesignLights Consortium technical requirements (power factor at least 0.9)';
/** Power factor below which a commercial luminaire is flagged (DesignLights Consortium, from memory). */
export const MIN_POWER_FACTOR = 0.9;
/** Input power this far off the rating, in per cent, is worth a note (common practice). */
export const INPUT_POWER_TOLERANCE_PERCENT = 10;
/** A string carrying more than this share of its current holds shorted or bridged LEDs (common practice). */
export const OVERCURRENT_SHARE = 1.25;
/** A string carrying less than this share (but some) is starved (common practice). */
export const UNDERCURRENT_SHARE = 0.75;
/** A driver output within this fraction of its open-circuit limit is at the limit (common practice). */
export const VOLTAGE_LIMIT_FRACTION = 0.95;

/** Efficiency above 1 (output above input) means a reading is wrong; otherwise report the efficiency. */
// computed.driverEfficiency is the ratio rounded to 4 decimals for people; the judgement uses the exact ratio.
export const driverEfficiencyRule: Rule = ({ input, computed, driverEfficiencyExact }) => {
  const m = input.claim.measurements;
  const outWatts = computed.driverOutputWatts;
  if (m === undefined || outWatts === null || m.inputWatts === undefined) return null;
  const inWatts = m.inputWatts;
  const values = {
    driverOutputVolts: m.driverOutputVolts ?? null,
    driverOutputAmps: m.driverOutputAmps ?? null,
    driverOutputWatts: outWatts,
    inputWatts: inWatts,
    driverEfficiency: computed.driverEfficiency,
  };
  // Judged on the unrounded ratio: an output 0.004 % above the input rounds to 1.0000 but is still impossible.
  if (driverEfficiencyExact === null || driverEfficiencyExact > 1) {
    return finding(
      'electrical.reading_impossible',
      'electrical',
      'warn',
      'review',
      `The driver's output (${num(m.driverOutputVolts ?? 0)} V x ${num(m.driverOutputAmps ?? 0, 3)} A = ${num(outWatts)} W) is more than the fixture draws (${num(inWatts)} W). A driver cannot put out more than it takes in: check the meter and the reading.`,
      values,
    );
  }
  return finding(
    'electrical.driver_efficiency',
    'electrical',
    'pass',
    'none',
    `The driver delivers ${num(outWatts)} W (${num(m.driverOutputVolts ?? 0)} V x ${num(m.driverOutputAmps ?? 0, 3)} A) from ${num(inWatts)} W in: ${num((computed.driverEfficiency ?? 0) * 100, 0)} % efficient, ${num(inWatts - outWatts)} W lost in the driver.`,
    values,
  );
};

/** Input power far from the rating (low: dark strings or a failing driver; high: a fault or a misreading). */
export const inputPowerRule: Rule = ({ input, computed }) => {
  const deviation = computed.inputPowerDeviationPercent;
  const watts = input.claim.measurements?.inputWatts;
  if (deviation === null || watts === undefined || Math.abs(deviation) <= INPUT_POWER_TOLERANCE_PERCENT)
    return null;
  const rated = input.product.ratedInputWatts;
  return finding(
    'electrical.input_power_off_rating',
    'electrical',
    'info',
    'none',
    `The fixture draws ${num(watts)} W against ${num(rated)} W rated (${deviation > 0 ? '+' : ''}${num(deviation)} %). ${deviation < 0 ? 'Low power often means dark strings or a driver in protection.' : 'More than rated points to a driver fault or a misreading.'}`,
    { inputWatts: watts, ratedInputWatts: rated, inputPowerDeviationPercent: deviation },
  );
};

/** Power factor below 0.9. */
export const powerFactorRule: Rule = ({ input }) => {
  const pf = input.claim.measurements?.powerFactor;
  if (pf === undefined || pf >= MIN_POWER_FACTOR) return null;
  return finding(
    'electrical.power_factor_low',
    'electrical',
    'info',
    'none',
    `The power factor reads ${num(pf, 2)}; commercial luminaires are expected to hold at least ${MIN_POWER_FACTOR}. A low reading can mean a failing driver input stage, or a meter reading taken at a dimmed level.`,
    { powerFactor: pf, minPowerFactor: MIN_POWER_FACTOR },
    DLC_POWER_FACTOR,
  );
};

/** Driver output at its open-circuit limit: an open LED somewhere, the driver in protection (it cycles). */
export const driverVoltageLimitRule: Rule = ({ input }) => {
  const limit = input.product.driverMaxOutputVolts;
  const volts = input.claim.measurements?.driverOutputVolts;
  if (limit === undefined || volts === undefined || volts < VOLTAGE_LIMIT_FRACTION * limit) return null;
  return finding(
    'electrical.driver_at_voltage_limit',
    'electrical',
    'warn',
    'none',
    `The driver output reads ${num(volts)} V, at its ${num(limit)} V limit: an open LED or string is pushing the constant-current driver into protection, which makes the fixture cycle on and off.`,
    {
      driverOutputVolts: volts,
      driverMaxOutputVolts: limit,
      expectedStringVolts: input.product.ledsPerString * input.product.ledForwardVolts,
    },
  );
};

function stringIndexes(ctx: RuleContext, test: (i: number) => boolean): number[] {
  const n = ctx.computed.currentShareByString.length;
  const out: number[] = [];
  for (let i = 0; i < n; i++) if (test(i)) out.push(i);
  return out;
}

/** Strings carrying no current: open, every LED on them dark. */
export const openStringRule: Rule = (ctx) => {
  const strings = ctx.input.claim.measurements?.strings;
  if (strings === undefined) return null;
  const open = stringIndexes(ctx, (i) => strings[i].amps === 0);
  if (open.length === 0) return null;
  const leds = ctx.input.product.ledsPerString;
  return finding(
    'electrical.string_open',
    'electrical',
    'warn',
    'none',
    `${plural(open.length, 'String', 'Strings')} ${stringList(open)} ${plural(open.length, 'carries', 'carry')} no current: open, with all ${leds} LEDs on ${plural(open.length, 'it', 'each')} dark. One open LED breaks its whole string.`,
    { openStrings: open.length, ledsPerString: leds, darkLedsFromOpenStrings: open.length * leds },
  );
};

/** Strings carrying far more than their share of the driver's current: shorted or bridged LEDs. */
export const stringOvercurrentRule: Rule = (ctx) => {
  const shares = ctx.computed.currentShareByString;
  const high = stringIndexes(ctx, (i) => (shares[i] ?? 0) > OVERCURRENT_SHARE);
  if (high.length === 0) return null;
  let max = 0;
  for (const i of high) if ((shares[i] as number) > max) max = shares[i] as number;
  const shareMilliamps = (ctx.input.product.driverOutputAmps / ctx.input.product.ledStrings) * 1000;
  return finding(
    'electrical.string_overcurrent',
    'electrical',
    'warn',
    'none',
    `${plural(high.length, 'String', 'Strings')} ${stringList(high)} ${plural(high.length, 'carries', 'carry')} up to ${num(max, 2)} times its share of the driver current (${num(shareMilliamps)} mA a string): shorted or bridged LEDs lower a string's voltage and it takes more than its share, which wears its remaining LEDs faster.`,
    {
      strings: stringList(high),
      maxCurrentShare: max,
      shareMilliamps: Number(shareMilliamps.toFixed(2)),
      overcurrentShare: OVERCURRENT_SHARE,
    },
  );
};

/** Strings carrying well under their share, but some current. */
export const stringUndercurrentRule: Rule = (ctx) => {
  const shares = ctx.computed.currentShareByString;
  const low = stringIndexes(ctx, (i) => {
    const s = shares[i];
    return s !== null && s > 0 && s < UNDERCURRENT_SHARE;
  });
  if (low.length === 0) return null;
  let min = Infinity;
  for (const i of low) if ((shares[i] as number) < min) min = shares[i] as number;
  return finding(
    'electrical.string_undercurrent',
    'electrical',
    'info',
    'none',
    `${plural(low.length, 'String', 'Strings')} ${stringList(low)} ${plural(low.length, 'carries', 'carry')} as little as ${num(min, 2)} of its share of the driver current: a high-resistance LED or joint on it, or other strings taking more than their share.`,
    { strings: stringList(low), minCurrentShare: min, undercurrentShare: UNDERCURRENT_SHARE },
  );
};

/** Strings reading below the expected voltage by whole LEDs: shorted LEDs. */
export const shortedLedsRule: Rule = (ctx) => {
  const shorted = ctx.computed.shortedLedsByString;
  const idx = stringIndexes(ctx, (i) => (shorted[i] ?? 0) > 0);
  if (idx.length === 0) return null;
  let total = 0;
  for (const i of idx) total += shorted[i] as number;
  const { ledsPerString, ledForwardVolts } = ctx.input.product;
  return finding(
    'electrical.string_shorted_leds',
    'electrical',
    'warn',
    'none',
    `${plural(idx.length, 'String', 'Strings')} ${stringList(idx)} ${plural(idx.length, 'reads', 'read')} short of the expected ${num(ctx.computed.expectedStringVolts)} V (${ledsPerString} LEDs x ${num(ledForwardVolts, 2)} V): about ${total} shorted ${plural(total, 'LED', 'LEDs')} in all, each one lowering its string by one LED's voltage.`,
    {
      strings: stringList(idx),
      shortedLeds: total,
      expectedStringVolts: ctx.computed.expectedStringVolts,
      ledForwardVolts,
    },
  );
};

/** Strings reading more than one LED's voltage above expected: a partly failed, high-resistance LED. */
export const stringVoltageHighRule: Rule = (ctx) => {
  const strings = ctx.input.claim.measurements?.strings;
  if (strings === undefined) return null;
  const { ledForwardVolts } = ctx.input.product;
  const expected = ctx.computed.expectedStringVolts;
  const high = stringIndexes(ctx, (i) => {
    const v = strings[i].volts;
    return strings[i].amps !== 0 && v !== undefined && v - expected > ledForwardVolts;
  });
  if (high.length === 0) return null;
  let max = 0;
  for (const i of high) if ((strings[i].volts as number) > max) max = strings[i].volts as number;
  return finding(
    'electrical.string_voltage_high',
    'electrical',
    'info',
    'none',
    `${plural(high.length, 'String', 'Strings')} ${stringList(high)} ${plural(high.length, 'reads', 'read')} up to ${num(max)} V against ${num(expected)} V expected: a partly failed LED can drop several volts on its own before it opens.`,
    { strings: stringList(high), maxStringVolts: max, expectedStringVolts: expected },
  );
};

export const electricalPowerRules: readonly Rule[] = [
  inputPowerRule,
  driverEfficiencyRule,
  powerFactorRule,
  driverVoltageLimitRule,
];
export const electricalStringRules: readonly Rule[] = [
  openStringRule,
  shortedLedsRule,
  stringOvercurrentRule,
  stringUndercurrentRule,
  stringVoltageHighRule,
];

export function electricalFindings(ctx: RuleContext, out: Finding[]): void {
  runRules(electricalPowerRules, ctx, out);
  const before = out.length;
  runRules(electricalStringRules, ctx, out);
  const strings = ctx.input.claim.measurements?.strings;
  if (out.length === before && strings !== undefined && strings.length > 0) {
    out.push(
      finding(
        'electrical.strings_normal',
        'electrical',
        'pass',
        'none',
        `The ${strings.length} measured ${plural(strings.length, 'string reads', 'strings read')} normal: no open string, no shorted LEDs, current shared evenly.`,
        { measuredStrings: strings.length, expectedStringVolts: ctx.computed.expectedStringVolts },
      ),
    );
  }
}
