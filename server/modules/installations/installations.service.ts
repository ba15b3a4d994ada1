import crypto from 'node:crypto';
import { In, type EntityManager } from 'typeorm';
import type { AppAbility } from '../../../shared/abilities';
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
import type { AppDataSource } from '../../db/data-source';
import { insertMany, sentInOrder } from '../../db/insert-many';
import { hydrate, hydrateJson, jsonArrayOf, jsonObjectOf, selectColumns } from '../../db/hydrate';
import { Conditions, readPageWithTotal, readRows } from '../../db/read';
import { Organization } from '../../db/entities/organization.entity';
import { WarrantyPolicy } from '../../db/entities/warranty-policy.entity';
import { InstallationUnit } from '../../db/entities/installation-unit.entity';
import { Installation } from '../../db/entities/installation.entity';
import { PolicyModel } from '../../db/entities/policy-model.entity';
import { ProductModel } from '../../db/entities/product-model.entity';
import { WarrantyPolicyVersion } from '../../db/entities/warranty-policy-version.entity';
import { recordAudit, recordAuditMany, type Actor } from '../../lib/audit';
import {
  coerceRow,
  issuesToRowErrors,
  fileBlocked,
  importResult,
  parseCsvRows,
  tooManyRows,
  csvColumns,
  type ImportProgress,
} from '../../lib/csv-import';
import { clock } from '../../lib/clock';
import { AppError, conflict } from '../../lib/errors';
import { changedFields } from '../../lib/history';
import { likeContains, parseSort } from '../../lib/pagination';
import { scopeConditions } from '../../lib/tenant-scope';
import { installationAuditView, type InstallationListRow } from './installations.presenter';

const SORTS = {
  installDate: 'i.install_date',
  siteName: 'i.site_name',
  quantity: 'i.quantity',
  createdAt: 'i.created_at',
};

/** What an installations-list row reads, each under its table alias, an underscore and its column. */
const LIST_COLUMNS = [
  ...[
    'id',
    'contractor_id',
    'manufacturer_id',
    'product_model_id',
    'site_name',
    'site_address',
    'site_city',
    'site_region',
    'site_postal_code',
    'quantity',
    'install_date',
    'purchase_date',
    'distributor',
    'invoice_number',
    'lot',
    'location',
    'enclosure',
    'dimmer',
    'nominal_supply_volts',
    'hours_per_day',
    'ambient_c',
    'created_at',
    'updated_at',
    'version',
  ].map((col) => `i.${col} AS i_${col}`),
  'c.name AS c_name',
  'm.name AS m_name',
  'p.model_number AS p_model_number',
  'p.name AS p_name',
  'p.family AS p_family',
  'v.id AS v_id',
  'v.policy_id AS v_policy_id',
  'v.version_number AS v_version_number',
  'v.effective_from AS v_effective_from',
  'pol.name AS pol_name',
].join(', ');

/** An installations-list row as the page query returns it. */
type RawListRow = {
  i_id: string;
  i_contractor_id: string;
  i_manufacturer_id: string;
  i_product_model_id: string;
  i_site_name: string;
  i_site_address: string;
  i_site_city: string;
  i_site_region: string;
  i_site_postal_code: string;
  i_quantity: number;
  i_install_date: Date | string;
  i_purchase_date: Date | string | null;
  i_distributor: string | null;
  i_invoice_number: string | null;
  i_lot: string | null;
  i_location: Installation['location'];
  i_enclosure: Installation['enclosure'];
  i_dimmer: Installation['dimmer'];
  i_nominal_supply_volts: number;
  i_hours_per_day: number;
  i_ambient_c: number;
  i_created_at: Date;
  i_updated_at: Date;
  i_version: number;
  c_name: string | null;
  m_name: string | null;
  p_model_number: string;
  p_name: string;
  p_family: ProductModel['family'];
  v_id: string | null;
  v_policy_id: string;
  v_version_number: number;
  v_effective_from: Date | string;
  pol_name: string | null;
  /** COUNT(*): a BIGINT, so a string (bigNumberStrings). */
  serial_count: string | number;
};

// A DATE column arrives as a Date at UTC midnight (timezone 'Z'), as the entity's string would read it.
function dateOnly(v: Date | string): string;
function dateOnly(v: Date | string | null): string | null;
function dateOnly(v: Date | string | null) {
  return v === null ? null : typeof v === 'string' ? v.slice(0, 10) : v.toISOString().slice(0, 10);
}

function listRowOf(r: RawListRow): InstallationListRow {
  return {
    id: r.i_id,
    contractorId: r.i_contractor_id,
    manufacturerId: r.i_manufacturer_id,
    productModelId: r.i_product_model_id,
    siteName: r.i_site_name,
    siteAddress: r.i_site_address,
    siteCity: r.i_site_city,
    siteRegion: r.i_site_region,
    sitePostalCode: r.i_site_postal_code,
    quantity: r.i_quantity,
    installDate: dateOnly(r.i_install_date),
    purchaseDate: dateOnly(r.i_purchase_date),
    distributor: r.i_distributor,
    invoiceNumber: r.i_invoice_number,
    lot: r.i_lot,
    location: r.i_location,
    enclosure: r.i_enclosure,
    dimmer: r.i_dimmer,
    nominalSupplyVolts: r.i_nominal_supply_volts,
    hoursPerDay: r.i_hours_per_day,
    ambientC: r.i_ambient_c,
    createdAt: r.i_created_at,
    updatedAt: r.i_updated_at,
    version: r.i_version,
    contractor: r.c_name === null ? null : { name: r.c_name },
    manufacturer: r.m_name === null ? null : { name: r.m_name },
    productModel: { modelNumber: r.p_model_number, name: r.p_name, family: r.p_family },
    policyVersion:
      r.v_id === null
        ? null
        : {
            id: r.v_id,
            policyId: r.v_policy_id,
            versionNumber: r.v_version_number,
            effectiveFrom: dateOnly(r.v_effective_from),
            policy: r.pol_name === null ? null : { name: r.pol_name },
          },
    serialCount: Number(r.serial_count),
  };
}

export const INSTALLATION_COLUMNS = csvColumns([
  ['manufacturer', 'string', 'optional', 'Aldercrest Lighting'],
  ['model_number', 'string', 'required', 'AC-HB150-D'],
  ['site_name', 'string', 'required', 'Dockside cold store, bay 4'],
  ['site_address', 'string', 'required', '18 Wharf Road'],
  ['site_city', 'string', 'required', 'Port Elliot'],
  ['site_region', 'string', 'required', 'WA'],
  ['site_postal_code', 'string', 'required', '98101'],
  ['quantity', 'number', 'required', '2'],
  ['serials', 'list', 'optional', 'AC2401-0001; AC2401-0002'],
  ['install_date', 'string', 'required', '2024-03-18'],
  ['purchase_date', 'string', 'optional', '2024-02-27'],
  ['distributor', 'string', 'optional', 'Northgate Electrical Supply'],
  ['invoice_number', 'string', 'optional', 'INV-20417'],
  ['lot', 'string', 'optional', 'AC2401'],
  ['location', 'string', 'required', 'damp'],
  ['enclosure', 'string', 'required', 'open'],
  ['dimmer', 'string', 'required', 'none'],
  ['nominal_supply_volts', 'number', 'required', '277'],
  ['hours_per_day', 'number', 'required', '16'],
  ['ambient_c', 'number', 'required', '25'],
]);

/** The payload schemas as of the server's clock: an install date after today (anywhere) is refused. */
export const installationSchemasNow = () => installationSchemas(latestInstallDate(clock.now()));

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
  await insertMany(m, InstallationUnit, rows, 2000);
}

export function createInstallationsService(ds: AppDataSource) {
  let detail: string | undefined;
  const detailSql = () =>
    (detail ??= `SELECT ${[
      selectColumns(ds, Installation, 'i'),
      selectColumns(ds, ProductModel, 'p'),
      selectColumns(ds, Organization, 'pm'),
      selectColumns(ds, Organization, 'c'),
      selectColumns(ds, Organization, 'm'),
      selectColumns(ds, WarrantyPolicyVersion, 'v'),
      selectColumns(ds, WarrantyPolicy, 'pol'),
      `(SELECT JSON_ARRAYAGG(${jsonObjectOf(ds, InstallationUnit, 'u')} ORDER BY u.id)
          FROM installation_units u WHERE u.installation_id = i.id) AS units_json`,
    ].join(', ')}
       FROM installations i
       LEFT JOIN product_models p ON p.id = i.product_model_id
       LEFT JOIN organizations pm ON pm.id = p.manufacturer_id
       LEFT JOIN organizations c ON c.id = i.contractor_id
       LEFT JOIN organizations m ON m.id = i.manufacturer_id
       LEFT JOIN warranty_policy_versions v ON v.id = i.policy_version_id
       LEFT JOIN warranty_policies pol ON pol.id = v.policy_id
      WHERE i.id = ?`);

  return {
    /** The installations the user may read (the CASL rules, server/lib/tenant-scope.ts), filtered and paged. */
    async list(ability: AppAbility, q: InstallationListQuery) {
      const sort = parseSort(q.sort, SORTS)!;
      const scope = scopeConditions(ability, 'Installation', 'i');
      const w = new Conditions().and(scope.sql, ...scope.params);
      if (q.productModelId) w.and('i.product_model_id = ?', q.productModelId);
      if (q.manufacturerId) w.and('i.manufacturer_id = ?', q.manufacturerId);
      if (q.contractorId) w.and('i.contractor_id = ?', q.contractorId);
      if (q.location) w.and('i.location = ?', q.location);
      if (q.enclosure) w.and('i.enclosure = ?', q.enclosure);
      if (q.nominalSupplyVolts) w.and('i.nominal_supply_volts = ?', q.nominalSupplyVolts);
      if (q.q) {
        const like = likeContains(q.q);
        w.and(
          `(i.site_name LIKE ? OR i.site_city LIKE ? OR i.invoice_number LIKE ? OR p.model_number LIKE ?
            OR EXISTS (SELECT 1 FROM installation_units su WHERE su.installation_id = i.id AND su.serial LIKE ?))`,
          like,
          like,
          like,
          like,
          like,
        );
      }
      // One statement whatever the page size (readPageWithTotal, server/db/read.ts): the page with its joins and
      // each listed installation's serial count, carrying the total, a count which joins product_models only for the
      // search. Left joins on required keys keep installations first in the plan (see the claims list); the
      // tie-break runs the same way as the sort so an (organisation, [location,] sort column) index can serve both.
      const { rows, total } = await readPageWithTotal<RawListRow>(
        ds,
        {
          select: `${LIST_COLUMNS},
                (SELECT COUNT(*) FROM installation_units u WHERE u.installation_id = i.id) AS serial_count`,
          rest: `FROM installations i
           LEFT JOIN product_models p ON p.id = i.product_model_id
           LEFT JOIN organizations c ON c.id = i.contractor_id
           LEFT JOIN organizations m ON m.id = i.manufacturer_id
           LEFT JOIN warranty_policy_versions v ON v.id = i.policy_version_id
           LEFT JOIN warranty_policies pol ON pol.id = v.policy_id
           ${w.sql}
          ORDER BY ${sort.column} ${sort.direction}, i.id ${sort.direction}
          LIMIT ? OFFSET ?`,
          params: [...w.params, q.pageSize, (q.page - 1) * q.pageSize],
        },
        {
          sql: `SELECT COUNT(*) AS n FROM installations i
           ${q.q ? 'LEFT JOIN product_models p ON p.id = i.product_model_id' : ''}
           ${w.sql}`,
          params: w.params,
        },
      );
      return { items: rows.map(listRowOf), total };
    },

    /**
     * An installation with its product (and the product's manufacturer), parties, policy version and policy, and
     * its units as one JSON array: one written-out statement, hydrated with TypeORM's metadata (server/db/hydrate.ts),
     * from the primary (it is read again right after a change). TypeORM's query builder spent several times
     * MariaDB's own time building the statement and grouping the joined rows (npm run bench, installation page).
     */
    async findById(id: string): Promise<Installation | null> {
      const [row] = await readRows<Record<string, unknown>>(ds, detailSql(), [id], {
        from: 'primary',
        parser: 'interpreted',
        prepared: true,
      });
      if (!row) return null;
      const inst = hydrate(ds, Installation, row, 'i')!;
      const product = hydrate(ds, ProductModel, row, 'p')!;
      product.manufacturer = hydrate(ds, Organization, row, 'pm')!;
      const version = hydrate(ds, WarrantyPolicyVersion, row, 'v');
      if (version) version.policy = hydrate(ds, WarrantyPolicy, row, 'pol')!;
      return Object.assign(inst, {
        productModel: product,
        contractor: hydrate(ds, Organization, row, 'c')!,
        manufacturer: hydrate(ds, Organization, row, 'm')!,
        policyVersion: version,
        units: jsonArrayOf(row.units_json).map((u) => hydrateJson(ds, InstallationUnit, u, 'u')!),
      });
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
      onProgress?: (p: ImportProgress) => void,
    ): Promise<ImportResult> {
      const { rows, fileErrors } = parseCsvRows(input, INSTALLATION_COLUMNS);
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
      const fileSerials = new Map<string, number>();
      /** One row's checks, in file order (a serial on an earlier row makes this one the duplicate). */
      const check = (c: (typeof coerced)[number]): Good | ImportRowError[] => {
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
        return rowErrors.length || !parsed.success || !product
          ? rowErrors
          : { row: c.raw.row, product, value: parsed.data };
      };
      /** Of checked rows, those whose serials are not registered yet: one query per model of the chunk. */
      const unregistered = async (m: EntityManager, good: Good[]) => {
        const serialsByModel = new Map<string, string[]>();
        for (const g of good) {
          const list = serialsByModel.get(g.product.id);
          if (list) list.push(...g.value.serials);
          else serialsByModel.set(g.product.id, [...g.value.serials]);
        }
        const taken = new Set<string>();
        for (const [modelId, serials] of serialsByModel)
          for (const s of await takenSerials(m, modelId, serials, null))
            taken.add(`${modelId}|${s.toUpperCase()}`);
        return good.filter((g) => {
          const clash = g.value.serials.filter((s) => taken.has(`${g.product.id}|${s.toUpperCase()}`));
          if (!clash.length) return true;
          errors.push({
            row: g.row,
            column: 'serials',
            message: `Already registered for this model: ${clash.join(', ')}.`,
          });
          return false;
        });
      };

      // The rows go a thousand at a time: checked, their serials looked up, and (importing) written. A chunk's
      // INSERTs are sent, not waited for, so that Node checks the next chunk while MariaDB writes this one; the
      // next chunk's serial lookup runs after them on the same connection. All in one transaction: a failure
      // anywhere writes nothing.
      const CHUNK = 1_000;
      const writing = !dryRun && !fileBlocked(fileErrors);
      let valid = 0;
      const walk = async (m: EntityManager) => {
        const versions = writing ? await versionsByModel(m, [...new Set(products.map((p) => p.id))]) : null;
        const sends = sentInOrder();
        if (writing) onProgress?.({ phase: 'writing', done: 0, total: rows.length });
        for (let start = 0; start < coerced.length && !sends.failed; start += CHUNK) {
          if (!writing) onProgress?.({ phase: 'checking', done: start, total: rows.length });
          const good: Good[] = [];
          for (const c of coerced.slice(start, start + CHUNK)) {
            const checked = check(c);
            if (Array.isArray(checked)) errors.push(...checked);
            else good.push(checked);
          }
          const ok = good.length ? await unregistered(m, good) : [];
          valid += ok.length;
          const handled = Math.min(start + CHUNK, coerced.length);
          if (!writing || !ok.length) {
            if (writing) onProgress?.({ phase: 'writing', done: handled, total: rows.length });
            continue;
          }
          const records = ok.map((g) => {
            const { serials: _s, ...fields } = g.value;
            void _s;
            const policyVersionId =
              versionInForce(versions!.get(g.product.id) ?? [], coverageDate(g.value))?.id ?? null;
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
          sends.send(insertMany(m, Installation, records, CHUNK));
          sends.send(
            insertUnits(
              m,
              ok.flatMap((g, i) => unitRows(records[i].id, g.product, g.value.serials)),
            ),
          );
          sends.send(
            recordAuditMany(
              m,
              actor,
              records.map((r, i) => ({
                action: 'installation.imported',
                entityType: 'Installation',
                entityId: r.id,
                after: installationAuditView({ ...r, serials: ok[i].value.serials }),
              })),
              CHUNK,
            ),
            () => onProgress?.({ phase: 'writing', done: handled, total: rows.length }),
          );
          // Let the statements go out before checking the next chunk.
          await sends.letOut();
        }
        await sends.settle();
      };

      let imported = 0;
      try {
        if (writing) await ds.transaction(walk);
        else await walk(ds.manager);
      } catch (err) {
        if (isSerialDuplicate(err))
          throw conflict(
            'installation.duplicate_serial',
            'Someone registered one of these serials while the file was importing. Check the file again.',
          );
        throw err;
      }
      if (writing) imported = valid;
      return importResult({ dryRun, total: rows.length, valid, imported, errors, fileErrors });
    },
  };
}
