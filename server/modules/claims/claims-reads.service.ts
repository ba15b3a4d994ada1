import type { AppAbility } from '../../../shared/abilities';
import { In, type EntityManager } from 'typeorm';
import { CLAIM_STAGES, OPEN_STAGES, type ClaimListQuery } from '../../../shared/schemas/claims';
import type { SessionUser } from '../../auth/passport';
import type { AppDataSource } from '../../db/data-source';
import { hydrate, hydrateJson, jsonArrayOf, jsonObjectOf, selectColumns } from '../../db/hydrate';
import { Conditions, isoOfDateTime, readPageWithTotal, readRows } from '../../db/read';
import { Attachment } from '../../db/entities/attachment.entity';
import { AuditEvent } from '../../db/entities/audit-event.entity';
import { Claim } from '../../db/entities/claim.entity';
import { InstallationUnit } from '../../db/entities/installation-unit.entity';
import { Installation } from '../../db/entities/installation.entity';
import { Organization } from '../../db/entities/organization.entity';
import { ProductModel } from '../../db/entities/product-model.entity';
import { WarrantyPolicyVersion } from '../../db/entities/warranty-policy-version.entity';
import { WarrantyPolicy } from '../../db/entities/warranty-policy.entity';
import { stageTotal } from '../../lib/claim-counts';
import { claimSearch } from '../../lib/claim-search';
import { scopeConditions } from '../../lib/tenant-scope';
import { HISTORY_LIMIT } from '../../lib/history';
import { likeContains, parseSort } from '../../lib/pagination';

const SORTS = {
  filedAt: 'c.filed_at',
  updatedAt: 'c.updated_at',
  createdAt: 'c.created_at',
  failedOn: 'c.failed_on',
  number: 'c.number',
};

const CLOSED_STAGES = CLAIM_STAGES.filter((st) => !OPEN_STAGES.includes(st));

/**
 * Whether a list asks for no more than its organisation's claims at some stages, so that its total is a sum over
 * the claim counts. Any other filter given, including one added later, makes it a count.
 */
const STAGE_ONLY_KEYS = new Set(['page', 'pageSize', 'sort', 'stage', 'open']);
const byStageOnly = (q: ClaimListQuery) =>
  Object.entries(q).every(([k, v]) => STAGE_ONLY_KEYS.has(k) || v === undefined || v === '');

/** What a claims-list row reads, each under its table alias, an underscore and its column. */
const LIST_COLUMNS = [
  ...[
    'id',
    'number',
    'stage',
    'waiting_on',
    'contractor_id',
    'manufacturer_id',
    'installation_id',
    'product_model_id',
    'serials',
    'units',
    'failed_on',
    'filed_at',
    'stage_changed_at',
    'verdict',
    'engine_version',
    'expected_credit',
    'currency',
    'created_at',
    'updated_at',
    'version',
  ].map((col) => `c.${col} AS c_${col}`),
  'co.name AS co_name',
  'mo.name AS mo_name',
  'p.model_number AS p_model_number',
  'p.name AS p_name',
  'p.family AS p_family',
  'i.site_name AS i_site_name',
  'i.site_city AS i_site_city',
].join(', ');

/** A claims-list row as the page query returns it. */
type RawListRow = {
  c_id: string;
  c_number: string | null;
  c_stage: Claim['stage'];
  c_waiting_on: Claim['waitingOn'];
  c_contractor_id: string;
  c_manufacturer_id: string;
  c_installation_id: string;
  c_product_model_id: string;
  c_serials: string[] | string;
  c_units: number | null;
  c_failed_on: string | null;
  c_filed_at: string | null;
  c_stage_changed_at: string;
  c_verdict: Claim['verdict'];
  c_engine_version: string | null;
  c_expected_credit: string | null;
  c_currency: string | null;
  c_created_at: string;
  c_updated_at: string;
  c_version: number;
  co_name: string;
  mo_name: string;
  p_model_number: string;
  p_name: string;
  p_family: ProductModel['family'];
  i_site_name: string;
  i_site_city: string;
};

export type ClaimListRow = Omit<
  Pick<
    Claim,
    | 'id'
    | 'number'
    | 'stage'
    | 'waitingOn'
    | 'contractorId'
    | 'manufacturerId'
    | 'installationId'
    | 'productModelId'
    | 'serials'
    | 'units'
    | 'failedOn'
    | 'filedAt'
    | 'stageChangedAt'
    | 'verdict'
    | 'engineVersion'
    | 'expectedCredit'
    | 'currency'
    | 'createdAt'
    | 'updatedAt'
    | 'version'
  >,
  'filedAt' | 'stageChangedAt' | 'createdAt' | 'updatedAt'
> & {
  /** ISO 8601 (the list reads its times as MariaDB writes them and never makes Dates of them). */
  filedAt: string | null;
  stageChangedAt: string;
  createdAt: string;
  updatedAt: string;
  contractor: { name: string };
  manufacturer: { name: string };
  productModel: { modelNumber: string; name: string; family: ProductModel['family'] };
  installation: { siteName: string; siteCity: string };
};

function listRowOf(r: RawListRow): ClaimListRow {
  return {
    id: r.c_id,
    number: r.c_number,
    stage: r.c_stage,
    waitingOn: r.c_waiting_on,
    contractorId: r.c_contractor_id,
    manufacturerId: r.c_manufacturer_id,
    installationId: r.c_installation_id,
    productModelId: r.c_product_model_id,
    serials: typeof r.c_serials === 'string' ? (JSON.parse(r.c_serials) as string[]) : r.c_serials,
    units: r.c_units,
    failedOn: r.c_failed_on,
    filedAt: r.c_filed_at === null ? null : isoOfDateTime(r.c_filed_at),
    stageChangedAt: isoOfDateTime(r.c_stage_changed_at),
    verdict: r.c_verdict,
    engineVersion: r.c_engine_version,
    expectedCredit: r.c_expected_credit,
    currency: r.c_currency,
    createdAt: isoOfDateTime(r.c_created_at),
    updatedAt: isoOfDateTime(r.c_updated_at),
    version: r.c_version,
    contractor: { name: r.co_name },
    manufacturer: { name: r.mo_name },
    productModel: { modelNumber: r.p_model_number, name: r.p_name, family: r.p_family },
    installation: { siteName: r.i_site_name, siteCity: r.i_site_city },
  };
}

export type LoadedClaim = Claim & {
  installation: Installation & { units: { serial: string }[] };
  /** Who started the claim, read with it (null when nobody is recorded). */
  creator?: { id: string; name: string; organizationId: string } | null;
};

type Scope = { kind: 'contractor' | 'manufacturer'; orgId: string };
export const scopeOf = (u: SessionUser): Scope => ({ kind: u.organization.kind, orgId: u.organization.id });

/** Reading claims: one claim with everything its checks read, a claim's page, the claims list. */
export function createClaimReads(ds: AppDataSource) {
  const repo = ds.getRepository(Claim);

  // A claim with everything its checks read, in one statement (server/db/hydrate.ts): its parties, product,
  // installation, policy version and policy, who started it, and the installation's units as one JSON array
  // (joined, an installation of 200 fixtures would repeat the whole claim 200 times). Its page adds its history and
  // its files the same way, so that a claim's page is one statement after the session.
  const detailSql = new Map<boolean, string>();
  const detailSqlOf = (withPage: boolean) => {
    let sql = detailSql.get(withPage);
    if (!sql) {
      const page = withPage
        ? [
            `(SELECT JSON_ARRAYAGG(${jsonObjectOf(ds, AuditEvent, 'e', {
              user_name: 'u.name',
              user_org_id: 'u.organization_id',
              org_name: 'o.name',
            })} ORDER BY e.id LIMIT ${HISTORY_LIMIT})
                FROM audit_events e
                LEFT JOIN users u ON u.id = e.actor_user_id
                LEFT JOIN organizations o ON o.id = u.organization_id
               WHERE e.entity_type = 'Claim' AND e.entity_id = ?) AS history_json`,
            `(SELECT JSON_ARRAYAGG(${jsonObjectOf(ds, Attachment, 'a')} ORDER BY a.created_at, a.id)
                FROM attachments a
               WHERE a.owner_type = 'claim' AND a.owner_id = ? AND a.deleted_at IS NULL) AS files_json`,
          ]
        : [];
      sql = `SELECT ${[
        selectColumns(ds, Claim, 'c'),
        selectColumns(ds, Organization, 'co'),
        selectColumns(ds, Organization, 'mo'),
        selectColumns(ds, ProductModel, 'p'),
        selectColumns(ds, Installation, 'i'),
        selectColumns(ds, WarrantyPolicyVersion, 'v'),
        selectColumns(ds, WarrantyPolicy, 'pol'),
        'cb.name AS cb_name, cb.organization_id AS cb_organization_id',
        `(SELECT JSON_ARRAYAGG(${jsonObjectOf(ds, InstallationUnit, 'u')} ORDER BY u.id)
            FROM installation_units u WHERE u.installation_id = c.installation_id) AS units_json`,
        ...page,
      ].join(', ')}
         FROM claims c
         LEFT JOIN organizations co ON co.id = c.contractor_id
         LEFT JOIN organizations mo ON mo.id = c.manufacturer_id
         LEFT JOIN product_models p ON p.id = c.product_model_id
         LEFT JOIN installations i ON i.id = c.installation_id
         LEFT JOIN warranty_policy_versions v ON v.id = c.policy_version_id
         LEFT JOIN warranty_policies pol ON pol.id = v.policy_id
         LEFT JOIN users cb ON cb.id = c.created_by_id
        WHERE c.id = ?`;
      detailSql.set(withPage, sql);
    }
    return sql;
  };

  function loadedClaimOf(row: Record<string, unknown>): LoadedClaim {
    const claim = hydrate(ds, Claim, row, 'c')!;
    const installation = hydrate(ds, Installation, row, 'i');
    const version = hydrate(ds, WarrantyPolicyVersion, row, 'v');
    if (version) version.policy = hydrate(ds, WarrantyPolicy, row, 'pol')!;
    if (installation)
      installation.units = jsonArrayOf(row.units_json).map((u) => hydrateJson(ds, InstallationUnit, u, 'u')!);
    return Object.assign(claim, {
      contractor: hydrate(ds, Organization, row, 'co')!,
      manufacturer: hydrate(ds, Organization, row, 'mo')!,
      productModel: hydrate(ds, ProductModel, row, 'p')!,
      installation: installation!,
      policyVersion: version,
      creator:
        claim.createdById && row.cb_organization_id
          ? {
              id: claim.createdById,
              name: row.cb_name as string,
              organizationId: row.cb_organization_id as string,
            }
          : null,
    }) as LoadedClaim;
  }

  async function findById(id: string, m: EntityManager = ds.manager): Promise<LoadedClaim | null> {
    // Inside a transaction the statement runs on the transaction's connection; outside, on the primary: a claim
    // is loaded to be moved, and its version must be the latest.
    const sql = detailSqlOf(false);
    const [row] = (
      m === ds.manager
        ? await readRows(ds, sql, [id], { from: 'primary', parser: 'interpreted', prepared: true })
        : await m.query(sql, [id])
    ) as Record<string, unknown>[];
    return row ? loadedClaimOf(row) : null;
  }

  /**
   * A claim with its history (with the actors' names and organisations) and its files, for its page: one
   * statement. The caller authorises on the claim before it shows any of it.
   */
  async function findForPage(id: string) {
    // From the primary: a claim is on its page the moment it is filed, for whoever follows a link to it.
    const [row] = await readRows<Record<string, unknown>>(ds, detailSqlOf(true), [id, id, id], {
      from: 'primary',
      parser: 'interpreted',
      prepared: true,
    });
    if (!row) return null;
    return {
      claim: loadedClaimOf(row),
      history: jsonArrayOf(row.history_json).map((e) => ({
        event: hydrateJson(ds, AuditEvent, e, 'e')!,
        userName: e.user_name as string | null,
        userOrgId: e.user_org_id as string | null,
        orgName: e.org_name as string | null,
      })),
      attachments: jsonArrayOf(row.files_json).map((a) => hydrateJson(ds, Attachment, a, 'a')!),
    };
  }

  return {
    findById,
    findForPage,

    /** The claims the ability may read (its rules give the organisation filter), filtered and sorted as asked. */
    async list(scope: Scope, ability: AppAbility, q: ClaimListQuery) {
      const sort = parseSort(q.sort, SORTS)!;
      const w = new Conditions();
      const tenant = scopeConditions(ability, 'Claim', 'c');
      w.and(tenant.sql, ...tenant.params);
      if (q.stage) w.and('c.stage IN (?)', q.stage);
      if (q.open !== undefined) w.and(`c.stage ${q.open ? 'IN' : 'NOT IN'} (?)`, OPEN_STAGES);
      if (q.manufacturerId) w.and('c.manufacturer_id = ?', q.manufacturerId);
      if (q.contractorId) w.and('c.contractor_id = ?', q.contractorId);
      if (q.installationId) w.and('c.installation_id = ?', q.installationId);
      if (q.batchId) w.and('c.batch_id = ?', q.batchId);
      if (q.productModelId) w.and('c.product_model_id = ?', q.productModelId);
      if (q.verdict) w.and('c.verdict = ?', q.verdict);
      if (q.site)
        w.and('(i.site_name LIKE ? OR i.site_city LIKE ?)', likeContains(q.site), likeContains(q.site));
      if (q.product)
        w.and('(p.model_number LIKE ? OR p.name LIKE ?)', likeContains(q.product), likeContains(q.product));
      if (q.filedFrom) w.and('c.filed_at >= ?', `${q.filedFrom} 00:00:00`);
      if (q.filedTo) w.and('c.filed_at < DATE_ADD(?, INTERVAL 1 DAY)', q.filedTo);
      const search = claimSearch(q.q);
      if (search) w.and(search.sql, ...search.params);
      // One statement whatever the page size: the page with its joins, carrying its total (readPageWithTotal).
      // Filtered by stage alone (the usual list), the total is a sum over the claim counts the triggers keep
      // (server/lib/claim-counts.ts); with any other filter it is a count, which joins a table only for a filter on
      // it. Left joins on required keys keep the claims table first in the plan, so the page is read straight off
      // the (organisation, stage, sort column) index; the tie-break runs the same way as the sort so the index can
      // serve both. The SQL is written out (server/db/read.ts).
      const total = byStageOnly(q)
        ? stageTotal({
            organizationId: scope.orgId,
            stagesIn: q.stage,
            stagesNotIn: [
              ...(scope.kind === 'manufacturer' ? (['draft'] as const) : []),
              ...(q.open === undefined ? [] : q.open ? CLOSED_STAGES : OPEN_STAGES),
            ],
          })
        : {
            sql: `SELECT COUNT(*) AS n FROM claims c
                    ${q.site ? 'LEFT JOIN installations i ON i.id = c.installation_id' : ''}
                    ${q.product ? 'LEFT JOIN product_models p ON p.id = c.product_model_id' : ''}
                    ${w.sql}`,
            params: w.params,
          };
      const { rows, total: counted } = await readPageWithTotal<RawListRow>(
        ds,
        {
          select: LIST_COLUMNS,
          rest: `FROM claims c
          LEFT JOIN organizations co ON co.id = c.contractor_id
          LEFT JOIN organizations mo ON mo.id = c.manufacturer_id
          LEFT JOIN product_models p ON p.id = c.product_model_id
          LEFT JOIN installations i ON i.id = c.installation_id
          ${w.sql}
         ORDER BY ${sort.column} ${sort.direction}, c.id ${sort.direction}
         LIMIT ? OFFSET ?`,
          params: [...w.params, q.pageSize, (q.page - 1) * q.pageSize],
        },
        total,
        { dateStrings: true },
      );
      return { items: rows.map(listRowOf), total: counted };
    },

    /** The installation a new claim is started from (the caller authorises reading it). */
    findInstallation(id: string) {
      return ds.getRepository(Installation).findOne({ where: { id } });
    },

    async findMany(ids: string[]) {
      return ids.length ? ((await repo.find({ where: { id: In(ids) } })) as Claim[]) : [];
    },
  };
}

export type ClaimReads = ReturnType<typeof createClaimReads>;

/** A claim with its history and files, as its page reads them in one statement. */
export type ClaimPage = NonNullable<Awaited<ReturnType<ClaimReads['findForPage']>>>;
