import {
  claimsAgeingQuerySchema,
  failureModesQuerySchema,
  lifeQuerySchema,
  reserveQuerySchema,
} from '../../../shared/schemas/analytics';
import { updateStageTargetsSchema } from '../../../shared/schemas/ageing';
import { openObject } from '../answers';
import { op, type Registry } from '../registry';

export function analyticsPaths(reg: Registry) {
  const tag = 'Reliability and reserve';
  const csv = { or: 'text/csv', description: 'JSON by default; `format=csv` the chosen `table` as CSV.' };
  op(reg, {
    method: 'get',
    path: '/api/analytics/life',
    tag,
    summary: 'Life data and a Weibull fit for a model, family or lot',
    query: lifeQuerySchema,
    answer: {
      json: openObject(
        'The population, its life data, the Weibull fit, probability plot and Kaplan-Meier rows',
      ),
      ...csv,
    },
  });
  op(reg, {
    method: 'get',
    path: '/api/analytics/failure-modes',
    tag,
    summary: 'Failure modes ranked, by environment, lot and contractor',
    query: failureModesQuerySchema,
    answer: {
      json: openObject('Failure modes ranked, cross tables by environment, lots, contractors and ageing'),
      ...csv,
    },
  });
  op(reg, {
    method: 'get',
    path: '/api/analytics/claims-ageing',
    tag,
    summary: 'Open claims by age band, and weekly throughput',
    query: claimsAgeingQuerySchema,
    answer: { json: openObject('Open claims per age band and side, decisions per week'), ...csv },
  });
  op(reg, {
    method: 'get',
    path: '/api/reserve',
    tag,
    summary: 'The warranty reserve forecast per month and cohort',
    query: reserveQuerySchema,
    answer: {
      json: openObject('Forecast credits per month and currency, per cohort, and the fits used'),
      ...csv,
    },
  });
  op(reg, {
    method: 'get',
    path: '/api/ageing',
    tag,
    summary: 'How long claims have sat in each stage, against the targets',
    answer: {
      json: openObject('Targets, counts per stage and reviewer by age bucket, and the overdue claims'),
    },
  });
  op(reg, {
    method: 'get',
    path: '/api/ageing/export',
    tag,
    summary: 'The ageing view as CSV',
    answer: { file: 'text/csv', description: 'The stages and reviewers by age bucket.' },
  });
  op(reg, {
    method: 'put',
    path: '/api/ageing/targets',
    tag,
    summary: 'Set the days a claim may sit in each stage (administrators)',
    body: updateStageTargetsSchema,
    answer: {
      json: openObject('Targets, counts per stage and reviewer by age bucket, and the overdue claims'),
    },
  });
}
