import fc from 'fast-check';
import { describe, expect, it } from 'vitest';

import {
  DIMMERS,
  ENCLOSURES,
  evaluateClaim,
  evaluationInputSchema,
  evaluationSchema,
  FINDING_CODES,
  LOCATIONS,
  safeEvaluateClaim,
  NOMINAL_SUPPLY_VOLTS,
  SYMPTOMS,
  type EvaluationInput,
} from '../../../shared/engine';

const DAY_MS = 86_400_000;
const iso = (ms: number) => new Date(ms).toISOString().slice(0, 10);
const opt = <T>(arb: fc.Arbitrary<T>) => fc.option(arb, { nil: undefined });
const money = fc
  .tuple(fc.integer({ min: 0, max: 100_000 }), fc.integer({ min: 0, max: 99 }))
  .map(([w, c]) => `${w}.${String(c).padStart(2, '0')}`);
const fluxPoints = fc
  .tuple(
    fc.integer({ min: 2, max: 12 }),
    fc.integer({ min: 500, max: 3000 }),
    fc.double({ min: 1e-7, max: 5e-5, noNaN: true }),
  )
  .map(([n, step, alpha]) =>
    Array.from({ length: n }, (_, i) => ({ hours: (i + 1) * step, flux: Math.exp(-alpha * (i + 1) * step) })),
  );

/** Schema-valid inputs by construction: the cross-field rules are built in. */
const validInput: fc.Arbitrary<EvaluationInput> = fc
  .record({
    ledStrings: fc.integer({ min: 1, max: 24 }),
    ledsPerString: fc.integer({ min: 1, max: 40 }),
    vMin: fc.integer({ min: 100, max: 300 }),
    vSpan: fc.integer({ min: 1, max: 400 }),
    term: fc.integer({ min: 1, max: 120 }),
    fullFraction: fc.double({ min: 0, max: 1, noNaN: true }),
    installedMs: fc.integer({ min: Date.UTC(2015, 0, 1), max: Date.UTC(2030, 0, 1) }),
    toFailure: fc.integer({ min: 0, max: 4000 }),
    toFiling: fc.integer({ min: 0, max: 400 }),
    seed: fc.integer(),
  })
  .chain((b) =>
    fc.record({
      product: fc.record({
        ratedInputWatts: fc.double({ min: 1, max: 2000, noNaN: true }),
        inputVoltage: fc.constant({ min: b.vMin, max: b.vMin + b.vSpan }),
        ledStrings: fc.constant(b.ledStrings),
        ledsPerString: fc.constant(b.ledsPerString),
        ledForwardVolts: fc.double({ min: 0.5, max: 12, noNaN: true }),
        driverOutputAmps: fc.double({ min: 0.01, max: 10, noNaN: true }),
        driverMaxOutputVolts: opt(fc.double({ min: 1, max: 600, noNaN: true })),
        location: fc.constantFrom(...LOCATIONS),
        enclosedRated: fc.boolean(),
        dimmable: fc.boolean(),
        ambientMaxC: fc.integer({ min: 0, max: 80 }),
        ratedLifeHours: fc.integer({ min: 1000, max: 200_000 }),
        lumenMaintenance: opt(
          fc.record({
            sampleSize: fc.integer({ min: 1, max: 40 }),
            inServiceCaseTempC: opt(fc.integer({ min: 20, max: 120 })),
            datasets: fc.oneof(
              fc.tuple(fc.record({ caseTempC: fc.constant(85), points: fluxPoints })),
              fc.tuple(
                fc.record({ caseTempC: fc.constant(85), points: fluxPoints }),
                fc.record({
                  caseTempC: fc.constant(55),
                  testHours: fc.integer({ min: 1000, max: 20000 }),
                  B: fc.double({ min: 0.9, max: 1.05, noNaN: true }),
                  alpha: fc.double({ min: -1e-5, max: 1e-4, noNaN: true }),
                }),
              ),
            ),
          }),
        ),
      }),
      policy: fc.record({
        termMonths: fc.constant(b.term),
        fullCoverageMonths: fc.constant(Math.floor(b.term * b.fullFraction)),
        filingWindowDays: fc.integer({ min: 0, max: 365 }),
        darkLedFailurePercent: fc.double({ min: 0.1, max: 100, noNaN: true }),
        unitCredit: money,
        currency: fc.constantFrom('USD', 'CAD', 'EUR'),
        requiredPhotos: fc.integer({ min: 0, max: 5 }),
        proofOfPurchaseRequired: fc.boolean(),
      }),
      installation: fc.record({
        installedOn: fc.constant(iso(b.installedMs)),
        location: fc.constantFrom(...LOCATIONS),
        enclosure: fc.constantFrom(...ENCLOSURES),
        dimmer: fc.constantFrom(...DIMMERS),
        nominalSupplyVolts: fc.constantFrom(...NOMINAL_SUPPLY_VOLTS),
        hoursPerDay: fc.double({ min: 0, max: 24, noNaN: true }),
        ambientC: fc.integer({ min: -30, max: 90 }),
      }),
      claim: fc.record({
        failedOn: fc.constant(iso(b.installedMs + b.toFailure * DAY_MS)),
        filedOn: fc.constant(iso(b.installedMs + (b.toFailure + b.toFiling) * DAY_MS)),
        units: fc.integer({ min: 1, max: 10_000 }),
        symptoms: fc.uniqueArray(fc.constantFrom(...SYMPTOMS), { maxLength: 3 }),
        measurements: opt(
          fc.record(
            {
              supplyVolts: fc.double({ min: 0, max: 1000, noNaN: true }),
              inputWatts: fc.double({ min: 0, max: 3000, noNaN: true }),
              powerFactor: fc.double({ min: 0.01, max: 1, noNaN: true }),
              driverOutputVolts: fc.double({ min: 0, max: 600, noNaN: true }),
              driverOutputAmps: fc.double({ min: 0, max: 10, noNaN: true }),
              lightOutputPercent: fc.double({ min: 0, max: 200, noNaN: true }),
              strings: fc.array(
                fc.record(
                  {
                    volts: fc.double({ min: 0, max: 2000, noNaN: true }),
                    amps: fc.oneof(fc.constant(0), fc.double({ min: 0, max: 5, noNaN: true })),
                    darkLeds: fc.integer({ min: 0, max: b.ledsPerString }),
                  },
                  { requiredKeys: [] },
                ),
                { maxLength: b.ledStrings },
              ),
            },
            { requiredKeys: [] },
          ),
        ),
        observations: opt(
          fc.record(
            {
              debrisIngress: fc.boolean(),
              waterIngress: fc.boolean(),
              physicalDamage: fc.boolean(),
              fanStopped: fc.boolean(),
            },
            { requiredKeys: [] },
          ),
        ),
        evidence: fc.record(
          {
            photos: fc.integer({ min: 0, max: 8 }),
            proofOfPurchase: fc.boolean(),
            serial: fc.string({ maxLength: 20 }),
          },
          { requiredKeys: ['photos', 'proofOfPurchase'] },
        ),
      }),
    }),
  )
  // fc.option leaves `key: undefined`; JSON drops those, and so does the schema's parse.
  .map((input) => JSON.parse(JSON.stringify(input)) as EvaluationInput);

describe('engine properties', () => {
  it('the generator makes schema-valid inputs', () => {
    fc.assert(
      fc.property(validInput, (input) => {
        const r = evaluationInputSchema.safeParse(input);
        if (!r.success) throw new Error(JSON.stringify(r.error.issues));
      }),
      { numRuns: 300 },
    );
  });

  it('never throws on a schema-valid input and answers a schema-valid evaluation', () => {
    fc.assert(
      fc.property(validInput, (input) => {
        const e = evaluateClaim(evaluationInputSchema.parse(input));
        expect(evaluationSchema.safeParse(e).error?.issues ?? []).toEqual([]);
      }),
      { numRuns: 1000 },
    );
  });

  it('keeps coverage within 0-100, the credit never negative and 0.00 whenever excluded', () => {
    fc.assert(
      fc.property(validInput, (input) => {
        const e = evaluateClaim(input);
        expect(e.computed.coveragePercent).toBeGreaterThanOrEqual(0);
        expect(e.computed.coveragePercent).toBeLessThanOrEqual(100);
        expect(e.computed.credit).toMatch(/^\d+\.\d{2}$/);
        if (e.verdict === 'excluded') expect(e.computed.credit).toBe('0.00');
        // never more than the full credit
        const full = Math.round(Number(input.policy.unitCredit) * 100) * input.claim.units;
        expect(Math.round(Number(e.computed.credit) * 100)).toBeLessThanOrEqual(full);
      }),
      { numRuns: 500 },
    );
  });

  it('never counts more dark LEDs than the unit has', () => {
    fc.assert(
      fc.property(validInput, (input) => {
        const e = evaluateClaim(input);
        expect(e.computed.darkLeds).toBeGreaterThanOrEqual(0);
        expect(e.computed.darkLeds).toBeLessThanOrEqual(
          input.product.ledStrings * input.product.ledsPerString,
        );
        expect(e.computed.darkLedPercent).toBeLessThanOrEqual(100);
        for (const s of e.computed.shortedLedsByString)
          if (s !== null) expect(s).toBeLessThanOrEqual(input.product.ledsPerString);
      }),
      { numRuns: 500 },
    );
  });

  it('answers only listed codes; excluded exactly when a finding excludes, review when one asks for review', () => {
    fc.assert(
      fc.property(validInput, (input) => {
        const e = evaluateClaim(input);
        const effects = new Set(e.findings.map((f) => f.effect));
        for (const f of e.findings) expect(FINDING_CODES).toContain(f.code);
        expect(e.verdict).toBe(
          effects.has('exclude') ? 'excluded' : effects.has('review') ? 'review' : 'covered',
        );
      }),
      { numRuns: 300 },
    );
  });

  it('never throws on any JSON at all, valid or not', () => {
    fc.assert(
      fc.property(
        fc.oneof(
          fc.jsonValue(),
          validInput.map((i) => ({ ...i, claim: { ...i.claim, units: 0 } })),
        ),
        (data) => {
          const r = safeEvaluateClaim(data);
          if (!r.ok) expect(r.issues.length).toBeGreaterThan(0);
        },
      ),
      { numRuns: 300 },
    );
  });
});
