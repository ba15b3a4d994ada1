import { describe, expect, it } from 'vitest';
import { checkInstallationFit } from '../../../shared/catalogue/installation-fit';
import { coverageDate, versionInForce } from '../../../shared/catalogue/policy-version';
import type { InstallationConditions } from '../../../shared/schemas/catalogue';
import { productPayload } from '../../support/catalogue-factories';

const product = { ...productPayload(), driverMaxOutputVolts: 56 } as Parameters<
  typeof checkInstallationFit
>[0];
const fits: InstallationConditions = {
  location: 'dry',
  enclosure: 'open',
  dimmer: 'none',
  nominalSupplyVolts: 277,
  hoursPerDay: 12,
  ambientC: 25,
};
const codes = (c: Partial<InstallationConditions>, p = product) =>
  checkInstallationFit(p, { ...fits, ...c }).map((w) => w.code);

describe('installation fit (the engine application rules, live in the form)', () => {
  it('says nothing when the conditions fit the ratings', () => {
    expect(checkInstallationFit(product, fits)).toEqual([]);
  });

  // NFPA 70 (NEC) Article 100 and 410.10(A): a wet location needs a wet-marked luminaire; a damp location
  // accepts damp- or wet-marked ones.
  it('warns when the location is wetter than rated (NFPA 70 (NEC) 410.10(A))', () => {
    expect(codes({ location: 'damp' })).toEqual([]); // damp-rated product in a damp location
    const [w] = checkInstallationFit(product, { ...fits, location: 'wet' });
    expect(w.code).toBe('application.location_wetter_than_rated');
    expect(w.reference).toBe('NFPA 70 (NEC) Article 100 and 410.10(A)');
    expect(w.message).toMatch(/wet location, but this fixture is rated for damp locations only/);
  });

  it('warns on a totally enclosed fixture without an enclosed rating, not on a ventilated one', () => {
    expect(codes({ enclosure: 'enclosed' })).toEqual(['application.enclosed_not_rated']);
    expect(codes({ enclosure: 'enclosed_ventilated' })).toEqual([]);
  });

  it('warns on any dimmer on a non-dimmable product, and on the wrong kind of dimmer', () => {
    expect(codes({ dimmer: 'phase' }, { ...product, dimming: 'none' })).toEqual([
      'application.dimmer_on_non_dimmable',
    ]);
    expect(codes({ dimmer: 'phase' })).toEqual(['application.dimmer_method_mismatch']); // product dims 0-10 V
    expect(codes({ dimmer: '0-10v' })).toEqual([]);
  });

  it('warns when the nominal supply is outside the input range, and when the ambient is above the maximum', () => {
    expect(codes({ nominalSupplyVolts: 480 })).toEqual(['application.supply_outside_rating']);
    expect(codes({ ambientC: 50 })).toEqual(['application.ambient_above_rating']);
    expect(codes({ ambientC: 45 })).toEqual([]); // at the rated maximum is within it
  });
});

describe('the policy version in force', () => {
  const versions = [
    { versionNumber: 1, effectiveFrom: '2022-01-01' },
    { versionNumber: 2, effectiveFrom: '2024-07-01' },
  ];
  it('is the latest with effectiveFrom on or before the purchase date, else the install date', () => {
    expect(versionInForce(versions, '2021-12-31')).toBeNull();
    expect(versionInForce(versions, '2022-01-01')?.versionNumber).toBe(1);
    expect(versionInForce(versions, '2024-06-30')?.versionNumber).toBe(1);
    expect(versionInForce(versions, '2024-07-01')?.versionNumber).toBe(2);
    expect(coverageDate({ purchaseDate: '2024-06-15', installDate: '2024-08-01' })).toBe('2024-06-15');
    expect(coverageDate({ purchaseDate: null, installDate: '2024-08-01' })).toBe('2024-08-01');
  });
});
