import {
  DIMMING_LABELS,
  FAMILY_LABELS,
  LOCATION_LABELS,
  type ProductDto,
} from '../../../../shared/schemas/catalogue';

export const n = (v: number, digits = 2) => v.toLocaleString('en-US', { maximumFractionDigits: digits });

/** The ratings of a product as label and value with units, for a detail list. */
export function ratingRows(p: ProductDto): [string, string][] {
  return [
    ['Family', FAMILY_LABELS[p.family]],
    ['Rated input power', `${n(p.ratedInputWatts)} W`],
    ['Input voltage', `${n(p.inputVoltsMin)}–${n(p.inputVoltsMax)} V`],
    ['Rated light output', `${n(p.ratedLumens, 0)} lm`],
    ['LED array', `${p.ledStrings} strings × ${p.ledsPerString} LEDs`],
    [
      'Nominal forward voltage',
      `${n(p.ledForwardVolts)} V per LED (string ${n(p.ledsPerString * p.ledForwardVolts)} V)`,
    ],
    ['Driver output current', `${n(p.driverOutputAmps, 3)} A`],
    [
      'Driver open-circuit limit',
      p.driverMaxOutputVolts === null ? 'Not given' : `${n(p.driverMaxOutputVolts)} V`,
    ],
    ['Location rating', LOCATION_LABELS[p.location]],
    ['Totally enclosed luminaires', p.enclosedRated ? 'Rated' : 'Not rated'],
    ['Dimming', DIMMING_LABELS[p.dimming]],
    ['Rated ambient maximum', `${n(p.ambientMaxC)} °C`],
    ['Rated life', `${n(p.ratedLifeHours, 0)} h`],
    ['Active cooling', p.activeCooling ? 'Yes (fan)' : 'No'],
  ];
}
