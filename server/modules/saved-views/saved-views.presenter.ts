import type { SavedViewDto } from '../../../shared/schemas/saved-views';
import type { SavedView } from '../../db/entities/saved-view.entity';

export function presentSavedView(v: SavedView): SavedViewDto {
  return { id: v.id, name: v.name, filters: v.filters, createdAt: v.createdAt.toISOString() };
}
