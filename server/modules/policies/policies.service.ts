import { In, type EntityManager } from 'typeorm';
import type {
  CreatePolicyInput,
  PolicyListQuery,
  PolicyTerms,
  UpdatePolicyInput,
} from '../../../shared/schemas/catalogue';
import { type createPolicySchema, type policyTermsSchema } from '../../../shared/schemas/catalogue';
import type { z } from 'zod';
import type { AppDataSource } from '../../db/data-source';
import { PolicyModel } from '../../db/entities/policy-model.entity';
import { ProductModel } from '../../db/entities/product-model.entity';
import { WarrantyPolicyVersion } from '../../db/entities/warranty-policy-version.entity';
import { WarrantyPolicy } from '../../db/entities/warranty-policy.entity';
import { recordAudit, type Actor } from '../../lib/audit';
import { AppError, conflict } from '../../lib/errors';
import { likeContains, parseSort } from '../../lib/pagination';
import { presentVersion, versionAuditView } from './policies.presenter';

const SORTS = { name: 'p.name', updatedAt: 'p.updated_at', createdAt: 'p.created_at' };

type CreateValues = z.output<typeof createPolicySchema>;

/** The models must be the manufacturer's own and not already covered by another policy. */
async function checkModels(m: EntityManager, manufacturerId: string, ids: string[], policyId: string | null) {
  const own = await m.find(ProductModel, {
    where: { id: In(ids), manufacturerId },
    select: { id: true, modelNumber: true },
  });
  const unknown = ids.filter((id) => !own.some((p) => p.id === id));
  if (unknown.length) {
    throw new AppError(400, 'validation.failed', 'The request body has invalid fields.', [
      { path: 'productModelIds', message: `Not a model in your catalogue: ${unknown.join(', ')}.` },
    ]);
  }
  const taken = await m.find(PolicyModel, { where: { productModelId: In(ids) } });
  const elsewhere = taken.filter((t) => t.policyId !== policyId);
  if (elsewhere.length) {
    const names = own
      .filter((p) => elsewhere.some((t) => t.productModelId === p.id))
      .map((p) => p.modelNumber);
    throw conflict(
      'policy.model_already_covered',
      `Another policy already covers ${names.join(', ')}. A model is covered by one policy at a time.`,
    );
  }
}

function versionRow(policyId: string, versionNumber: number, t: PolicyTerms, createdById: string | null) {
  return {
    policyId,
    versionNumber,
    effectiveFrom: t.effectiveFrom,
    termMonths: t.termMonths,
    fullCoverageMonths: t.fullCoverageMonths,
    filingWindowDays: t.filingWindowDays,
    darkLedFailurePercent: t.darkLedFailurePercent.toFixed(2),
    unitCredit: t.unitCredit,
    currency: t.currency,
    labourAllowance: t.labourAllowance,
    requiredPhotos: t.requiredPhotos,
    proofOfPurchaseRequired: t.proofOfPurchaseRequired,
    exclusions: t.exclusions,
    denialReasons: t.denialReasons,
    changeNote: t.changeNote,
    createdById,
  };
}

export function createPoliciesService(ds: AppDataSource) {
  const repo = ds.getRepository(WarrantyPolicy);

  async function modelsOf(policyIds: string[]) {
    if (!policyIds.length) return [];
    return ds
      .getRepository(PolicyModel)
      .find({ where: { policyId: In(policyIds) }, relations: { productModel: true } });
  }

  return {
    /** Three queries whatever the page size: the page (with the latest version joined), the count, the models. */
    async list(q: PolicyListQuery) {
      const sort = parseSort(q.sort, SORTS)!;
      const qb = repo
        .createQueryBuilder('p')
        .innerJoinAndSelect('p.manufacturer', 'm')
        .leftJoinAndMapOne(
          'p.latest',
          WarrantyPolicyVersion,
          'v',
          'v.policy_id = p.id AND v.version_number = p.latest_version_number',
        )
        .orderBy(sort.column, sort.direction)
        .addOrderBy('p.id', 'ASC')
        .offset((q.page - 1) * q.pageSize)
        .limit(q.pageSize);
      if (q.manufacturerId) qb.andWhere('p.manufacturer_id = :mid', { mid: q.manufacturerId });
      if (q.productModelId)
        qb.andWhere(
          'EXISTS (SELECT 1 FROM policy_models pm WHERE pm.policy_id = p.id AND pm.product_model_id = :pmid)',
          { pmid: q.productModelId },
        );
      if (q.q) qb.andWhere('p.name LIKE :q', { q: likeContains(q.q) });
      const [items, total] = await qb.getManyAndCount();
      const models = await modelsOf(items.map((p) => p.id));
      return { items, total, models };
    },

    findById(id: string) {
      return repo.findOne({ where: { id }, relations: { manufacturer: true } });
    },

    async detail(policy: WarrantyPolicy) {
      const versions = await ds
        .getRepository(WarrantyPolicyVersion)
        .find({ where: { policyId: policy.id }, order: { versionNumber: 'ASC' } });
      const models = await modelsOf([policy.id]);
      return { versions, models };
    },

    findVersion(policyId: string, versionId: string) {
      return ds.getRepository(WarrantyPolicyVersion).findOne({ where: { id: versionId, policyId } });
    },

    async create(manufacturerId: string, input: CreateValues, actor: Actor) {
      return ds.transaction(async (m) => {
        if (await m.exists(WarrantyPolicy, { where: { manufacturerId, name: input.name } })) {
          throw conflict('policy.name_taken', `You already have a policy named ${input.name}.`);
        }
        await checkModels(m, manufacturerId, input.productModelIds, null);
        const policy = m.create(WarrantyPolicy, { manufacturerId, name: input.name, latestVersionNumber: 1 });
        await m.save(policy);
        const version = m.create(WarrantyPolicyVersion, versionRow(policy.id, 1, input.terms, actor.userId));
        await m.save(version);
        await m.insert(
          PolicyModel,
          input.productModelIds.map((productModelId) => ({ policyId: policy.id, productModelId })),
        );
        await recordAudit(m, actor, {
          action: 'policy.created',
          entityType: 'WarrantyPolicy',
          entityId: policy.id,
          after: { name: policy.name, productModelIds: input.productModelIds },
        });
        await recordAudit(m, actor, {
          action: 'policy.version_created',
          entityType: 'WarrantyPolicy',
          entityId: policy.id,
          after: versionAuditView(presentVersion(version)),
        });
        return policy.id;
      });
    },

    /** An edit of the terms: a new version with the next number, in force from a later date. */
    async addVersion(policy: WarrantyPolicy, terms: z.output<typeof policyTermsSchema>, actor: Actor) {
      return ds.transaction(async (m) => {
        const latest = await m.findOneOrFail(WarrantyPolicyVersion, {
          where: { policyId: policy.id, versionNumber: policy.latestVersionNumber },
        });
        if (terms.effectiveFrom <= latest.effectiveFrom) {
          throw conflict(
            'policy.effective_date_order',
            `A new version must take effect after version ${latest.versionNumber}, which is in force from ${latest.effectiveFrom}.`,
          );
        }
        const next = policy.latestVersionNumber + 1;
        const bumped = await m
          .createQueryBuilder()
          .update(WarrantyPolicy)
          .set({ latestVersionNumber: next, version: () => 'version + 1' })
          .where('id = :id AND latest_version_number = :n', { id: policy.id, n: policy.latestVersionNumber })
          .execute();
        if (!bumped.affected)
          throw conflict(
            'policy.changed',
            'Someone else changed this policy just now. Reload and try again.',
          );
        const version = m.create(WarrantyPolicyVersion, versionRow(policy.id, next, terms, actor.userId));
        await m.save(version);
        await recordAudit(m, actor, {
          action: 'policy.version_created',
          entityType: 'WarrantyPolicy',
          entityId: policy.id,
          before: versionAuditView(presentVersion(latest)),
          after: versionAuditView(presentVersion(version)),
        });
        return version.id;
      });
    },

    async update(policy: WarrantyPolicy, input: UpdatePolicyInput, actor: Actor) {
      return ds.transaction(async (m) => {
        const currentModels = (await m.find(PolicyModel, { where: { policyId: policy.id } }))
          .map((x) => x.productModelId)
          .sort();
        const before: Record<string, unknown> = {};
        const after: Record<string, unknown> = {};
        if (input.name !== undefined && input.name !== policy.name) {
          if (
            await m.exists(WarrantyPolicy, {
              where: { manufacturerId: policy.manufacturerId, name: input.name },
            })
          ) {
            throw conflict('policy.name_taken', `You already have a policy named ${input.name}.`);
          }
          before.name = policy.name;
          after.name = input.name;
        }
        const nextModels = input.productModelIds ? [...input.productModelIds].sort() : null;
        if (nextModels && JSON.stringify(nextModels) !== JSON.stringify(currentModels)) {
          await checkModels(m, policy.manufacturerId, nextModels, policy.id);
          await m.delete(PolicyModel, { policyId: policy.id });
          await m.insert(
            PolicyModel,
            nextModels.map((productModelId) => ({ policyId: policy.id, productModelId })),
          );
          before.productModelIds = currentModels;
          after.productModelIds = nextModels;
        }
        if (!Object.keys(after).length) return;
        const result = await m
          .createQueryBuilder()
          .update(WarrantyPolicy)
          .set({ ...(after.name ? { name: after.name as string } : {}), version: () => 'version + 1' })
          .where('id = :id AND version = :v', { id: policy.id, v: policy.version })
          .execute();
        if (!result.affected)
          throw conflict(
            'policy.changed',
            'Someone else changed this policy just now. Reload and try again.',
          );
        await recordAudit(m, actor, {
          action: 'policy.updated',
          entityType: 'WarrantyPolicy',
          entityId: policy.id,
          before,
          after,
        });
      });
    },
  };
}

export type CreatePolicyValues = CreateValues;
export type { CreatePolicyInput };
