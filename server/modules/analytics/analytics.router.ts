import { Router, type Request } from 'express';
import { FAILURE_MODE_LABELS } from '../../../shared/analytics/failure-mode-rules';
import {
  ageingTableFromCounts,
  failureModesByEnvironment,
  rankByContractor,
  rankByEnvironment,
  rankByLot,
  rankFailureModes,
} from '../../../shared/analytics/failure-modes';
import { kaplanMeier } from '../../../shared/analytics/kaplan-meier';
import { probabilityPlot } from '../../../shared/analytics/weibull';
import {
  claimsAgeingQuerySchema,
  ENVIRONMENT_FACTOR_KEYS,
  failureModesQuerySchema,
  lifeQuerySchema,
  type ClaimsAgeingDto,
  type FailureModesDto,
  type LifeAnalysisDto,
} from '../../../shared/schemas/analytics';
import type { ProductFamily } from '../../../shared/schemas/catalogue';
import type { AppContext } from '../../context';
import { clock } from '../../lib/clock';
import { notFound } from '../../lib/errors';
import { authorize, authorizeType, requireUser } from '../../middleware/auth';
import { parseQuery } from '../../middleware/validate';
import { claimsAgeingCsv, failureModesCsv, lifeCsv, sendCsv } from './analytics.presenter';
import {
  createAnalyticsService,
  presentPopulation,
  type AnalyticsService,
  type Population,
} from './analytics.service';

/**
 * The population a query names, loaded and authorised: a model of another manufacturer (or none) is 404, as is
 * a lot the manufacturer has never installed; a family is the manufacturer's own models of that family.
 */
export async function resolvePopulation(
  req: Request,
  service: AnalyticsService,
  q: { productModelId?: string; family?: string; lot?: string },
): Promise<Population> {
  const manufacturerId = req.user!.organizationId;
  if (q.productModelId) {
    const model = await service.findModel(q.productModelId);
    authorize(
      req,
      'read',
      'Analytics',
      model ? { manufacturerId: model.manufacturerId } : null,
      'product model',
    );
    return { kind: 'model', productModelId: model!.id, label: `${model!.modelNumber} ${model!.name}` };
  }
  if (q.family) {
    const family = q.family as ProductFamily;
    return { kind: 'family', family, label: service.familyLabel(family) };
  }
  const p: Population = { kind: 'lot', lot: q.lot!, label: `Lot ${q.lot}` };
  if (!(await service.hasPopulation(manufacturerId, p))) throw notFound('lot');
  return p;
}

export function analyticsRouter(ctx: AppContext) {
  const r = Router();
  const service = createAnalyticsService(ctx.ds);
  r.use(requireUser);

  // Time to failure: the Weibull fit, its probability plot and Kaplan-Meier, from the installed base.
  r.get('/life', async (req, res) => {
    authorizeType(req, 'read', 'Analytics');
    const q = parseQuery(lifeQuerySchema, req);
    const population = await resolvePopulation(req, service, q);
    const asOf = q.asOf ?? clock.today();
    // By default ages at the middle of the month (or day) they fell in, so a failure in the first month can be fitted.
    const life = await service.lifeData(req.user!.organizationId, population, {
      asOf,
      unit: q.ageUnit,
      midpoint: q.age === 'midpoint',
    });
    const result = service.fit(life, q.method);
    const data = { failures: life.failures, suspensions: life.suspensions };
    const dto: LifeAnalysisDto = {
      population: presentPopulation(population),
      lifeData: {
        unit: q.ageUnit,
        age: q.age,
        asOf,
        units: life.units,
        failed: life.failed,
        survivors: life.units - life.failed,
        excessFailures: life.excessFailures,
        failureGroups: life.failures,
        suspensionGroups: life.suspensions,
      },
      fit: result.ok ? result.fit : null,
      fitError: result.ok ? null : { code: `fit.${result.code}`, message: result.message },
      probabilityPlot: result.ok ? probabilityPlot(data, result.fit) : null,
      kaplanMeier: life.units > 0 ? kaplanMeier(data) : [],
    };
    if (q.format === 'csv') return sendCsv(res, lifeCsv(dto, q.table));
    res.json(dto);
  });

  // Where the failures come from: modes, environment, lot, contractor, and the install-month x age table.
  r.get('/failure-modes', async (req, res) => {
    authorizeType(req, 'read', 'Analytics');
    const q = parseQuery(failureModesQuerySchema, req);
    const population = await resolvePopulation(req, service, q);
    const asOf = q.asOf ?? clock.today();
    const { envRows, lotRows, cells } = await service.failureGroups(
      req.user!.organizationId,
      population,
      asOf,
    );
    const dto: FailureModesDto = {
      population: presentPopulation(population),
      asOf,
      claims: envRows.reduce((n, r) => n + (r.claims ?? 1), 0),
      modes: rankFailureModes(envRows).map((m) => ({ ...m, label: FAILURE_MODE_LABELS[m.key] ?? m.key })),
      environment: Object.fromEntries(
        ENVIRONMENT_FACTOR_KEYS.map((f) => [f, rankByEnvironment(envRows, f)]),
      ) as FailureModesDto['environment'],
      crossTable: { ...failureModesByEnvironment(envRows, q.factor), factor: q.factor },
      lots: rankByLot(lotRows),
      contractors: rankByContractor(lotRows),
      ageing: ageingTableFromCounts(cells),
    };
    if (q.format === 'csv') return sendCsv(res, failureModesCsv(dto, q.table));
    res.json(dto);
  });

  // Open claims by how long they have waited and on whom; the reviewers' decisions per week.
  r.get('/claims-ageing', async (req, res) => {
    authorizeType(req, 'read', 'Analytics');
    const q = parseQuery(claimsAgeingQuerySchema, req);
    const asOf = q.asOf ?? clock.today();
    const dto: ClaimsAgeingDto = {
      asOf,
      ...(await service.claimsAgeing(req.user!.organizationId, asOf, q.weeks)),
    };
    if (q.format === 'csv') return sendCsv(res, claimsAgeingCsv(dto, q.table));
    res.json(dto);
  });

  return r;
}
