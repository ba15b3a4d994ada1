import type { ProductDto } from '../../../../shared/schemas/catalogue';
import { resourceQueries } from './resource-queries';

export type ProductFilters = {
  page: number;
  pageSize?: number;
  q?: string;
  family?: string;
  location?: string;
  dimming?: string;
  manufacturerId?: string;
  sort?: string;
};

export const productQueries = resourceQueries<ProductFilters, ProductDto, { product: ProductDto }>(
  'products',
);
