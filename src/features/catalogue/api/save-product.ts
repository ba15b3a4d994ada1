import type { ProductDto, ProductInput, UpdateProductInput } from '../../../../shared/schemas/catalogue';
import { api } from '../../../lib/api-client';

export const createProduct = (input: ProductInput) =>
  api<{ product: ProductDto }>('/products', { method: 'POST', json: input });

export const updateProduct = (id: string, input: UpdateProductInput) =>
  api<{ product: ProductDto }>(`/products/${encodeURIComponent(id)}`, { method: 'PATCH', json: input });
