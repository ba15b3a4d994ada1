import crypto from 'node:crypto';
import { Brackets, In, type EntityManager, type SelectQueryBuilder } from 'typeorm';
import { coverageDate, versionInForce } from '../../../shared/catalogue/policy-version';
import {
  installationSchemas,
  latestInstallDate,
  type ImportRequest,
  type ImportResult,
  type ImportRowError,
  type InstallationListQuery,
  type InstallationValues,
  type UpdateInstallationInput,
} from '../../../shared/schemas/catalogue';
import type { SessionUser } from '../../auth/passport';
import type { AppDataSource } from '../../db/data-source';
import { InstallationUnit } from '../../db/entities/installation-unit.entity';
import { Installation } from '../../db/entities/installation.entity';
import { PolicyModel } from '../../db/entities/policy-model.entity';
import { ProductModel } from '../../db/entities/product-model.entity';
import { WarrantyPolicyVersion } from '../../db/entities/warranty-policy-version.entity';
import { recordAudit, recordAuditMany, type Actor } from '../../lib/audit';
import {
  coerceRow,
  issuesToRowErrors,
  MAX_LISTED_ERRORS,
  readRows,
  tooManyRows,
  type ColumnSpec,
} from '../../lib/csv-import';
import { clock } from '../../lib/clock';
import { AppError, conflict } from '../../lib/errors';
import { changedFields } from '../../lib/history';
import { likeContains, parseSort } from '../../lib/pagination';
import { installationAuditView } from './installations.presenter';

const SORTS = {
  installDate: 'i.install_date',
  siteName: 'i.site_name',
  quantity: 'i.quantity',
  createdAt: 'i.created_at',
};

export const INSTALLATION_COLUMNS: ColumnSpec[] = [
  {
    column: 'manufacturer',
    field: 'manufacturer',
    kind: 'string',
    required: false,
    example: 'Aldercrest Lighting',
  },
  { column: 'model_number', field: 'modelNumber', kind: 'string', required: true, example: 'AC-HB150-D' },
  {
    column: 'site_name',
    field: 'siteName',
    kind: 'string',
    required: true,
    example: 'Dockside cold store, bay 4',
  },
  { column: 'site_address', field: 'siteAddress', kind: 'string', required: true, example: '18 Wharf Road' },
  { column: 'site_city', field: 'siteCity', kind: 'string', required: true, example: 'Port Elliot' },
  { column: 'site_region', field: 'siteRegion', kind: 'string', required: true, example: 'WA' },
  { column: 'site_postal_code', field: 'sitePostalCode', kind: 'string', required: true, example: '98101' },
  { column: 'quantity', field: 'quantity', kind: 'number', required: true, example: '2' },
  { column: 'serials', field: 'serials', kind: 'list', required: false, example: 'AC2401-0001; AC2401-0002' },
  { column: 'install_date', field: 'installDate', kind: 'string', required: true, example: '2024-03-18' },
  { column: 'purchase_date', field: 'purchaseDate', kind: 'string', required: false, example: '2024-02-27' },
  {
    column: 'distributor',
    field: 'distributor',
    kind: 'string',
    required: false,
    example: 'Northgate Electrical Supply',
  },
  { column: 'invoice_number', field: 'invoiceNumber', kind: 'string', required: false, example: 'INV-20417' },
  { column: 'lot', field: 'lot', kind: 'string', required: false, example: 'AC2401' },
  { column: 'location', field: 'location', kind: 'string', required: true, example: 'damp' },
  { column: 'enclosure', field: 'enclosure', kind: 'string', required: true, example: 'open' },
  { column: 'dimmer', field: 'dimmer', kind: 'string', required: true, example: 'none' },
  {
    column: 'nominal_supply_volts',
    field: 'nominalSupplyVolts',
    kind: 'number',
    required: true,
    example: '277',
  },
  { column: 'hours_per_day', field: 'hoursPerDay', kind: 'number', required: true, example: '16' },
  { column: 'ambient_c', field: 'ambientC', kind: 'number', required: true, example: '25' },
];

/** The payload schemas as of the server's clock: an install date after today (anywhere) is refused. */
export const installationSchemasNow = () => installationSchemas(latestInstallDate(clock.now()));

type Scope = { kind: 'contractor' | 'manufacturer'; orgId: string };
export const scopeOf = (u: SessionUser): Scope => ({ kind: u.organization.kind, orgId: u.organization.id });

function applyScope(qb: SelectQueryBuilder<Installation>, s: Scope) {
  return s.kind === 'contractor'
    ? qb.andWhere('i.contractor_id = :org', { org: s.orgId })
    : qb.andWhere('i.manufacturer_id = :org', { org: s.orgId });
}

function dupError(serials: string[]) {
  const list =
    serials.slice(0, 20).join(', ') + (serials.length > 20 ? ` and ${serials.length - 20} more` : '');
  const err = conflict(
    'installation.duplicate_serial',
    `Already registered for this model: ${list}. A serial number or date code is registered once per model.`,
  );
  err.details = [{ path: 'serials', message: `Already registered: ${list}.` }];
  return err;
}

/** Serials already registered for the model (case-insensitive, as the unique index compares them). */
async function takenSerials(
  m: EntityManager,
  productModelId: string,
  serials: string[],
  exceptInstallationId: string | null,
) {
  const taken: string[] = [];
  for (let i = 0; i < serials.length; i += 1000) {
    const qb = m
      .createQueryBuilder(InstallationUnit, 'u')
      .select('u.serial', 'serial')
      .where('u.product_model_id = :pm AND u.serial IN (:...s)', {
        pm: productModelId,
        s: serials.slice(i, i + 1000),
      });
    if (exceptInstallationId) qb.andWhere('u.installation_id <> :iid', { iid: exceptInstallationId });
    taken.push(...(await qb.getRawMany<{ serial: string }>()).map((r) => r.serial));
  }
  return taken;
}

function isSerialDuplicate(err: unknown) {
  const e = err as { code?: string; driverError?: { code?: string }; message?: string };
  return (
    (e.code === 'ER_DUP_ENTRY' || e.driverError?.code === 'ER_DUP_ENTRY') &&
    String(e.message).includes('uq_installation_units_model_serial')
  );
}

/** Every version of the policy covering each model, in one query. */
async function versionsByModel(m: EntityManager, modelIds: string[]) {
  const out = new Map<string, WarrantyPolicyVersion[]>();
  if (!modelIds.length) return out;
  const rows = await m
    .createQueryBuilder(WarrantyPolicyVersion, 'v')
    .innerJoin(PolicyModel, 'pm', 'pm.policy_id = v.policy_id')
    .addSelect('pm.product_model_id', 'pm_product_model_id')
    .where('pm.product_model_id IN (:...ids)', { ids: modelIds })
    .getRawAndEntities();
  rows.entities.forEach((v, idx) => {
    const modelId = (rows.raw[idx] as { pm_product_model_id: string }).pm_product_model_id;
    const list = out.get(modelId) ?? [];
    list.push(v);
    out.set(modelId, list);
  });
  return out;
}

async function resolveVersionId(
  m: EntityManager,
  productModelId: string,
  dates: { purchaseDate: string | null; installDate: string },
) {
  const versions = (await versionsByModel(m, [productModelId])).get(productModelId) ?? [];
  return versionInForce(versions, coverageDate(dates))?.id ?? null;
}

function unitRows(
  installationId: string,
  product: { id: string; manufacturerId: string },
  serials: string[],
) {
  return serials.map((serial) => ({
    id: crypto.randomUUID(),
    manufacturerId: product.manufacturerId,
    productModelId: product.id,
    installationId,
    serial,
  }));
}

async function insertUnits(m: EntityManager, rows: ReturnType<typeof unitRows>) {
  for (let i = 0; i < rows.length; i += 1000) {
    await m
      .createQueryBuilder()
      .insert()
      .into(InstallationUnit)
      .values(rows.slice(i, i + 1000))
      .updateEntity(false)
      .execute();
  }
}

export function createInstallationsService(ds: AppDataSource) {
  const repo = ds.getRepository(Installation);

  return {
    /** Three queries whatever the page size: the page with its joins, the count, the serial counts. */
    async list(scope: Scope, q: InstallationListQuery) {
      const sort = parseSort(q.sort, SORTS)!;
      const qb = repo
        .createQueryBuilder('i')
        // Left joins on required keys keep installations first in the plan (see the claims list); of the joined
        // records, only what a list row shows.
        .leftJoin('i.productModel', 'p')
        .leftJoin('i.contractor', 'c')
        .leftJoin('i.manufacturer', 'm')
        .leftJoin('i.policyVersion', 'v')
        .leftJoin('v.policy', 'pol')
        .addSelect(['p.id', 'p.modelNumber', 'p.name', 'p.family', 'c.id', 'c.name', 'm.id', 'm.name'])
        .addSelect(['v.id', 'v.policyId', 'v.versionNumber', 'v.effectiveFrom', 'pol.id', 'pol.name'])
        .orderBy(sort.column, sort.direction)
        .addOrderBy('i.id', sort.direction)
        .offset((q.page - 1) * q.pageSize)
        .limit(q.pageSize);
      // The count joins only what the search needs.
      const counter = repo.createQueryBuilder('i').select('COUNT(*)', 'n');
      if (q.q) counter.leftJoin('i.productModel', 'p');
      for (const w of [qb, counter]) {
        applyScope(w, scope);
        if (q.productModelId) w.andWhere('i.product_model_id = :pm', { pm: q.productModelId });
        if (q.manufacturerId) w.andWhere('i.manufacturer_id = :mid', { mid: q.manufacturerId });
        if (q.contractorId) w.andWhere('i.contractor_id = :cid', { cid: q.contractorId });
        if (q.location) w.andWhere('i.location = :loc', { loc: q.location });
        if (q.enclosure) w.andWhere('i.enclosure = :enc', { enc: q.enclosure });
        if (q.nominalSupplyVolts) w.andWhere('i.nominal_supply_volts = :nsv', { nsv: q.nominalSupplyVolts });
        if (q.q) {
          const like = likeContains(q.q);
          w.andWhere(
            new Brackets((b) =>
              b
                .where('i.site_name LIKE :q', { q: like })
                .orWhere('i.site_city LIKE :q')
                .orWhere('i.invoice_number LIKE :q')
                .orWhere('p.model_number LIKE :q')
                .orWhere(
                  'EXISTS (SELECT 1 FROM installation_units su WHERE su.installation_id = i.id AND su.serial LIKE :q)',
                ),
            ),
          );
        }
      }
      const [items, count] = await Promise.all([qb.getMany(), counter.getRawOne<{ n: string | number }>()]);
      const total = Number(count?.n ?? 0);
      const counts = new Map<string, number>();
      if (items.length) {
        const raw = await ds
          .getRepository(InstallationUnit)
          .createQueryBuilder('u')
          .select('u.installation_id', 'id')
          .addSelect('COUNT(*)', 'n')
          .where('u.installation_id IN (:...ids)', { ids: items.map((i) => i.id) })
          .groupBy('u.installation_id')
          .getRawMany<{ id: string; n: string }>();
        for (const r of raw) counts.set(r.id, Number(r.n));
      }
      return { items: items.map((i) => Object.assign(i, { serialCount: counts.get(i.id) ?? 0 })), total };
    },

    findById(id: string) {
      // One query (findOne with the to-many units would run a DISTINCT query for the id first).
      return repo
        .createQueryBuilder('i')
        .leftJoinAndSelect('i.productModel', 'p')
        .leftJoinAndSelect('p.manufacturer', 'pm')
        .leftJoinAndSelect('i.contractor', 'c')
        .leftJoinAndSelect('i.manufacturer', 'm')
        .leftJoinAndSelect('i.policyVersion', 'v')
        .leftJoinAndSelect('v.policy', 'pol')
        .leftJoinAndSelect('i.units', 'u')
        .where('i.id = :id', { id })
        .getOne();
    },

    findProduct(id: string) {
      return ds.getRepository(ProductModel).findOne({ where: { id }, relations: { manufacturer: true } });
    },

    async create(contractorId: string, product: ProductModel, input: InstallationValues, actor: Actor) {
      try {
        return await ds.transaction(async (m) => {
          const taken = await takenSerials(m, product.id, input.serials, null);
          if (taken.length) throw dupError(taken);
          const policyVersionId = await resolveVersionId(m, product.id, input);
          const { serials, ...fields } = input;
          const inst = m.create(Installation, {
            ...fields,
            contractorId,
            manufacturerId: product.manufacturerId,
            policyVersionId,
            createdById: actor.userId,
          });
          await m.save(inst);
          await insertUnits(m, unitRows(inst.id, product, serials));
          await recordAudit(m, actor, {
            action: 'installation.created',
            entityType: 'Installation',
            entityId: inst.id,
            after: installationAuditView({ ...inst, serials }),
          });
          return inst.id;
        });
      } catch (err) {
        // Two requests racing for the same serial: the unique index decides.
        if (isSerialDuplicate(err)) throw dupError(input.serials);
        throw err;
      }
    },

    async update(target: Installation, input: UpdateInstallationInput, actor: Actor) {
      const current = installationAuditView({ ...target, serials: target.units.map((u) => u.serial) });
      const patch = Object.fromEntries(
        Object.entries(input).filter(([, v]) => v !== undefined),
      ) as Partial<InstallationValues>;
      const { policyVersionId: _pv, ...editable } = current;
      void _pv;
      const merged = installationSchemasNow().input.safeParse({ ...editable, ...patch });
      if (!merged.success) {
        throw new AppError(
          400,
          'validation.failed',
          'The request body has invalid fields.',
          merged.error.issues.map((i) => ({
            path: i.path.map(String).join('.') || '(body)',
            message: i.message,
          })),
        );
      }
      const next = merged.data;
      try {
        return await ds.transaction(async (m) => {
          const policyVersionId =
            next.purchaseDate !== target.purchaseDate || next.installDate !== target.installDate
              ? await resolveVersionId(m, target.productModelId, next)
              : target.policyVersionId;
          const after = installationAuditView({ ...next, policyVersionId });
          const diff = changedFields(current, after);
          if (!diff.changed) return target.id;
          const { serials, productModelId: _pm, ...fields } = next;
          void _pm;
          const result = await m
            .createQueryBuilder()
            .update(Installation)
            .set({ ...fields, policyVersionId, version: () => 'version + 1' })
            .where('id = :id AND version = :v', { id: target.id, v: target.version })
            .execute();
          if (!result.affected)
            throw conflict(
              'installation.changed',
              'Someone else changed this installation just now. Reload and try again.',
            );
          if ('serials' in diff.after) {
            const taken = await takenSerials(m, target.productModelId, serials, target.id);
            if (taken.length) throw dupError(taken);
            await m.delete(InstallationUnit, { installationId: target.id });
            await insertUnits(
              m,
              unitRows(
                target.id,
                { id: target.productModelId, manufacturerId: target.manufacturerId },
                serials,
              ),
            );
          }
          await recordAudit(m, actor, {
            action: 'installation.updated',
            entityType: 'Installation',
            entityId: target.id,
            before: diff.before,
            after: diff.after,
          });
          return target.id;
        });
      } catch (err) {
        if (isSerialDuplicate(err)) throw dupError(next.serials);
        throw err;
      }
    },

    /**
     * Validates every row (model lookup, bounds, serials against the file and the register); unless dryRun,
     * writes the valid rows in one transaction.
     */
    async importRows(
      contractorId: string,
      input: ImportRequest,
      dryRun: boolean,
      actor: Actor,
    ): Promise<ImportResult> {
      const { rows, fileErrors } = readRows(input, INSTALLATION_COLUMNS);
      tooManyRows(rows.length, 20_000);
      const errors: ImportRowError[] = [...fileErrors];
      const { input: rowSchema } = installationSchemasNow();

      const coerced = rows.map((raw) => ({ raw, ...coerceRow(raw, INSTALLATION_COLUMNS) }));
      // Resolve model numbers (optionally qualified by manufacturer name) in one query.
      const numbers = [
        ...new Set(
          coerced.map((c) => c.values.modelNumber).filter((x): x is string => typeof x === 'string'),
        ),
      ];
      const products: ProductModel[] = [];
      for (let i = 0; i < numbers.length; i += 1000) {
        products.push(
          ...(await ds.getRepository(ProductModel).find({
            where: { modelNumber: In(numbers.slice(i, i + 1000)) },
            relations: { manufacturer: true },
          })),
        );
      }
      const byNumber = new Map<string, ProductModel[]>();
      for (const p of products) {
        const k = p.modelNumber.toUpperCase();
        byNumber.set(k, [...(byNumber.get(k) ?? []), p]);
      }

      type Good = { row: number; product: ProductModel; value: InstallationValues };
      const good: Good[] = [];
      const fileSerials = new Map<string, number>();
      for (const c of coerced) {
        const rowErrors = [...c.errors];
        let product: ProductModel | undefined;
        const num = typeof c.values.modelNumber === 'string' ? c.values.modelNumber : '';
        const mfr =
          typeof c.values.manufacturer === 'string' ? c.values.manufacturer.trim().toLowerCase() : '';
        const candidates = (byNumber.get(num.toUpperCase()) ?? []).filter(
          (p) => !mfr || p.manufacturer.name.toLowerCase() === mfr,
        );
        if (!num)
          rowErrors.push({ row: c.raw.row, column: 'model_number', message: 'Enter the model number.' });
        else if (candidates.length === 0)
          rowErrors.push({
            row: c.raw.row,
            column: 'model_number',
            message: `No model numbered ${num}${mfr ? ` from ${String(c.values.manufacturer)}` : ''} in the catalogue.`,
          });
        else if (candidates.length > 1)
          rowErrors.push({
            row: c.raw.row,
            column: 'manufacturer',
            message: `Several manufacturers have a model numbered ${num}: fill in the manufacturer.`,
          });
        else product = candidates[0];

        const { manufacturer: _m, modelNumber: _n, ...rest } = c.values;
        void _m;
        void _n;
        const parsed = rowSchema.safeParse({
          ...rest,
          productModelId: product?.id ?? '00000000-0000-4000-8000-000000000000',
        });
        if (!parsed.success)
          rowErrors.push(
            ...issuesToRowErrors(
              c.raw.row,
              parsed.error,
              INSTALLATION_COLUMNS,
              new Set(c.errors.map((e) => e.column)),
            ),
          );
        if (parsed.success && product) {
          const dupInFile: string[] = [];
          for (const s of parsed.data.serials) {
            const k = `${product.id}|${s.toUpperCase()}`;
            const at = fileSerials.get(k);
            if (at !== undefined) dupInFile.push(`${s} (row ${at})`);
          }
          if (dupInFile.length)
            rowErrors.push({
              row: c.raw.row,
              column: 'serials',
              message: `Also on an earlier row: ${dupInFile.join(', ')}.`,
            });
          else
            for (const s of parsed.data.serials)
              fileSerials.set(`${product.id}|${s.toUpperCase()}`, c.raw.row);
        }
        if (rowErrors.length || !parsed.success || !product) errors.push(...rowErrors);
        else good.push({ row: c.raw.row, product, value: parsed.data });
      }

      // Serials already in the register, one query per model and thousand serials.
      const serialsByModel = new Map<string, string[]>();
      for (const g of good)
        serialsByModel.set(g.product.id, [...(serialsByModel.get(g.product.id) ?? []), ...g.value.serials]);
      const taken = new Set<string>();
      for (const [modelId, serials] of serialsByModel) {
        if (!serials.length) continue;
        for (const s of await takenSerials(ds.manager, modelId, serials, null))
          taken.add(`${modelId}|${s.toUpperCase()}`);
      }
      const valid = good.filter((g) => {
        const clash = g.value.serials.filter((s) => taken.has(`${g.product.id}|${s.toUpperCase()}`));
        if (!clash.length) return true;
        errors.push({
          row: g.row,
          column: 'serials',
          message: `Already registered for this model: ${clash.join(', ')}.`,
        });
        return false;
      });
      errors.sort((a, b) => a.row - b.row);
      const blocked = fileErrors.some((e) => e.row === 1);
      let imported = 0;
      if (!dryRun && !blocked && valid.length) {
        try {
          await ds.transaction(async (m) => {
            const versions = await versionsByModel(m, [...new Set(valid.map((g) => g.product.id))]);
            const records = valid.map((g) => {
              const { serials: _s, ...fields } = g.value;
              void _s;
              const policyVersionId =
                versionInForce(versions.get(g.product.id) ?? [], coverageDate(g.value))?.id ?? null;
              return {
                id: crypto.randomUUID(),
                ...fields,
                contractorId,
                manufacturerId: g.product.manufacturerId,
                policyVersionId,
                createdById: actor.userId,
                version: 1,
              };
            });
            for (let i = 0; i < records.length; i += 500) {
              await m
                .createQueryBuilder()
                .insert()
                .into(Installation)
                .values(records.slice(i, i + 500))
                .updateEntity(false)
                .execute();
            }
            await insertUnits(
              m,
              valid.flatMap((g, i) => unitRows(records[i].id, g.product, g.value.serials)),
            );
            await recordAuditMany(
              m,
              actor,
              records.map((r, i) => ({
                action: 'installation.imported',
                entityType: 'Installation',
                entityId: r.id,
                after: installationAuditView({ ...r, serials: valid[i].value.serials }),
              })),
            );
          });
        } catch (err) {
          if (isSerialDuplicate(err))
            throw conflict(
              'installation.duplicate_serial',
              'Someone registered one of these serials while the file was importing. Check the file again.',
            );
          throw err;
        }
        imported = valid.length;
      }
      return {
        dryRun,
        total: rows.length,
        valid: blocked ? 0 : valid.length,
        invalid: new Set(errors.filter((e) => e.row > 1).map((e) => e.row)).size,
        imported,
        errors: errors.slice(0, MAX_LISTED_ERRORS),
        errorsTruncated: errors.length > MAX_LISTED_ERRORS,
      };
    },
  };
}
