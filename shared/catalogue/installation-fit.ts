import type { RuleContext } from '../engine/finding';
import { applicationExclusionRules } from '../engine/rules/application';
import type { EvaluationInput } from '../engine/schema';
import type { Dimming, FitWarning, InstallationConditions, ProductDto } from '../schemas/catalogue';

// The install conditions against the product's ratings, as the installer types. The rules are the
// evaluation engine's own application rules (shared/engine/rules/application.ts), so the form, the record and
// a later claim screening always agree; only the dimmer-method check below is added here, because the engine
// knows "dimmable" but not how.

export type FitProduct = Pick<
  ProductDto,
  | 'ratedInputWatts'
  | 'inputVoltsMin'
  | 'inputVoltsMax'
  | 'ledStrings'
  | 'ledsPerString'
  | 'ledForwardVolts'
  | 'driverOutputAmps'
  | 'location'
  | 'enclosedRated'
  | 'dimming'
  | 'ambientMaxC'
  | 'ratedLifeHours'
>;

/** The engine's `product` from a catalogue entry. */
export function engineProduct(p: FitProduct): EvaluationInput['product'] {
  return {
    ratedInputWatts: p.ratedInputWatts,
    inputVoltage: { min: p.inputVoltsMin, max: p.inputVoltsMax },
    ledStrings: p.ledStrings,
    ledsPerString: p.ledsPerString,
    ledForwardVolts: p.ledForwardVolts,
    driverOutputAmps: p.driverOutputAmps,
    location: p.location,
    enclosedRated: p.enclosedRated,
    dimmable: p.dimming !== 'none',
    ambientMaxC: p.ambientMaxC,
    ratedLifeHours: p.ratedLifeHours,
  };
}

const METHOD_TEXT: Record<Exclude<Dimming, 'none'>, string> = {
  phase: 'phase-cut dimmers only',
  '0-10v': '0-10 V dimmers only',
  'phase_or_0-10v': 'phase-cut or 0-10 V dimmers',
};

/**
 * Plain-language warnings for conditions that do not fit the product's ratings; an empty list when they fit.
 * Saving is still allowed: the record is what was installed.
 */
export function checkInstallationFit(product: FitProduct, conditions: InstallationConditions): FitWarning[] {
  // The application exclusion rules read only input.product and input.installation.
  const ctx = {
    input: {
      product: engineProduct(product),
      installation: { installedOn: '2000-01-01', ...conditions },
    },
  } as unknown as RuleContext;
  const out: FitWarning[] = [];
  for (const rule of applicationExclusionRules) {
    const f = rule(ctx);
    if (f)
      out.push(
        f.reference
          ? { code: f.code, message: f.message, reference: f.reference }
          : { code: f.code, message: f.message },
      );
  }
  const { dimmer } = conditions;
  if (
    dimmer !== 'none' &&
    product.dimming !== 'none' &&
    product.dimming !== 'phase_or_0-10v' &&
    product.dimming !== dimmer
  ) {
    out.push({
      code: 'application.dimmer_method_mismatch',
      message: `A ${dimmer === 'phase' ? 'phase-cut' : '0-10 V'} dimmer is on the circuit, but this product dims with ${METHOD_TEXT[product.dimming]}.`,
    });
  }
  return out;
}
