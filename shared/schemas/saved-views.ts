import { z } from 'zod';
import { QUEUE_SORTS } from '../claims/workflow';

const uuid = z.uuid({ error: 'Not a valid id.' });

/** The review desk's filters as the desk holds them (strings as typed), checked before they are kept. */
export const savedViewFiltersSchema = z.strictObject({
  q: z.string().trim().max(120).optional(),
  sort: z.enum(QUEUE_SORTS).optional(),
  stage: z
    .string()
    .max(200)
    .regex(/^[a-z_]+(,[a-z_]+)*$/, 'Stages as a comma-separated list.')
    .optional(),
  verdict: z.enum(['covered', 'excluded', 'review']).optional(),
  assignee: z.union([z.literal('me'), z.literal('none'), uuid]).optional(),
  productModelId: uuid.optional(),
  contractorId: uuid.optional(),
  minAgeDays: z.number().int().min(0).max(3650).optional(),
  minAmount: z
    .string()
    .regex(/^\d{1,10}(\.\d{1,2})?$/, 'An amount like 96.00.')
    .optional(),
});
export type SavedViewFilters = z.infer<typeof savedViewFiltersSchema>;

export const createSavedViewSchema = z.strictObject({
  name: z.string().trim().min(1, 'Name the view.').max(80, 'At most 80 characters.'),
  filters: savedViewFiltersSchema,
});
export type CreateSavedViewInput = z.infer<typeof createSavedViewSchema>;

export type SavedViewDto = { id: string; name: string; filters: SavedViewFilters; createdAt: string };

/** At most this many views per person: a picker, not a database. */
export const MAX_SAVED_VIEWS = 20;
