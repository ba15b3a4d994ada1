import type { ProductDto } from '../../../shared/schemas/catalogue';
import type { ProductModel } from '../../db/entities/product-model.entity';
import { orgRef, pick, stamps } from '../../lib/present';

/** The ratings: what the answers show and the audit log records. */
const RATING_FIELDS = [
  'modelNumber',
  'name',
  'family',
  'ratedInputWatts',
  'inputVoltsMin',
  'inputVoltsMax',
  'ratedLumens',
  'ledStrings',
  'ledsPerString',
  'ledForwardVolts',
  'driverOutputAmps',
  'driverMaxOutputVolts',
  'location',
  'enclosedRated',
  'dimming',
  'ambientMaxC',
  'ratedLifeHours',
  'activeCooling',
] as const satisfies readonly (keyof ProductDto & keyof ProductModel)[];

export function presentProduct(p: ProductModel): ProductDto {
  return {
    id: p.id,
    manufacturer: orgRef(p.manufacturerId, p.manufacturer),
    ...pick(p, RATING_FIELDS),
    ...stamps(p),
  };
}

/** The ratings as the audit log records them. */
export function productAuditView(p: Pick<ProductModel, (typeof RATING_FIELDS)[number]>) {
  return pick(p, RATING_FIELDS);
}
