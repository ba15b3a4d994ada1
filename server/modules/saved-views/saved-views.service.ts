import type { DataSource } from 'typeorm';
import { MAX_SAVED_VIEWS, type CreateSavedViewInput } from '../../../shared/schemas/saved-views';
import { SavedView } from '../../db/entities/saved-view.entity';
import { recordAudit, type Actor } from '../../lib/audit';
import { AppError } from '../../lib/errors';

export function createSavedViewsService(ds: DataSource) {
  const repo = ds.getRepository(SavedView);
  return {
    listFor: (userId: string) => repo.find({ where: { userId }, order: { name: 'ASC' } }),
    findById: (id: string) => repo.findOneBy({ id }),

    async create(userId: string, input: CreateSavedViewInput, actor: Actor) {
      return ds.transaction(async (m) => {
        // Serialise one person's creations on their user row, so the cap and the name check hold under races.
        await m.query('SELECT id FROM users WHERE id = ? FOR UPDATE', [userId]);
        const mine = await m.find(SavedView, { where: { userId } });
        if (mine.some((v) => v.name.toLowerCase() === input.name.toLowerCase()))
          throw new AppError(409, 'saved_view.name_taken', `You already have a view named "${input.name}".`);
        if (mine.length >= MAX_SAVED_VIEWS)
          throw new AppError(
            409,
            'saved_view.too_many',
            `Keep at most ${MAX_SAVED_VIEWS} views; delete one you no longer use.`,
          );
        const view = m.create(SavedView, { userId, name: input.name, filters: input.filters });
        await m.save(view);
        await recordAudit(m, actor, {
          action: 'saved_view.created',
          entityType: 'SavedView',
          entityId: view.id,
          after: { name: view.name },
        });
        return m.findOneByOrFail(SavedView, { id: view.id });
      });
    },

    async remove(view: SavedView, actor: Actor) {
      await ds.transaction(async (m) => {
        await m.delete(SavedView, { id: view.id });
        await recordAudit(m, actor, {
          action: 'saved_view.deleted',
          entityType: 'SavedView',
          entityId: view.id,
          before: { name: view.name },
        });
      });
    },
  };
}
