import { formatCalendarDate } from '../../../shared/dates';
import { In, type EntityManager } from 'typeorm';
import { newClaimNumber } from '../../../shared/claims/claim-number';
import type { ClaimEvidence } from '../../../shared/claims/engine-input';
import { safeEvaluateClaim, type Evaluation } from '../../../shared/engine';
import {
  CLAIM_STAGE_LABELS,
  CLAIM_STAGES,
  claimFieldsSchema,
  filingIssues,
  OPEN_STAGES,
  type ClaimFields,
  type ClaimListQuery,
  type FilingIssue,
  type UpdateClaimInput,
} from '../../../shared/schemas/claims';
import { canPerform, REFUSAL_STATUS, type Refusal } from '../../../shared/claims/stages';
import type { SessionUser } from '../../auth/passport';
import { toAbilityUser } from '../../middleware/auth';
import type { AppDataSource } from '../../db/data-source';
import { hydrate, hydrateJson, jsonArrayOf, jsonObjectOf, selectColumns } from '../../db/hydrate';
import { Conditions, isoOfDateTime, readRows } from '../../db/read';
import { Attachment } from '../../db/entities/attachment.entity';
import { AuditEvent } from '../../db/entities/audit-event.entity';
import { Claim } from '../../db/entities/claim.entity';
import { InstallationUnit } from '../../db/entities/installation-unit.entity';
import { Installation } from '../../db/entities/installation.entity';
import { Organization } from '../../db/entities/organization.entity';
import { ProductModel } from '../../db/entities/product-model.entity';
import { WarrantyPolicyVersion } from '../../db/entities/warranty-policy-version.entity';
import { WarrantyPolicy } from '../../db/entities/warranty-policy.entity';
import { User } from '../../db/entities/user.entity';
import { recordAudit, type Actor } from '../../lib/audit';
import { stageTotal } from '../../lib/claim-counts';
import { clock } from '../../lib/clock';
import { claimSearch } from '../../lib/claim-search';
import { crashPoint } from '../../lib/crash-point';
import { AppError, conflict } from '../../lib/errors';
import { changedFields, HISTORY_LIMIT } from '../../lib/history';
import { runIdempotent } from '../../lib/idempotency';
import { enqueueEmail } from '../../lib/outbox';
import { claimRef, enqueueWebhookEvent } from '../../lib/webhooks';
import { likeContains, parseSort } from '../../lib/pagination';
import { claimFieldsOf, engineInputOfClaim } from './engine-input';

/** Idempotency-Key routes (server/lib/idempotency.ts): starting a draft and filing one. */
export const CREATE_ROUTE = 'POST /claims';
export const FILE_ROUTE = 'POST /claims/:id/file';

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

function refuse(r: Refusal): never {
  throw new AppError(REFUSAL_STATUS[r.code], r.code, r.message, r.details);
}

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

export const todayIso = () => clock.now().toISOString().slice(0, 10);

/** The evidence the engine counts. Attachments plug in here (photos and proof of purchase on the claim). */
export type EvidenceCounter = (m: EntityManager, claimId: string) => Promise<ClaimEvidence>;
const noEvidence: EvidenceCounter = async () => ({ photos: 0, proofOfPurchase: false });

function isDuplicate(err: unknown, index: string) {
  const e = err as { code?: string; driverError?: { code?: string }; message?: string };
  return (
    (e.code === 'ER_DUP_ENTRY' || e.driverError?.code === 'ER_DUP_ENTRY') && String(e.message).includes(index)
  );
}

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

export function filingContextOf(c: LoadedClaim) {
  return {
    installDate: c.installation.installDate,
    quantity: c.installation.quantity,
    serials: c.installation.units.map((u) => u.serial),
    today: todayIso(),
    hasPolicy: c.policyVersion !== null,
    ledStrings: c.productModel.ledStrings,
    ledsPerString: c.productModel.ledsPerString,
  };
}

export function currentFilingIssues(c: LoadedClaim): FilingIssue[] {
  return filingIssues(claimFieldsOf(c), filingContextOf(c));
}

async function recipientsOf(m: EntityManager, organizationId: string, role: 'reviewer' | 'administrator') {
  const users = await m.find(User, {
    where: { organizationId, status: 'active' },
    select: { id: true, email: true, name: true, roles: true },
  });
  return users.filter((u) => u.roles.includes(role));
}

export function createClaimsService(
  ds: AppDataSource,
  opts: { publicUrl: (path: string) => string; evidence?: EvidenceCounter },
) {
  const repo = ds.getRepository(Claim);
  const countEvidence = opts.evidence ?? noEvidence;

  const loadWith = (m: EntityManager, id: string, lock = false) => {
    const qb = m.createQueryBuilder(Claim, 'c').where('c.id = :id', { id });
    if (lock) return qb.setLock('pessimistic_write').getOne();
    return qb.getOne();
  };

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
    // Inside a transaction the statement runs on the transaction's connection; outside, straight on the pool.
    const sql = detailSqlOf(false);
    const [row] = (m === ds.manager ? await readRows(ds, sql, [id]) : await m.query(sql, [id])) as Record<
      string,
      unknown
    >[];
    return row ? loadedClaimOf(row) : null;
  }

  /**
   * A claim with its history (with the actors' names and organisations) and its files, for its page: one
   * statement. The caller authorises on the claim before it shows any of it.
   */
  async function findForPage(id: string) {
    const [row] = await readRows<Record<string, unknown>>(ds, detailSqlOf(true), [id, id, id]);
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

  /** Evaluates a claim now, as it stands: the same input the form's live view builds. */
  async function evaluate(m: EntityManager, c: LoadedClaim, filedOn: string) {
    const evidence = await countEvidence(m, c.id);
    const result = safeEvaluateClaim(engineInputOfClaim(c, evidence, filedOn));
    if (!result.ok) {
      throw new AppError(
        422,
        'claim.incomplete',
        'The claim cannot be evaluated yet: some fields are missing or do not fit the product.',
        result.issues.map((i) => ({ path: i.path.replace(/^claim\./, ''), message: i.message })),
      );
    }
    return result.evaluation;
  }

  /** Filing's work, inside the caller's transaction (see file below). */
  async function fileIn(
    m: EntityManager,
    claimId: string,
    user: SessionUser,
    actor: Actor,
    when: { version?: number },
  ): Promise<{ id: string; replayed: boolean }> {
    // The row lock makes a second, simultaneous request wait here and then see the claim filed.
    const locked = await loadWith(m, claimId, true);
    if (!locked) throw new AppError(404, 'not_found', 'That claim does not exist or is not shared with you.');
    const move = canPerform(locked, toAbilityUser(user), 'file');
    if (!move.ok) {
      // Already filed (and anywhere past it): the same claim again, so a retry or a double tap files once.
      if (move.code === 'claim.invalid_transition' && locked.stage !== 'withdrawn')
        return { id: claimId, replayed: true };
      refuse(move);
    }
    if (when.version !== undefined && when.version !== locked.version) {
      throw conflict(
        'claim.changed',
        'This draft was changed elsewhere since you opened it. Reload, check it and file again.',
      );
    }
    const c = (await findById(claimId, m))!;
    const stored = claimFieldsSchema.safeParse(claimFieldsOf(c));
    const issues = stored.success
      ? currentFilingIssues(c)
      : stored.error.issues.map((i) => ({ path: i.path.map(String).join('.'), message: i.message }));
    if (issues.length) {
      throw new AppError(
        422,
        'claim.incomplete',
        'The claim is not ready to file: fill in the fields listed.',
        issues,
      );
    }
    const now = clock.now();
    const evaluation: Evaluation = await evaluate(m, c, now.toISOString().slice(0, 10));
    await crashPoint('claim.file.after_evaluation', m);
    let number = '';
    for (let attempt = 0; ; attempt++) {
      number = newClaimNumber(now);
      try {
        await m
          .createQueryBuilder()
          .update(Claim)
          .set({
            number,
            stage: 'filed',
            stageChangedAt: now,
            waitingOn: 'manufacturer',
            units: c.units ?? c.serials.length,
            evaluation,
            engineVersion: evaluation.engineVersion,
            evaluatedAt: now,
            verdict: evaluation.verdict,
            expectedCredit: evaluation.computed.credit,
            currency: evaluation.computed.currency,
            filedAt: now,
            filedById: user.id,
            version: () => 'version + 1',
          })
          .where("id = :id AND stage = 'draft'", { id: claimId })
          .execute();
        break;
      } catch (err) {
        // A number already taken (about one in 20 million a month): draw again. InnoDB undoes only the statement.
        if (attempt < 5 && isDuplicate(err, 'uq_claims_number')) continue;
        throw err;
      }
    }
    await crashPoint('claim.file.after_update', m);
    await recordAudit(m, actor, {
      action: 'claim.filed',
      entityType: 'Claim',
      entityId: claimId,
      before: { stage: 'draft' },
      after: {
        stage: 'filed',
        number,
        verdict: evaluation.verdict,
        engineVersion: evaluation.engineVersion,
        expectedCredit: evaluation.computed.credit,
      },
    });
    await crashPoint('claim.file.after_audit', m);
    await enqueueWebhookEvent(m, {
      event: 'claim.filed',
      organizationIds: [c.contractorId, c.manufacturerId],
      data: {
        claim: claimRef({ ...c, id: claimId, number }, 'filed', c),
        verdict: evaluation.verdict,
        expectedCredit: evaluation.computed.credit,
        currency: evaluation.computed.currency,
      },
    });
    const view = {
      number,
      site: c.installation.siteName,
      city: c.installation.siteCity,
      contractor: c.contractor.name,
      manufacturer: c.manufacturer.name,
      model: `${c.productModel.modelNumber} ${c.productModel.name}`,
      units: c.units ?? c.serials.length,
      serials: c.serials.join(', ') || 'not given',
      failedOn: c.failedOn,
      verdictText: { covered: 'likely covered', review: 'needs a reviewer', excluded: 'likely excluded' }[
        evaluation.verdict
      ],
      credit: `${evaluation.computed.credit} ${evaluation.computed.currency}`,
      link: opts.publicUrl(`/claims/${claimId}`),
      filerName: user.name,
    };
    let reviewers = await recipientsOf(m, c.manufacturerId, 'reviewer');
    if (!reviewers.length) reviewers = await recipientsOf(m, c.manufacturerId, 'administrator');
    // The failure date written the way each recipient's organisation reads dates (shared/dates.ts).
    const failedFor = (org: Organization) =>
      c.failedOn ? formatCalendarDate(c.failedOn, org, 'long') : 'not given';
    if (reviewers.length)
      await enqueueEmail(m, {
        to: reviewers.map((r) => r.email),
        template: 'claim-filed-manufacturer',
        view: { ...view, failedOn: failedFor(c.manufacturer) },
      });
    await enqueueEmail(m, {
      to: [user.email],
      template: 'claim-filed-confirmation',
      view: { ...view, name: user.name, failedOn: failedFor(c.contractor) },
    });
    await crashPoint('claim.file.before_commit', m);
    return { id: claimId, replayed: false };
  }

  return {
    findById,
    findForPage,

    async list(scope: Scope, q: ClaimListQuery) {
      const sort = parseSort(q.sort, SORTS)!;
      const w = new Conditions();
      if (scope.kind === 'contractor') w.and('c.contractor_id = ?', scope.orgId);
      else w.and("c.manufacturer_id = ? AND c.stage <> 'draft'", scope.orgId);
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
      // Two statements whatever the page size, run side by side: the page with its joins, and the total. Filtered by
      // stage alone (the usual list), the total is a sum over the claim counts the triggers keep
      // (server/lib/claim-counts.ts); with any other filter it is a count, which joins a table only for a filter on
      // it. Left joins on required keys keep the claims table first in the plan, so the page is read straight off
      // the (organisation, stage, sort column) index; the tie-break runs the same way as the sort so the index can
      // serve both. The SQL is written out (server/db/read.ts).
      const page = `SELECT ${LIST_COLUMNS}
          FROM claims c
          LEFT JOIN organizations co ON co.id = c.contractor_id
          LEFT JOIN organizations mo ON mo.id = c.manufacturer_id
          LEFT JOIN product_models p ON p.id = c.product_model_id
          LEFT JOIN installations i ON i.id = c.installation_id
          ${w.sql}
         ORDER BY ${sort.column} ${sort.direction}, c.id ${sort.direction}
         LIMIT ? OFFSET ?`;
      const count = byStageOnly(q)
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
      const [rows, [counted]] = await Promise.all([
        readRows<RawListRow>(ds, page, [...w.params, q.pageSize, (q.page - 1) * q.pageSize], {
          dateStrings: true,
        }),
        readRows<{ n: string | number }>(ds, count.sql, count.params),
      ]);
      return { items: rows.map(listRowOf), total: Number(counted?.n ?? 0) };
    },

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

    /**
     * Files a draft: validates it whole, evaluates it with the engine (the result stored with its version), gives
     * it a number, moves it to filed, audits and queues the e-mails, all in one transaction. Filing a claim that
     * is already filed answers it as it is (replayed), so a double tap or a retry makes one claim. With an
     * Idempotency-Key the answer is also kept under the key (see server/lib/idempotency.ts): the same key
     * replays it, the same key with another body is refused.
     */
    async file(
      claimId: string,
      user: SessionUser,
      actor: Actor,
      when: { version?: number } = {},
      idem?: { key: string },
    ) {
      if (!idem) return ds.transaction((m) => fileIn(m, claimId, user, actor, when));
      const path = `/api/claims/${claimId}/file`;
      const answer = await runIdempotent(
        ds,
        { key: idem.key, userId: user.id, route: FILE_ROUTE, method: 'POST', path, body: when },
        async (m) => {
          const r = await fileIn(m, claimId, user, actor, when);
          return { status: 200, body: { claimId: r.id, replayed: r.replayed } };
        },
      );
      const stored = answer.body as { claimId: string; replayed: boolean };
      return { id: stored.claimId, replayed: answer.replayed || stored.replayed };
    },

    async withdraw(target: LoadedClaim, reason: string | undefined, user: SessionUser, actor: Actor) {
      const move = canPerform(
        target,
        toAbilityUser(user),
        'withdraw',
        reason === undefined ? {} : { reason },
      );
      if (!move.ok) refuse(move);
      await ds.transaction(async (m) => {
        const now = clock.now();
        const result = await m
          .createQueryBuilder()
          .update(Claim)
          .set({ stage: 'withdrawn', stageChangedAt: now, waitingOn: null, version: () => 'version + 1' })
          .where('id = :id AND stage = :stage', { id: target.id, stage: target.stage })
          .execute();
        if (!result.affected)
          throw conflict('claim.changed', 'This claim changed just now. Reload and try again.');
        await recordAudit(m, actor, {
          action: 'claim.withdrawn',
          entityType: 'Claim',
          entityId: target.id,
          before: { stage: target.stage },
          after: { stage: 'withdrawn', reason: reason ?? null },
        });
        if (target.stage !== 'draft') {
          const reviewers = await recipientsOf(m, target.manufacturerId, 'reviewer');
          if (reviewers.length) {
            await enqueueEmail(m, {
              to: reviewers.map((r) => r.email),
              template: 'claim-withdrawn',
              view: {
                number: target.number,
                contractor: target.contractor.name,
                reason: reason || 'No reason given.',
                by: user.name,
                link: opts.publicUrl(`/claims/${target.id}`),
              },
            });
          }
        }
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

    async findMany(ids: string[]) {
      return ids.length ? ((await repo.find({ where: { id: In(ids) } })) as Claim[]) : [];
    },
  };
}

export type ClaimsService = ReturnType<typeof createClaimsService>;
