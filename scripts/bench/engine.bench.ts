// npm run bench:engine
// Evaluations per second on one core for a realistic mix of claims, beside the cost of the schema
// validation alone on the same inputs. Prints figures; asserts nothing.
import { evaluateClaim, evaluationInputSchema, type EvaluationInput } from '../../shared/engine';

const SECONDS = Number(process.env.BENCH_SECONDS ?? 1.5);

// A small deterministic PRNG (mulberry32) so every run times the same mix.
function prng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const rand = prng(20240115);
const pick = <T>(items: readonly T[]): T => items[Math.floor(rand() * items.length)];
const between = (min: number, max: number) => min + rand() * (max - min);
const int = (min: number, max: number) => Math.floor(between(min, max + 1));
const pad = (n: number) => String(n).padStart(2, '0');
function dateAfter(year: number, month: number, day: number, days: number): string {
  // Only the benchmark's set-up uses Date; the engine never does.
  const d = new Date(Date.UTC(year, month - 1, day) + days * 86_400_000);
  return `${d.getUTCFullYear()}-${pad(d.getUTCMonth() + 1)}-${pad(d.getUTCDate())}`;
}

const MODELS = [
  {
    ratedInputWatts: 24,
    strings: 12,
    perString: 16,
    vf: 3.0,
    amps: 0.44,
    maxV: 56,
    location: 'damp',
    life: 50000,
  }, // corn lamp
  {
    ratedInputWatts: 150,
    strings: 8,
    perString: 24,
    vf: 2.9,
    amps: 2.1,
    maxV: 80,
    location: 'wet',
    life: 100000,
  }, // high-bay
  {
    ratedInputWatts: 40,
    strings: 4,
    perString: 20,
    vf: 3.1,
    amps: 0.9,
    maxV: 70,
    location: 'wet',
    life: 60000,
  }, // wall pack
  {
    ratedInputWatts: 32,
    strings: 6,
    perString: 18,
    vf: 2.95,
    amps: 0.6,
    maxV: 60,
    location: 'dry',
    life: 50000,
  }, // troffer
] as const;

function makeClaim(): unknown {
  const m = pick(MODELS);
  const year = int(2019, 2024);
  const month = int(1, 12);
  const day = int(1, 28);
  const toFailure = int(10, 2000);
  const highVoltage = rand() < 0.15;
  const nominal =
    rand() < 0.03 ? 480 : highVoltage ? pick([347, 480] as const) : pick([120, 120, 208, 277, 277] as const);
  const withStrings = rand() < 0.6;
  const strings = withStrings
    ? Array.from({ length: int(1, m.strings) }, () => {
        const r = rand();
        if (r < 0.1) return { amps: 0 };
        const shorted = r < 0.3 ? int(1, 3) : 0;
        return {
          volts: Number(((m.perString - shorted) * m.vf + between(-0.5, 0.5)).toFixed(1)),
          amps: Number(((m.amps / m.strings) * between(0.9, shorted ? 1.6 : 1.1)).toFixed(4)),
          darkLeds: shorted,
        };
      })
    : undefined;
  const outV = Number((m.perString * m.vf * between(0.9, 1.05)).toFixed(1));
  const input = {
    product: {
      ratedInputWatts: m.ratedInputWatts,
      inputVoltage: highVoltage ? { min: 347, max: 480 } : { min: 120, max: 277 },
      ledStrings: m.strings,
      ledsPerString: m.perString,
      ledForwardVolts: m.vf,
      driverOutputAmps: m.amps,
      driverMaxOutputVolts: m.maxV,
      location: m.location,
      enclosedRated: rand() < 0.8,
      dimmable: rand() < 0.85,
      ambientMaxC: pick([40, 45, 50, 55]),
      ratedLifeHours: m.life,
      ...(rand() < 0.15
        ? {
            lumenMaintenance: {
              sampleSize: pick([10, 20, 25]),
              inServiceCaseTempC: int(60, 80),
              datasets: [
                {
                  caseTempC: 85,
                  points: [5000, 6000, 7000, 8000, 9000, 10000].map((h, i) => ({
                    hours: h,
                    flux: 0.975 - 0.004 * i,
                  })),
                },
                { caseTempC: 55, testHours: 10000, B: 0.995, alpha: 1e-6 },
              ],
            },
          }
        : {}),
    },
    policy: {
      termMonths: pick([60, 60, 120]),
      fullCoverageMonths: pick([24, 36]),
      filingWindowDays: 90,
      darkLedFailurePercent: 10,
      unitCredit: pick(['96.00', '189.50', '42.25']),
      currency: 'USD',
      requiredPhotos: 2,
      proofOfPurchaseRequired: rand() < 0.7,
    },
    installation: {
      installedOn: dateAfter(year, month, day, 0),
      location: rand() < 0.93 ? 'dry' : pick(['damp', 'wet'] as const),
      enclosure: pick(['open', 'open', 'open', 'enclosed', 'enclosed_ventilated'] as const),
      dimmer: pick(['none', 'none', 'none', 'phase', '0-10v'] as const),
      nominalSupplyVolts: nominal,
      hoursPerDay: pick([10, 12, 16, 24]),
      ambientC: int(15, 47),
    },
    claim: {
      failedOn: dateAfter(year, month, day, toFailure),
      filedOn: dateAfter(year, month, day, toFailure + int(0, 120)),
      units: int(1, 40),
      symptoms: [pick(['dark', 'partly_dark', 'cycling', 'flicker', 'dim'] as const)],
      measurements:
        rand() < 0.85
          ? {
              supplyVolts: Number((nominal * between(0.9, 1.08)).toFixed(1)),
              inputWatts: Number((m.ratedInputWatts * between(0.5, 1.1)).toFixed(1)),
              powerFactor: Number(between(0.8, 0.99).toFixed(2)),
              driverOutputVolts: outV,
              driverOutputAmps: Number((m.amps * between(0.95, 1.02)).toFixed(3)),
              ...(rand() < 0.2 ? { lightOutputPercent: int(70, 100) } : {}),
              ...(strings ? { strings } : {}),
            }
          : undefined,
      observations: {
        debrisIngress: rand() < 0.05,
        waterIngress: rand() < 0.05,
        physicalDamage: rand() < 0.03,
        fanStopped: false,
      },
      evidence: {
        photos: int(0, 5),
        proofOfPurchase: rand() < 0.9,
        serial: rand() < 0.9 ? `LP-${int(1000, 9999)}` : undefined,
      },
    },
  };
  return JSON.parse(JSON.stringify(input));
}

const raw: unknown[] = [];
const parsed: EvaluationInput[] = [];
while (parsed.length < 2000) {
  const data = makeClaim();
  const r = evaluationInputSchema.safeParse(data);
  if (r.success) {
    raw.push(data);
    parsed.push(r.data);
  }
}

let sink = 0;
function time(label: string, op: (i: number) => void): number {
  for (let i = 0; i < 20_000; i++) op(i % raw.length); // warm up the JIT
  const budget = BigInt(Math.round(SECONDS * 1e9));
  const start = process.hrtime.bigint();
  let n = 0;
  let elapsed = 0n;
  do {
    for (let k = 0; k < 1000; k++) op(n++ % raw.length);
    elapsed = process.hrtime.bigint() - start;
  } while (elapsed < budget);
  const perSecond = n / (Number(elapsed) / 1e9);
  const micros = Number(elapsed) / 1e3 / n;
  console.log(
    `${label.padEnd(36)} ${Math.round(perSecond).toLocaleString('en-US').padStart(10)} /s   ${micros.toFixed(2).padStart(7)} µs each`,
  );
  return micros;
}

const verdicts = { covered: 0, review: 0, excluded: 0 };
for (const input of parsed) verdicts[evaluateClaim(input).verdict]++;
console.log(
  `engine benchmark: ${parsed.length} distinct claims (${verdicts.covered} covered, ${verdicts.review} review, ${verdicts.excluded} excluded), ${SECONDS} s a measurement, one core`,
);

const validate = time('schema validation (safeParse)', (i) => {
  sink += evaluationInputSchema.safeParse(raw[i]).success ? 1 : 0;
});
const evaluate = time('evaluateClaim (validated input)', (i) => {
  sink += evaluateClaim(parsed[i]).findings.length;
});
const both = time('safeParse + evaluateClaim', (i) => {
  const r = evaluationInputSchema.safeParse(raw[i]);
  if (r.success) sink += evaluateClaim(r.data).findings.length;
});
console.log(
  `evaluateClaim costs ${(evaluate / validate).toFixed(2)}x the validation; validate + evaluate ${(both / validate).toFixed(2)}x`,
);
if (sink === -1) console.log(sink);
