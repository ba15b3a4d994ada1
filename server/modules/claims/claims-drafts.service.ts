import { type EntityManager } from 'typeorm';
import { CLAIM_STAGE_LABELS, type ClaimFields, type UpdateClaimInput } from '../../../shared/schemas/claims';
import type { AppDataSource } from '../../db/data-source';
import { Attachment } from '../../db/entities/attachment.entity';
import { Claim } from '../../db/entities/claim.entity';
import { type Installation } from '../../db/entities/installation.entity';
import { recordAudit, type Actor } from '../../lib/audit';
import { clock } from '../../lib/clock';
import { conflict } from '../../lib/errors';
import { changedFields } from '../../lib/history';
import { runIdempotent } from '../../lib/idempotency';
import { claimFieldsOf } from './engine-input';
import type { LoadedClaim } from './claims-reads.service';

/** Idempotency-Key routes (server/lib/idempotency.ts): starting a draft and filing one. */
export const CREATE_ROUTE = 'POST /claims';

export function claimAuditView(f: ClaimFields) {
  return {
    serials: f.serials ?? [],
    units: f.units ?? null,
    failedOn: f.failedOn ?? null,
    symptoms: f.symptoms ?? [],
    measurements: f.measurements ?? {},
    observations: f.observations ?? {},
    narrative: f.narrative ?? '',
  };
}

/** Starting, saving and deleting a draft. */
export function createClaimDrafts(ds: AppDataSource) {
  return {
    async create(
      installation: Installation,
      fields: ClaimFields,
      actor: Actor,
      extra: { batchId?: string; m?: EntityManager } = {},
    ) {
      const run = <T>(fn: (m: EntityManager) => Promise<T>) => (extra.m ? fn(extra.m) : ds.transaction(fn));
      return run(async (m) => {
        const now = clock.now();
        const claim = m.create(Claim, {
          number: null,
          contractorId: installation.contractorId,
          manufacturerId: installation.manufacturerId,
          installationId: installation.id,
          productModelId: installation.productModelId,
          policyVersionId: installation.policyVersionId,
          stage: 'draft',
          stageChangedAt: now,
          waitingOn: null,
          units: fields.units ?? null,
          serials: fields.serials ?? [],
          failedOn: fields.failedOn ?? null,
          symptoms: fields.symptoms ?? [],
          measurements: (fields.measurements ?? {}) as Claim['measurements'],
          observations: fields.observations ?? {},
          narrative: fields.narrative ?? '',
          evaluation: null,
          engineVersion: null,
          evaluatedAt: null,
          verdict: null,
          expectedCredit: null,
          currency: null,
          filedAt: null,
          filedById: null,
          batchId: extra.batchId ?? null,
          assignedReviewerId: null,
          createdById: actor.userId,
        });
        await m.save(claim);
        await recordAudit(m, actor, {
          action: 'claim.created',
          entityType: 'Claim',
          entityId: claim.id,
          after: {
            stage: 'draft',
            installationId: installation.id,
            ...claimAuditView(claim as unknown as ClaimFields),
          },
        });
        return claim.id;
      });
    },

    /**
     * Starts a draft once per Idempotency-Key (a double tap on "File a claim" sends one key twice): the first
     * request makes the draft and keeps its id under the key; the same key again answers that draft (replayed);
     * the same key with another body is refused (422) and writes nothing. Keys are per user.
     */
    async createOnce(
      installation: Installation,
      fields: ClaimFields,
      actor: Actor,
      idem: { key: string; userId: string; body: unknown },
    ) {
      const answer = await runIdempotent(
        ds,
        {
          key: idem.key,
          userId: idem.userId,
          route: CREATE_ROUTE,
          method: 'POST',
          path: '/api/claims',
          body: idem.body,
        },
        async (m) => ({
          status: 201,
          body: { claimId: await this.create(installation, fields, actor, { m }) },
        }),
      );
      return {
        id: (answer.body as { claimId: string }).claimId,
        status: answer.status,
        replayed: answer.replayed,
      };
    },

    /** Draft autosave, conditional on the version the client last saw. */
    async update(target: LoadedClaim, input: UpdateClaimInput & ClaimFields, actor: Actor) {
      if (target.stage !== 'draft') {
        throw conflict(
          'claim.not_editable',
          `This claim is ${CLAIM_STAGE_LABELS[target.stage].toLowerCase()}; only a draft can be changed.`,
        );
      }
      const { version, ...patch } = input;
      const current = claimAuditView(claimFieldsOf(target));
      const defined = Object.fromEntries(
        Object.entries(patch).filter(([, v]) => v !== undefined),
      ) as Partial<ClaimFields>;
      const next = { ...current, ...defined };
      const diff = changedFields(current, next);
      if (version !== target.version) {
        throw conflict(
          'claim.changed',
          'This draft was changed elsewhere (another device or tab) since you opened it. Reload to see the latest.',
        );
      }
      if (!diff.changed) return target.version;
      return ds.transaction(async (m) => {
        const result = await m
          .createQueryBuilder()
          .update(Claim)
          .set({
            serials: next.serials,
            units: next.units,
            failedOn: next.failedOn,
            symptoms: next.symptoms,
            measurements: next.measurements as Claim['measurements'],
            observations: next.observations,
            narrative: next.narrative,
            version: () => 'version + 1',
          })
          .where("id = :id AND version = :v AND stage = 'draft'", { id: target.id, v: version })
          .execute();
        if (!result.affected) {
          throw conflict(
            'claim.changed',
            'This draft was changed elsewhere (another device or tab) since you opened it. Reload to see the latest.',
          );
        }
        await recordAudit(m, actor, {
          action: 'claim.updated',
          entityType: 'Claim',
          entityId: target.id,
          before: diff.before,
          after: diff.after,
        });
        return version + 1;
      });
    },

    async remove(target: LoadedClaim, actor: Actor) {
      if (target.stage !== 'draft') {
        throw conflict(
          'claim.not_deletable',
          'Only a draft can be deleted; a filed claim can be withdrawn instead.',
        );
      }
      await ds.transaction(async (m) => {
        const result = await m
          .createQueryBuilder()
          .delete()
          .from(Claim)
          .where("id = :id AND stage = 'draft'", { id: target.id })
          .execute();
        if (!result.affected)
          throw conflict('claim.changed', 'This claim changed just now. Reload and try again.');
        // The draft's files go with it (marked removed; the bytes stay until a clean-up, as for any removal).
        await m.softDelete(Attachment, { ownerType: 'claim', ownerId: target.id });
        await recordAudit(m, actor, {
          action: 'claim.deleted',
          entityType: 'Claim',
          entityId: target.id,
          before: { stage: 'draft', ...claimAuditView(claimFieldsOf(target)) },
        });
      });
    },
  };
}
