import { versionInForce } from '../../../shared/catalogue/policy-version';
import type { Dimmer, Enclosure, RatedLocation } from '../../../shared/schemas/catalogue';
import type { ClaimObservations, ClaimStage, Symptom, WaitingOn } from '../../../shared/schemas/claims';

// The reliability story of the demo, as plain rows from a seeded PRNG (the same rows every run for the same
// "today"): about three years of installations of every model, each unit failing at a Weibull-drawn age, so
// that the charts have something to say. Every name, lot and number is invented.
//   - Aldercrest AC-HB150-D, lot ACH2502: a weak LED lot (many early string failures, shape near 1).
//   - Veltra VL-WP80-W in enclosed fixtures: the driver cooks (wear-out after about 3 years), open ones last.
//   - Aldercrest AC-CL54-E39 corn lamps (fan-cooled) outdoors: insects in the fan.
// The demo seed (demo-reliability.ts) and the large generator (scripts/generate-large.ts) both use it.

export type StoryModel = {
  id: string;
  manufacturerId: string;
  modelNumber: string;
  location: RatedLocation;
  enclosedRated: boolean;
  dimming: string;
  ambientMaxC: number;
  inputVoltsMin: number;
  inputVoltsMax: number;
  activeCooling: boolean;
};

export type StoryVersion = { id: string; effectiveFrom: string; versionNumber: number };

export type StoryInstallation = {
  id: string;
  contractorId: string;
  manufacturerId: string;
  productModelId: string;
  policyVersionId: string | null;
  installDate: string;
  quantity: number;
  lot: string;
  location: RatedLocation;
  enclosure: Enclosure;
  dimmer: Dimmer;
  nominalSupplyVolts: number;
  hoursPerDay: number;
  ambientC: number;
  siteIndex: number;
};

export type StoryClaim = {
  installation: StoryInstallation;
  failedOn: string;
  filedOn: string;
  units: number;
  symptoms: Symptom[];
  observations: ClaimObservations;
  mode: 'weak_lot' | 'enclosed_driver' | 'insects' | 'wear';
};

export function prng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const DAY = 86_400_000;
export const addDaysIso = (iso: string, days: number) =>
  new Date(Date.parse(`${iso}T00:00:00Z`) + Math.round(days) * DAY).toISOString().slice(0, 10);
const daysBetweenIso = (a: string, b: string) =>
  Math.round((Date.parse(`${b}T00:00:00Z`) - Date.parse(`${a}T00:00:00Z`)) / DAY);
const MONTH_DAYS = 30.4375;

/** A stable fake uuid from the PRNG: the same story gives the same ids. */
export function storyUuid(rand: () => number): string {
  const hex = Array.from({ length: 32 }, () => Math.floor(rand() * 16).toString(16)).join('');
  return `${hex.slice(0, 8)}-${hex.slice(8, 12)}-4${hex.slice(13, 16)}-a${hex.slice(17, 20)}-${hex.slice(20, 32)}`;
}

type Life = { shape: number; scale: number; mode: StoryClaim['mode'] };

/** Each installation's life model in months: the story's three problems, and ordinary wear for the rest. */
function lifeOf(
  model: StoryModel,
  inst: Pick<StoryInstallation, 'lot' | 'enclosure' | 'location'>,
  scaleFactor: number,
): Life {
  if (inst.lot === 'ACH2502') return { shape: 1.1, scale: 45 * scaleFactor, mode: 'weak_lot' };
  if (model.modelNumber === 'VL-WP80-W' && inst.enclosure === 'enclosed')
    return { shape: 3.2, scale: 38 * scaleFactor, mode: 'enclosed_driver' };
  if (model.activeCooling && inst.location !== 'dry')
    return { shape: 2.0, scale: 70 * scaleFactor, mode: 'insects' };
  return { shape: 1.7, scale: 520 * scaleFactor, mode: 'wear' };
}

function claimLooks(
  mode: StoryClaim['mode'],
  rand: () => number,
): Pick<StoryClaim, 'symptoms' | 'observations'> {
  if (mode === 'weak_lot')
    return { symptoms: rand() < 0.8 ? ['partly_dark'] : ['partly_dark', 'flicker'], observations: {} };
  if (mode === 'enclosed_driver')
    return {
      symptoms: rand() < 0.6 ? ['cycling'] : ['dark'],
      observations: rand() < 0.2 ? { burnMarks: true } : {},
    };
  if (mode === 'insects')
    return {
      symptoms: rand() < 0.7 ? ['fan_noise', 'dim'] : ['dark'],
      observations: { debrisIngress: true, fanStopped: rand() < 0.6 },
    };
  const r = rand();
  if (r < 0.45) return { symptoms: ['dark'], observations: {} };
  if (r < 0.7) return { symptoms: ['flicker'], observations: {} };
  if (r < 0.85) return { symptoms: ['dim'], observations: {} };
  if (r < 0.93) return { symptoms: ['partly_dark'], observations: {} };
  return { symptoms: ['other'], observations: { waterIngress: true } };
}

export type StoryOptions = {
  /** The last day of the story: nothing is installed, fails or is filed after it. */
  today: string;
  months: number;
  /** Installations per model per month, and their quantity range. */
  perMonth: number;
  quantity: [number, number];
  /** Below 1 makes everything fail sooner (the large mode's 100,000 claims). */
  scaleFactor: number;
  seed: number;
};

export function generateStory(
  models: readonly StoryModel[],
  versionsByModel: Map<string, StoryVersion[]>,
  contractorIds: readonly string[],
  opts: StoryOptions,
): { installations: StoryInstallation[]; claims: StoryClaim[] } {
  const rand = prng(opts.seed);
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(rand() * xs.length)];
  const installations: StoryInstallation[] = [];
  const claims: StoryClaim[] = [];
  const [y, m] = opts.today.split('-').map(Number);
  for (const model of models) {
    const supplies = [120, 208, 240, 277, 347, 480].filter(
      (v) => v >= model.inputVoltsMin && v <= model.inputVoltsMax,
    );
    const locations: RatedLocation[] =
      model.location === 'wet'
        ? ['dry', 'damp', 'wet']
        : model.location === 'damp'
          ? ['dry', 'damp']
          : ['dry'];
    for (let k = opts.months; k >= 1; k--) {
      const index = y * 12 + (m - 1) - k;
      const year = Math.floor(index / 12);
      const month = (index % 12) + 1;
      const made = index - 1; // made the month before it was installed
      const dateCode = `${String(Math.floor(made / 12) % 100).padStart(2, '0')}${String((made % 12) + 1).padStart(2, '0')}`;
      const prefix = model.modelNumber.replace(/[^A-Z]/g, '').slice(0, 3);
      for (let n = 0; n < opts.perMonth; n++) {
        const day = 1 + Math.floor(rand() * 27);
        const installDate = `${year}-${String(month).padStart(2, '0')}-${String(day).padStart(2, '0')}`;
        if (installDate > opts.today) continue;
        // The weak lot was shipped over three months.
        const weak =
          model.modelNumber === 'AC-HB150-D' &&
          index >= 2025 * 12 + 2 &&
          index <= 2025 * 12 + 4 &&
          n % 2 === 0;
        const enclosure: Enclosure = model.enclosedRated
          ? pick(['open', 'enclosed', 'enclosed', 'enclosed_ventilated'] as const)
          : pick(['open', 'open', 'enclosed_ventilated'] as const);
        const inst: StoryInstallation = {
          id: storyUuid(rand),
          contractorId: contractorIds[n % contractorIds.length],
          manufacturerId: model.manufacturerId,
          productModelId: model.id,
          policyVersionId:
            versionInForce<StoryVersion>(versionsByModel.get(model.id) ?? [], addDaysIso(installDate, -14))
              ?.id ?? null, // bought two weeks before
          installDate,
          quantity: opts.quantity[0] + Math.floor(rand() * (opts.quantity[1] - opts.quantity[0] + 1)),
          lot: weak ? 'ACH2502' : `${prefix}${dateCode}`,
          location: pick(locations),
          enclosure,
          dimmer:
            model.dimming === 'none'
              ? 'none'
              : model.dimming === 'phase'
                ? pick(['none', 'phase'] as const)
                : pick(['none', '0-10v'] as const),
          nominalSupplyVolts: pick(supplies),
          hoursPerDay: pick([10, 12, 16, 18, 24]),
          ambientC: Math.round(10 + rand() * Math.max(5, model.ambientMaxC - 15)),
          siteIndex: Math.floor(rand() * 1000),
        };
        installations.push(inst);
        const life = lifeOf(model, inst, opts.scaleFactor);
        const ageMonths = daysBetweenIso(installDate, opts.today) / MONTH_DAYS;
        const pFail = 1 - Math.exp(-Math.pow(ageMonths / life.scale, life.shape));
        let u = 0;
        while (u < inst.quantity) {
          // Neighbouring units of one site often go together: a claim names 1 to 3 units.
          const units = Math.min(inst.quantity - u, rand() < 0.8 ? 1 : 2 + Math.floor(rand() * 2));
          u += units;
          if (rand() >= pFail) continue;
          // Inverse of F, conditional on failing before today.
          const q = rand() * pFail;
          const t = life.scale * Math.pow(-Math.log1p(-q), 1 / life.shape);
          const failedOn = addDaysIso(installDate, t * MONTH_DAYS);
          const filedOn = addDaysIso(failedOn, 2 + Math.floor(rand() * 25));
          if (filedOn > opts.today || failedOn > opts.today) continue;
          claims.push({
            installation: inst,
            failedOn,
            filedOn,
            units,
            mode: life.mode,
            ...claimLooks(life.mode, rand),
          });
        }
      }
    }
  }
  return { installations, claims };
}

/** Where a claim filed on `filedOn` stands on `today`, given the engine's verdict; and when it was decided. */
export function stageFor(
  verdict: 'covered' | 'excluded' | 'review',
  filedOn: string,
  today: string,
  rand: () => number,
): { stage: ClaimStage; waitingOn: WaitingOn | null; decidedOn: string | null } {
  const age = daysBetweenIso(filedOn, today);
  const decidedOn = addDaysIso(filedOn, 6 + Math.floor(rand() * 14));
  if (age <= 5) return { stage: 'filed', waitingOn: 'manufacturer', decidedOn: null };
  if (age <= 20)
    return rand() < 0.25
      ? { stage: 'needs_info', waitingOn: 'contractor', decidedOn: null }
      : { stage: 'in_review', waitingOn: 'manufacturer', decidedOn: null };
  if (verdict === 'excluded')
    return { stage: rand() < 0.7 ? 'denied' : 'closed', waitingOn: null, decidedOn };
  if (age <= 40) return { stage: 'approved', waitingOn: 'manufacturer', decidedOn };
  return { stage: verdict === 'covered' && rand() < 0.3 ? 'closed' : 'credited', waitingOn: null, decidedOn };
}
