import type { ProductDto } from '../../../shared/schemas/catalogue';
import type { ProductModel } from '../../db/entities/product-model.entity';

export function presentProduct(p: ProductModel): ProductDto {
  return {
    id: p.id,
    manufacturer: { id: p.manufacturerId, name: p.manufacturer?.name ?? '' },
    modelNumber: p.modelNumber,
    name: p.name,
    family: p.family,
    ratedInputWatts: p.ratedInputWatts,
    inputVoltsMin: p.inputVoltsMin,
    inputVoltsMax: p.inputVoltsMax,
    ratedLumens: p.ratedLumens,
    ledStrings: p.ledStrings,
    ledsPerString: p.ledsPerString,
    ledForwardVolts: p.ledForwardVolts,
    driverOutputAmps: p.driverOutputAmps,
    driverMaxOutputVolts: p.driverMaxOutputVolts,
    location: p.location,
    enclosedRated: p.enclosedRated,
    dimming: p.dimming,
    ambientMaxC: p.ambientMaxC,
    ratedLifeHours: p.ratedLifeHours,
    activeCooling: p.activeCooling,
    createdAt: p.createdAt.toISOString(),
    updatedAt: p.updatedAt.toISOString(),
    version: p.version,
  };
}

/** The ratings as the audit log records them. */
export function productAuditView(p: Pick<ProductModel, keyof Omit<ProductDto, 'id' | 'manufacturer' | 'createdAt' | 'updatedAt' | 'version'>>) {
  return {
    modelNumber: p.modelNumber,
    name: p.name,
    family: p.family,
    ratedInputWatts: p.ratedInputWatts,
    inputVoltsMin: p.inputVoltsMin,
    inputVoltsMax: p.inputVoltsMax,
    ratedLumens: p.ratedLumens,
    ledStrings: p.ledStrings,
    ledsPerString: p.ledsPerString,
    ledForwardVolts: p.ledForwardVolts,
    driverOutputAmps: p.driverOutputAmps,
    driverMaxOutputVolts: p.driverMaxOutputVolts,
    location: p.location,
    enclosedRated: p.enclosedRated,
    dimming: p.dimming,
    ambientMaxC: p.ambientMaxC,
    ratedLifeHours: p.ratedLifeHours,
    activeCooling: p.activeCooling,
  };
}
