import { describe, expect, it } from 'vitest';
import {
  installationInputSchema,
  installationSchemas,
  latestInstallDate,
  policyTermsSchema,
  productInputSchema,
  updateInstallationSchema,
} from '../../../shared/schemas/catalogue';
import { installationPayload, productPayload, termsPayload } from '../../support/catalogue-factories';

const messages = (r: { success: boolean; error?: { issues: { path: PropertyKey[]; message: string }[] } }) =>
  Object.fromEntries((r.error?.issues ?? []).map((i) => [i.path.map(String).join('.'), i.message]));

describe('product model schema', () => {
  it('accepts the ENGINE.md example product', () => {
    expect(productInputSchema.safeParse(productPayload()).success).toBe(true);
  });

  it('names the field, the bound and the unit for out-of-range values', () => {
    const r = productInputSchema.safeParse(
      productPayload({
        ratedInputWatts: 0,
        ledStrings: 2.5,
        ledsPerString: 0,
        ambientMaxC: 120,
        ratedLifeHours: 10,
      }),
    );
    expect(messages(r)).toMatchObject({
      ratedInputWatts: 'The rated input power must be above 0 W.',
      ledStrings: 'The number of LED strings must be a whole number.',
      ledsPerString: 'The number of LEDs per string must be at least 1.',
      ambientMaxC: 'The rated maximum ambient temperature must be at most 100 °C.',
      ratedLifeHours: 'The rated life must be at least 1000 h.',
    });
  });

  it('refuses an input range whose minimum is not below its maximum', () => {
    const r = productInputSchema.safeParse(productPayload({ inputVoltsMin: 277, inputVoltsMax: 120 }));
    expect(messages(r)).toEqual({ inputVoltsMax: 'The highest input voltage must be above the lowest.' });
  });

  it('refuses a driver limit below the string voltage (string voltage = n x Vf, LED application-note practice)', () => {
    // 16 LEDs x 3.0 V = 48 V: a 40 V open-circuit limit could never light the string.
    const r = productInputSchema.safeParse(productPayload({ driverMaxOutputVolts: 40 }));
    expect(messages(r).driverMaxOutputVolts).toBe(
      'The open-circuit limit must be at least the string voltage (16 LEDs x 3 V = 48 V).',
    );
  });

  it('refuses LEDs that would draw more than the rated input (P = V x I; efficiency is below 1)', () => {
    // 48 V x 1.0 A = 48 W > 24 W rated input.
    const r = productInputSchema.safeParse(productPayload({ driverOutputAmps: 1.0 }));
    expect(messages(r).driverOutputAmps).toMatch(/48 W .* more than the rated input power of 24 W/);
  });

  it('is strict: unknown keys are refused', () => {
    expect(productInputSchema.safeParse({ ...productPayload(), manufacturerId: 'x' }).success).toBe(false);
  });
});

describe('policy terms schema', () => {
  it('keeps money as two-decimal strings and currency as an ISO 4217 code', () => {
    const r = policyTermsSchema.parse(termsPayload({ unitCredit: '96', currency: 'cad' }));
    expect(r.unitCredit).toBe('96.00');
    expect(r.currency).toBe('CAD');
  });

  it('refuses a full-coverage period longer than the term, bad money and a zero threshold', () => {
    const r = policyTermsSchema.safeParse(
      termsPayload({
        fullCoverageMonths: 72,
        unitCredit: '96.005',
        darkLedFailurePercent: 0,
        currency: 'US',
      }),
    );
    expect(messages(r)).toMatchObject({
      fullCoverageMonths: 'The full-coverage period cannot be longer than the term.',
      unitCredit: 'Enter the unit credit as an amount like "96.00" (at most two decimals).',
      darkLedFailurePercent: 'The failure threshold must be above 0 % of LEDs dark.',
      currency: 'Use a three-letter ISO 4217 currency code like USD or CAD.',
    });
  });

  it('refuses an impossible calendar date', () => {
    expect(
      messages(policyTermsSchema.safeParse(termsPayload({ effectiveFrom: '2024-02-30' }))).effectiveFrom,
    ).toBe('The effective date is not a calendar date.');
  });
});

describe('installation schema', () => {
  const id = '11111111-1111-4111-8111-111111111111';
  it('refuses more serials than units and a serial listed twice', () => {
    expect(
      messages(
        installationInputSchema.safeParse(installationPayload(id, { quantity: 1, serials: ['A1', 'B2'] })),
      ).serials,
    ).toBe('2 serial numbers for a quantity of 1: list at most one per unit.');
    expect(
      messages(installationInputSchema.safeParse(installationPayload(id, { serials: ['A1', 'a1'] }))).serials,
    ).toBe('Listed twice: a1.');
  });

  it('offers only the nominal supplies the engine knows (120, 208, 240, 277, 347, 480 V)', () => {
    const r = installationInputSchema.safeParse(installationPayload(id, { nominalSupplyVolts: 230 as 240 }));
    expect(messages(r).nominalSupplyVolts).toBe('Pick a nominal supply: 120, 208, 240, 277, 347 or 480 V.');
  });

  it('needs something to change in a patch', () => {
    expect(updateInstallationSchema.safeParse({}).success).toBe(false);
    expect(updateInstallationSchema.safeParse({ hoursPerDay: 25 }).success).toBe(false);
  });
});

describe('the latest install date', () => {
  const id = '00000000-0000-4000-8000-000000000001';

  it('is the next UTC day, so that today passes in every time zone (UTC-12 to UTC+14, from memory: IANA tz database)', () => {
    expect(latestInstallDate(new Date('2026-12-02T00:00:00Z'))).toBe('2026-12-03');
    expect(latestInstallDate(new Date('2026-12-02T23:59:59Z'))).toBe('2026-12-03');
    // At 10:00 UTC it is already the 3rd at UTC+14 and still the 1st at UTC-12 (the 2nd minus 22 h).
    expect(latestInstallDate(new Date('2026-12-02T10:00:00Z'))).toBe('2026-12-03');
    // Month and year ends roll over as calendar dates do.
    expect(latestInstallDate(new Date('2026-12-31T18:00:00Z'))).toBe('2027-01-01');
    expect(latestInstallDate(new Date('2028-02-28T12:00:00Z'))).toBe('2028-02-29'); // 2028 is a leap year (Gregorian rule)
  });

  it('bounds the install date only when given, with a message on the field', () => {
    const { input, update } = installationSchemas('2026-12-03');
    expect(input.safeParse(installationPayload(id, { installDate: '2026-12-03' })).success).toBe(true);
    expect(messages(input.safeParse(installationPayload(id, { installDate: '2026-12-04' })))).toEqual({
      installDate: 'The install date is in the future. Enter the day the fixtures were installed.',
    });
    expect(messages(update.safeParse({ installDate: '2027-01-01' })).installDate).toMatch(/in the future/);
    expect(
      installationInputSchema.safeParse(installationPayload(id, { installDate: '2099-01-01' })).success,
    ).toBe(true);
  });
});
