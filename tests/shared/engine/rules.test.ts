import { describe, expect, it } from 'vitest';

import { evaluateClaim, evaluationSchema, type Evaluation } from '../../../shared/engine';
import { makeInput } from './factory';

const codes = (e: Evaluation) => e.findings.map((f) => f.code);
const get = (e: Evaluation, code: string) => e.findings.find((f) => f.code === code);

describe('coverage', () => {
  it('ages the unit in whole months and its hours as days x hours a day', () => {
    const e = evaluateClaim(makeInput());
    expect(e.computed.ageMonths).toBe(16); // ENGINE.md: whole calendar months completed
    expect(e.computed.operatingHours).toBe(512 * 12); // ENGINE.md: days between x hours a day
  });

  it('covers 100 % below the full-coverage months', () => {
    const e = evaluateClaim(makeInput({ claim: { failedOn: '2027-01-14', filedOn: '2027-01-20' } }));
    expect(e.computed.ageMonths).toBe(35);
    expect(e.computed.coveragePercent).toBe(100);
    expect(e.computed.credit).toBe('192.00');
    expect(codes(e)).toContain('coverage.full_coverage');
  });

  it('prorates linearly between the full-coverage months and the term', () => {
    const at36 = evaluateClaim(makeInput({ claim: { failedOn: '2027-01-15', filedOn: '2027-01-20' } }));
    expect(at36.computed.ageMonths).toBe(36);
    expect(at36.computed.coveragePercent).toBe(100); // 100 x (60 - 36) / (60 - 36)
    expect(codes(at36)).toContain('coverage.prorated');
    const at40 = evaluateClaim(makeInput({ claim: { failedOn: '2027-05-20', filedOn: '2027-05-21' } }));
    expect(at40.computed.ageMonths).toBe(40);
    expect(at40.computed.coveragePercent).toBe(83.33); // 100 x 20 / 24
    expect(at40.computed.credit).toBe('160.00'); // 19200 x 20 / 24 = 16000 cents
    const at59 = evaluateClaim(makeInput({ claim: { failedOn: '2028-12-15', filedOn: '2028-12-16' } }));
    expect(at59.computed.coveragePercent).toBe(4.17); // 100 x 1 / 24
    expect(at59.computed.credit).toBe('8.00'); // 19200 / 24 = 800 cents
  });

  it('rounds the credit half up to cents from integer cents', () => {
    // 33.35 x 1 unit x 23/24 = 31.960416.. -> 31.96; 0.01 x 1 x 12/24 = 0.005 -> 0.01
    const a = evaluateClaim(
      makeInput({
        policy: { unitCredit: '33.35' },
        claim: { units: 1, failedOn: '2027-02-15', filedOn: '2027-02-16' },
      }),
    );
    expect(a.computed.ageMonths).toBe(37);
    expect(a.computed.credit).toBe('31.96');
    const b = evaluateClaim(
      makeInput({
        policy: { unitCredit: '0.01' },
        claim: { units: 1, failedOn: '2028-01-15', filedOn: '2028-01-16' },
      }),
    );
    expect(b.computed.ageMonths).toBe(48);
    expect(b.computed.credit).toBe('0.01');
  });

  it('excludes at and past the term with 0 % coverage and a credit of 0.00', () => {
    const e = evaluateClaim(makeInput({ claim: { failedOn: '2029-01-15', filedOn: '2029-01-20' } }));
    expect(e.computed.ageMonths).toBe(60);
    expect(e.computed.coveragePercent).toBe(0);
    expect(e.verdict).toBe('excluded');
    expect(e.computed.credit).toBe('0.00');
    expect(get(e, 'coverage.past_term')).toMatchObject({
      severity: 'fail',
      effect: 'exclude',
      category: 'coverage',
    });
    const dayBefore = evaluateClaim(makeInput({ claim: { failedOn: '2029-01-14', filedOn: '2029-01-20' } }));
    expect(dayBefore.computed.ageMonths).toBe(59);
    expect(codes(dayBefore)).not.toContain('coverage.past_term');
  });

  it('sends a claim filed after the window to review', () => {
    const onTime = evaluateClaim(makeInput({ claim: { failedOn: '2025-06-10', filedOn: '2025-09-08' } }));
    expect(onTime.computed.daysToFiling).toBe(90);
    expect(codes(onTime)).toContain('coverage.filed_in_window');
    expect(onTime.verdict).toBe('covered');
    const late = evaluateClaim(makeInput({ claim: { failedOn: '2025-06-10', filedOn: '2025-09-09' } }));
    expect(get(late, 'coverage.filed_late')).toMatchObject({ severity: 'warn', effect: 'review' });
    expect(late.verdict).toBe('review');
  });
});

describe('qualification', () => {
  it('qualifies on dark LEDs at the policy share, or the dark or cycling symptom', () => {
    // 20 of 192 = 10.4 % >= 10 %: one open string (16) plus 4 seen dark
    const byLeds = evaluateClaim(
      makeInput({
        claim: {
          symptoms: ['partly_dark'],
          measurements: { strings: [{ amps: 0 }, { amps: 0.036, darkLeds: 4 }] },
        },
      }),
    );
    expect(byLeds.computed.darkLeds).toBe(20);
    expect(byLeds.computed.darkLedPercent).toBe(10.42);
    expect(byLeds.computed.qualifies).toBe(true);
    expect(byLeds.verdict).toBe('covered');
    // 24 of 192 = exactly 12.5 % reaches a 12.5 % policy; 23 does not
    const exactly = (seen: number) =>
      evaluateClaim(
        makeInput({
          policy: { darkLedFailurePercent: 12.5 },
          claim: { symptoms: [], measurements: { strings: [{ amps: 0 }, { amps: 0.04, darkLeds: seen }] } },
        }),
      ).computed;
    expect(exactly(8)).toMatchObject({ darkLeds: 24, darkLedPercent: 12.5, qualifies: true });
    expect(exactly(7)).toMatchObject({ darkLeds: 23, qualifies: false });
    const cycling = evaluateClaim(makeInput({ claim: { symptoms: ['cycling'] } }));
    expect(cycling.computed.qualifies).toBe(true);
    const dark = evaluateClaim(makeInput({ claim: { symptoms: ['dark'] } }));
    expect(dark.computed.qualifies).toBe(true);
  });

  it('sends a failure that does not qualify to review', () => {
    const e = evaluateClaim(
      makeInput({
        claim: { symptoms: ['flicker'], measurements: { strings: [{ amps: 0.036, darkLeds: 3 }] } },
      }),
    );
    expect(e.computed.qualifies).toBe(false);
    expect(get(e, 'coverage.failure_not_qualified')).toMatchObject({ effect: 'review' });
    expect(e.verdict).toBe('review');
    expect(e.computed.credit).toBe('192.00');
  });
});

describe('application exclusions', () => {
  it('excludes a fixture in a wetter location than rated (NEC 410.10(A))', () => {
    // NFPA 70 (NEC) Article 100 and 410.10(A): a wet location needs a wet-marked luminaire
    const wetInDamp = evaluateClaim(
      makeInput({ installation: { location: 'wet' }, product: { location: 'damp' } }),
    );
    expect(get(wetInDamp, 'application.location_wetter_than_rated')).toMatchObject({
      severity: 'fail',
      effect: 'exclude',
      reference: 'NFPA 70 (NEC) Article 100 and 410.10(A)',
    });
    expect(wetInDamp.verdict).toBe('excluded');
    // NFPA 70 (NEC) 410.10(A): a damp location accepts damp- or wet-marked luminaires
    for (const rated of ['damp', 'wet'] as const) {
      const e = evaluateClaim(
        makeInput({ installation: { location: 'damp' }, product: { location: rated } }),
      );
      expect(codes(e)).not.toContain('application.location_wetter_than_rated');
    }
    const dampInDry = evaluateClaim(
      makeInput({ installation: { location: 'damp' }, product: { location: 'dry' } }),
    );
    expect(dampInDry.verdict).toBe('excluded'); // NFPA 70 (NEC) Article 100: damp is wetter than dry
    const wetInWet = evaluateClaim(
      makeInput({ installation: { location: 'wet' }, product: { location: 'wet' } }),
    );
    expect(wetInWet.verdict).toBe('covered');
  });

  it('excludes a lamp without an enclosed rating in a totally enclosed fixture, not a ventilated one', () => {
    const e = evaluateClaim(
      makeInput({ installation: { enclosure: 'enclosed' }, product: { enclosedRated: false } }),
    );
    expect(get(e, 'application.enclosed_not_rated')?.effect).toBe('exclude');
    expect(e.verdict).toBe('excluded');
    const ventilated = evaluateClaim(
      makeInput({ installation: { enclosure: 'enclosed_ventilated' }, product: { enclosedRated: false } }),
    );
    expect(ventilated.verdict).toBe('covered');
    const rated = evaluateClaim(
      makeInput({ installation: { enclosure: 'enclosed' }, product: { enclosedRated: true } }),
    );
    expect(rated.verdict).toBe('covered');
  });

  it('excludes any dimmer on a non-dimmable product', () => {
    for (const dimmer of ['phase', '0-10v'] as const) {
      const e = evaluateClaim(makeInput({ installation: { dimmer }, product: { dimmable: false } }));
      expect(get(e, 'application.dimmer_on_non_dimmable')?.effect).toBe('exclude');
      const ok = evaluateClaim(makeInput({ installation: { dimmer }, product: { dimmable: true } }));
      expect(ok.verdict).toBe('covered');
    }
  });

  it('excludes a nominal supply outside the input range', () => {
    const e = evaluateClaim(
      makeInput({ installation: { nominalSupplyVolts: 480 }, claim: { measurements: { supplyVolts: 480 } } }),
    );
    expect(get(e, 'application.supply_outside_rating')).toMatchObject({
      effect: 'exclude',
      values: { nominalSupplyVolts: 480 },
    });
    for (const nominal of [120, 208, 240, 277] as const) {
      const ok = evaluateClaim(
        makeInput({
          installation: { nominalSupplyVolts: nominal },
          claim: { measurements: { supplyVolts: nominal } },
        }),
      );
      expect(ok.verdict).toBe('covered');
    }
  });

  it('excludes an ambient above the rated maximum (the maximum itself is fine)', () => {
    expect(evaluateClaim(makeInput({ installation: { ambientC: 45 } })).verdict).toBe('covered');
    const e = evaluateClaim(makeInput({ installation: { ambientC: 46 } }));
    expect(get(e, 'application.ambient_above_rating')?.effect).toBe('exclude');
  });

  it('answers one pass when installed as rated', () => {
    expect(get(evaluateClaim(makeInput()), 'application.matches_rating')?.severity).toBe('pass');
  });
});

describe('service voltage (ANSI C84.1 Table 1, values from memory)', () => {
  it('grades the reading Range A, Range B or outside', () => {
    const a = evaluateClaim(makeInput({ claim: { measurements: { supplyVolts: 118 } } }));
    expect(a.computed.serviceVoltageRange).toBe('A'); // ANSI C84.1 Table 1 (values from memory): 120 V A 114-126
    expect(get(a, 'application.service_voltage_range_a')?.reference).toBe('ANSI C84.1, Table 1');
    const b = evaluateClaim(makeInput({ claim: { measurements: { supplyVolts: 127 } } }));
    expect(b.computed.serviceVoltageRange).toBe('B'); // ANSI C84.1 Table 1 (values from memory): 120 V B 110-127
    expect(get(b, 'application.service_voltage_range_b')?.severity).toBe('info');
    const out = evaluateClaim(makeInput({ claim: { measurements: { supplyVolts: 131 } } }));
    expect(out.computed.serviceVoltageRange).toBe('outside'); // ANSI C84.1 Table 1 (values from memory)
    const f = get(out, 'application.service_voltage_outside')!;
    expect(f.severity).toBe('warn');
    expect(f.message).toBe(
      'The supply reads 131 V; this fixture is rated 120-277 V, and 131 V is outside ANSI C84.1 Range B (110-127 V) for a 120 V service. Have the service checked before replacing the unit.',
    );
    expect(out.verdict).toBe('covered'); // a finding for the reviewer, not an exclusion in ENGINE.md
  });

  it('answers null with no reading, and null on a 347 V service', () => {
    expect(
      evaluateClaim(makeInput({ claim: { measurements: { supplyVolts: undefined } } })).computed
        .serviceVoltageRange,
    ).toBeNull();
    const e = evaluateClaim(
      makeInput({
        product: { inputVoltage: { min: 347, max: 480 } },
        installation: { nominalSupplyVolts: 347 },
        claim: { measurements: { supplyVolts: 350 } },
      }),
    );
    expect(e.computed.serviceVoltageRange).toBeNull(); // no 347 V range on file (documented)
    expect(codes(e)).toContain('application.service_voltage_no_range');
  });
});

describe('electrical', () => {
  it('computes driver output power, efficiency and the input deviation', () => {
    const e = evaluateClaim(makeInput());
    expect(e.computed.driverOutputWatts).toBe(19.448); // P = V x I (physics)
    expect(e.computed.driverEfficiency).toBe(0.8276); // efficiency = output / input (physics)
    expect(e.computed.inputPowerDeviationPercent).toBe(-2.08); // (23.5 - 24) / 24 x 100
  });

  it('sends an impossible reading (output above input, efficiency above 1) to review', () => {
    const e = evaluateClaim(makeInput({ claim: { measurements: { inputWatts: 15 } } }));
    expect(e.computed.driverEfficiency).toBeGreaterThan(1);
    expect(get(e, 'electrical.reading_impossible')?.effect).toBe('review');
    expect(e.verdict).toBe('review');
    const zeroIn = evaluateClaim(makeInput({ claim: { measurements: { inputWatts: 0 } } }));
    expect(zeroIn.computed.driverEfficiency).toBeNull();
    expect(codes(zeroIn)).toContain('electrical.reading_impossible'); // output with nothing in
  });

  it('judges efficiency on the unrounded ratio: 0.004 % more out than in is impossible, though it shows 1', () => {
    // 40.0 V x 0.50002 A = 20.0008 W out of 20.0 W in: ratio 1.00004 (physics: output / input), which rounds
    // to 1.0000 at four decimals. A driver cannot put out more than it draws, however little more.
    const e = evaluateClaim(
      makeInput({
        claim: { measurements: { inputWatts: 20, driverOutputVolts: 40, driverOutputAmps: 0.50002 } },
      }),
    );
    expect(e.computed.driverEfficiency).toBe(1); // presented rounded to 4 decimals
    expect(codes(e)).toContain('electrical.reading_impossible');
    expect(codes(e)).not.toContain('electrical.driver_efficiency');
    // Exactly equal (40.0 V x 0.5 A = 20.0 W of 20.0 W) is possible, if unlikely: 100 %.
    const equal = evaluateClaim(
      makeInput({
        claim: { measurements: { inputWatts: 20, driverOutputVolts: 40, driverOutputAmps: 0.5 } },
      }),
    );
    expect(codes(equal)).toContain('electrical.driver_efficiency');
  });

  it('notes input power more than 10 % off the rating', () => {
    expect(codes(evaluateClaim(makeInput({ claim: { measurements: { inputWatts: 26.4 } } })))).not.toContain(
      'electrical.input_power_off_rating',
    );
    const low = evaluateClaim(
      makeInput({ claim: { measurements: { inputWatts: 12, driverOutputVolts: undefined } } }),
    );
    expect(get(low, 'electrical.input_power_off_rating')?.values.inputPowerDeviationPercent).toBe(-50);
  });

  it('notes a power factor under 0.9', () => {
    // DesignLights Consortium technical requirements: PF >= 0.9 (from memory)
    const low = evaluateClaim(makeInput({ claim: { measurements: { powerFactor: 0.85 } } }));
    expect(get(low, 'electrical.power_factor_low')).toMatchObject({ severity: 'info', effect: 'none' });
    expect(codes(evaluateClaim(makeInput({ claim: { measurements: { powerFactor: 0.9 } } })))).not.toContain(
      'electrical.power_factor_low',
    );
  });

  it('analyses strings: shorted LEDs from the voltage deficit, open strings from zero current, current share', () => {
    const e = evaluateClaim(
      makeInput({
        claim: {
          measurements: {
            strings: [
              { volts: 48.0, amps: 0.0367 },
              { volts: 45.0, amps: 0.04 },
              { amps: 0 },
              { volts: 41.5, amps: 0.0367, darkLeds: 1 },
              { volts: 52, amps: 0.0367 },
              { darkLeds: 3 },
            ],
          },
        },
      }),
    );
    expect(e.computed.expectedStringVolts).toBe(48);
    expect(e.computed.shortedLedsByString).toEqual([0, 1, null, 2, 0, null]); // round((48 - 41.5) / 3) = 2
    expect(e.computed.currentShareByString).toEqual([1, 1.09, 0, 1, 1, null]);
    // dark: 0 + 1 + 16 (open) + max(1 seen, 2 shorted) + 0 + 3 seen = 22
    expect(e.computed.darkLeds).toBe(22);
    expect(e.computed.darkLedPercent).toBe(11.46);
    expect(codes(e)).toEqual(
      expect.arrayContaining([
        'electrical.string_open',
        'electrical.string_shorted_leds',
        'electrical.string_voltage_high',
      ]),
    );
    expect(get(e, 'electrical.string_shorted_leds')?.values).toMatchObject({
      strings: '2 and 4',
      shortedLeds: 3,
    });
  });

  it('flags a string far above its share, notes one far below, and passes even strings', () => {
    const e = evaluateClaim(
      makeInput({ claim: { measurements: { strings: [{ amps: 0.06 }, { amps: 0.02 }] } } }),
    );
    expect(get(e, 'electrical.string_overcurrent')?.values.maxCurrentShare).toBe(1.64);
    expect(get(e, 'electrical.string_undercurrent')?.values.minCurrentShare).toBe(0.55);
    const even = evaluateClaim(
      makeInput({
        claim: {
          measurements: {
            strings: [
              { amps: 0.0367, volts: 48 },
              { amps: 0.0367, volts: 47.5 },
            ],
          },
        },
      }),
    );
    expect(codes(even)).toContain('electrical.strings_normal');
  });

  it('never counts more shorted LEDs than the string holds', () => {
    const e = evaluateClaim(makeInput({ claim: { measurements: { strings: [{ volts: 0, amps: 0.04 }] } } }));
    expect(e.computed.shortedLedsByString).toEqual([16]);
  });
});

describe('evidence and observations', () => {
  it('sends missing photos and a missing required proof of purchase to review', () => {
    const photos = evaluateClaim(makeInput({ claim: { evidence: { photos: 1 } } }));
    expect(get(photos, 'evidence.photos_missing')?.effect).toBe('review');
    const proof = evaluateClaim(makeInput({ claim: { evidence: { proofOfPurchase: false } } }));
    expect(get(proof, 'evidence.proof_of_purchase_missing')?.effect).toBe('review');
    const notRequired = evaluateClaim(
      makeInput({
        policy: { proofOfPurchaseRequired: false },
        claim: { evidence: { proofOfPurchase: false } },
      }),
    );
    expect(notRequired.verdict).toBe('covered');
    expect(get(evaluateClaim(makeInput()), 'evidence.complete')?.severity).toBe('pass');
  });

  it('notes a missing serial without changing the verdict', () => {
    const e = evaluateClaim(makeInput({ claim: { evidence: { serial: undefined } } }));
    expect(get(e, 'evidence.serial_missing')?.effect).toBe('none');
    expect(e.verdict).toBe('covered');
  });

  it.each([
    ['debrisIngress', 'evidence.debris_ingress'],
    ['waterIngress', 'evidence.water_ingress'],
    ['physicalDamage', 'evidence.physical_damage'],
    ['fanStopped', 'evidence.fan_stopped'],
  ] as const)('sends %s to review', (key, code) => {
    const e = evaluateClaim(makeInput({ claim: { observations: { [key]: true } } }));
    expect(get(e, code)?.effect).toBe('review');
    expect(e.verdict).toBe('review');
  });
});

describe('life', () => {
  it('sends a unit at or past its rated life to review', () => {
    const at = evaluateClaim(makeInput({ product: { ratedLifeHours: 6144 } }));
    expect(get(at, 'life.past_rated_life')?.effect).toBe('review');
    const under = evaluateClaim(makeInput({ product: { ratedLifeHours: 6145 } }));
    expect(codes(under)).toContain('life.within_rated_life');
    expect(under.verdict).toBe('covered');
  });
});

describe('verdict', () => {
  it('ranks excluded over review over covered, and zeroes the credit only when excluded', () => {
    const both = evaluateClaim(
      makeInput({ installation: { ambientC: 50 }, claim: { evidence: { photos: 0 } } }),
    );
    expect(both.verdict).toBe('excluded');
    expect(both.computed.credit).toBe('0.00');
    const review = evaluateClaim(makeInput({ claim: { evidence: { photos: 0 } } }));
    expect(review.verdict).toBe('review');
    expect(review.computed.credit).toBe('192.00');
    const covered = evaluateClaim(makeInput());
    expect(covered.verdict).toBe('covered');
    expect(covered.computed.credit).toBe('192.00');
  });

  it('answers the engine version and an output that matches its schema', () => {
    const e = evaluateClaim(makeInput());
    expect(e.engineVersion).toMatch(/^\d+\.\d+\.\d+$/);
    expect(evaluationSchema.safeParse(e).success).toBe(true);
    for (const f of e.findings) expect(f.code.startsWith(`${f.category}.`)).toBe(true);
  });

  it('is deterministic', () => {
    expect(JSON.stringify(evaluateClaim(makeInput()))).toBe(JSON.stringify(evaluateClaim(makeInput())));
  });
});
