import crypto from 'node:crypto';
import { In } from 'typeorm';
import {
  productInputSchema,
  type ImportRequest,
  type ImportResult,
  type ImportRowError,
  type ProductListQuery,
  type ProductValues,
  type UpdateProductInput,
} from '../../../shared/schemas/catalogue';
import type { AppDataSource } from '../../db/data-source';
import { ProductModel } from '../../db/entities/product-model.entity';
import { recordAudit, recordAuditMany, type Actor } from '../../lib/audit';
import {
  coerceRow,
  issuesToRowErrors,
  fileBlocked,
  importResult,
  parseCsvRows,
  tooManyRows,
  csvColumns,
} from '../../lib/csv-import';
import { AppError, conflict } from '../../lib/errors';
import { changedFields } from '../../lib/history';
import { likeContains, parseSort } from '../../lib/pagination';
import { zodDetails } from '../../middleware/validate';
import { productAuditView } from './products.presenter';

const SORTS = {
  modelNumber: 'p.model_number',
  name: 'p.name',
  family: 'p.family',
  ratedInputWatts: 'p.rated_input_watts',
  ratedLumens: 'p.rated_lumens',
  createdAt: 'p.created_at',
};

export const PRODUCT_COLUMNS = csvColumns([
  ['model_number', 'string', 'required', 'HB-150-50K'],
  ['name', 'string', 'required', 'Round high-bay 150 W'],
  ['family', 'string', 'required', 'high_bay'],
  ['rated_input_watts', 'number', 'required', '150'],
  ['input_volts_min', 'number', 'required', '120'],
  ['input_volts_max', 'number', 'required', '277'],
  ['rated_lumens', 'number', 'required', '21000'],
  ['led_strings', 'number', 'required', '24'],
  ['leds_per_string', 'number', 'required', '16'],
  ['led_forward_volts', 'number', 'required', '3'],
  ['driver_output_amps', 'number', 'required', '2.8'],
  ['driver_max_output_volts', 'number', 'optional', '60'],
  ['location', 'string', 'required', 'damp'],
  ['enclosed_rated', 'boolean', 'required', 'no'],
  ['dimming', 'string', 'required', '0-10v'],
  ['ambient_max_c', 'number', 'required', '50'],
  ['rated_life_hours', 'number', 'required', '100000'],
  ['active_cooling', 'boolean', 'required', 'no'],
]);

function isDuplicate(err: unknown, index: string) {
  const e = err as { code?: string; driverError?: { code?: string }; message?: string };
  return (
    (e.code === 'ER_DUP_ENTRY' || e.driverError?.code === 'ER_DUP_ENTRY') && String(e.message).includes(index)
  );
}

const modelNumberTaken = (n: string) =>
  conflict('product.model_number_taken', `Your catalogue already has a model numbered ${n}.`);

export function createProductsService(ds: AppDataSource) {
  const repo = ds.getRepository(ProductModel);

  return {
    async list(q: ProductListQuery) {
      const sort = parseSort(q.sort, SORTS)!;
      // A many-to-one join cannot multiply rows, so plain LIMIT/OFFSET: one query for the page, one count.
      const qb = repo
        .createQueryBuilder('p')
        .innerJoinAndSelect('p.manufacturer', 'm')
        .orderBy(sort.column, sort.direction)
        .addOrderBy('p.id', 'ASC')
        .offset((q.page - 1) * q.pageSize)
        .limit(q.pageSize);
      if (q.manufacturerId) qb.andWhere('p.manufacturer_id = :mid', { mid: q.manufacturerId });
      if (q.family) qb.andWhere('p.family = :family', { family: q.family });
      if (q.location) qb.andWhere('p.location = :location', { location: q.location });
      if (q.dimming) qb.andWhere('p.dimming = :dimming', { dimming: q.dimming });
      if (q.enclosedRated !== undefined) qb.andWhere('p.enclosed_rated = :er', { er: q.enclosedRated });
      if (q.q) qb.andWhere('(p.model_number LIKE :q OR p.name LIKE :q)', { q: likeContains(q.q) });
      const [items, total] = await qb.getManyAndCount();
      return { items, total };
    },

    findById(id: string) {
      return repo.findOne({ where: { id }, relations: { manufacturer: true } });
    },

    async create(manufacturerId: string, input: ProductValues, actor: Actor) {
      try {
        return await ds.transaction(async (m) => {
          if (await m.exists(ProductModel, { where: { manufacturerId, modelNumber: input.modelNumber } }))
            throw modelNumberTaken(input.modelNumber);
          const p = m.create(ProductModel, { ...input, manufacturerId });
          await m.save(p);
          await recordAudit(m, actor, {
            action: 'product.created',
            entityType: 'ProductModel',
            entityId: p.id,
            after: productAuditView(p),
          });
          return p.id;
        });
      } catch (err) {
        if (isDuplicate(err, 'uq_product_models_mfr_number')) throw modelNumberTaken(input.modelNumber);
        throw err;
      }
    },

    async update(target: ProductModel, input: UpdateProductInput, actor: Actor) {
      // The patch must leave a product that passes every bound, cross-field ones included.
      const merged = productInputSchema.safeParse({ ...productAuditView(target), ...stripUndefined(input) });
      if (!merged.success)
        throw new AppError(
          400,
          'validation.failed',
          'The request body has invalid fields.',
          zodDetails(merged.error),
        );
      const next = merged.data;
      const diff = changedFields(productAuditView(target), productAuditView(next));
      if (!diff.changed) return target.id;
      try {
        return await ds.transaction(async (m) => {
          if (next.modelNumber !== target.modelNumber) {
            const clash = await m.findOne(ProductModel, {
              where: { manufacturerId: target.manufacturerId, modelNumber: next.modelNumber },
            });
            if (clash && clash.id !== target.id) throw modelNumberTaken(next.modelNumber);
          }
          const result = await m
            .createQueryBuilder()
            .update(ProductModel)
            .set({ ...next, version: () => 'version + 1' })
            .where('id = :id AND version = :v', { id: target.id, v: target.version })
            .execute();
          if (!result.affected)
            throw conflict(
              'product.changed',
              'Someone else changed this product just now. Reload and try again.',
            );
          await recordAudit(m, actor, {
            action: 'product.updated',
            entityType: 'ProductModel',
            entityId: target.id,
            before: diff.before,
            after: diff.after,
          });
          return target.id;
        });
      } catch (err) {
        if (isDuplicate(err, 'uq_product_models_mfr_number')) throw modelNumberTaken(next.modelNumber);
        throw err;
      }
    },

    /** Validates every row; unless dryRun, writes the valid ones in one transaction. */
    async importRows(
      manufacturerId: string,
      input: ImportRequest,
      dryRun: boolean,
      actor: Actor,
    ): Promise<ImportResult> {
      const { rows, fileErrors } = parseCsvRows(input, PRODUCT_COLUMNS);
      tooManyRows(rows.length, 20_000);
      const errors: ImportRowError[] = [...fileErrors];
      const good: { row: number; value: ProductValues }[] = [];
      const seen = new Map<string, number>();
      for (const raw of rows) {
        const { values, errors: cellErrors } = coerceRow(raw, PRODUCT_COLUMNS);
        const parsed = productInputSchema.safeParse(values);
        const rowErrors = [...cellErrors];
        if (!parsed.success)
          rowErrors.push(
            ...issuesToRowErrors(
              raw.row,
              parsed.error,
              PRODUCT_COLUMNS,
              new Set(cellErrors.map((e) => e.column)),
            ),
          );
        const key = typeof values.modelNumber === 'string' ? values.modelNumber.trim().toUpperCase() : '';
        if (key && seen.has(key))
          rowErrors.push({
            row: raw.row,
            column: 'model_number',
            message: `Model number ${String(values.modelNumber)} is already on row ${seen.get(key)}.`,
          });
        else if (key) seen.set(key, raw.row);
        if (rowErrors.length || !parsed.success) errors.push(...rowErrors);
        else good.push({ row: raw.row, value: parsed.data });
      }
      // Model numbers already in the catalogue.
      const existing = new Set<string>();
      const numbers = good.map((g) => g.value.modelNumber);
      for (let i = 0; i < numbers.length; i += 1000) {
        const found = await repo.find({
          where: { manufacturerId, modelNumber: In(numbers.slice(i, i + 1000)) },
          select: { modelNumber: true },
        });
        for (const f of found) existing.add(f.modelNumber.toUpperCase());
      }
      const valid = good.filter((g) => {
        if (!existing.has(g.value.modelNumber.toUpperCase())) return true;
        errors.push({
          row: g.row,
          column: 'model_number',
          message: `Your catalogue already has a model numbered ${g.value.modelNumber}.`,
        });
        return false;
      });
      let imported = 0;
      if (!dryRun && !fileBlocked(fileErrors) && valid.length) {
        await ds.transaction(async (m) => {
          const records = valid.map((g) => ({
            id: crypto.randomUUID(),
            manufacturerId,
            ...g.value,
            version: 1,
          }));
          for (let i = 0; i < records.length; i += 500) {
            await m
              .createQueryBuilder()
              .insert()
              .into(ProductModel)
              .values(records.slice(i, i + 500))
              .updateEntity(false)
              .execute();
          }
          await recordAuditMany(
            m,
            actor,
            records.map((r) => ({
              action: 'product.imported',
              entityType: 'ProductModel',
              entityId: r.id,
              after: productAuditView(r),
            })),
          );
        });
        imported = valid.length;
      }
      return importResult({ dryRun, total: rows.length, valid: valid.length, imported, errors, fileErrors });
    },
  };
}

function stripUndefined<T extends object>(o: T): Partial<T> {
  return Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined)) as Partial<T>;
}
