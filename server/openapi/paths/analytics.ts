import {
  claimsAgeingQuerySchema,
  claimsAgeingSchema,
  failureModesQuerySchema,
  failureModesSchema,
  lifeAnalysisSchema,
  lifeQuerySchema,
  reserveQuerySchema,
  reserveSchema,
} from '../../../shared/schemas/analytics';
import { ageingSchema, updateStageTargetsSchema } from '../../../shared/schemas/ageing';
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
      json: lifeAnalysisSchema,
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
      json: failureModesSchema,
      ...csv,
    },
  });
  op(reg, {
    method: 'get',
    path: '/api/analytics/claims-ageing',
    tag,
    summary: 'Open claims by age band, and weekly throughput',
    query: claimsAgeingQuerySchema,
    answer: { json: claimsAgeingSchema, ...csv },
  });
  op(reg, {
    method: 'get',
    path: '/api/reserve',
    tag,
    summary: 'The warranty reserve forecast per month and cohort',
    query: reserveQuerySchema,
    answer: {
      json: reserveSchema,
      ...csv,
    },
  });
  op(reg, {
    method: 'get',
    path: '/api/ageing',
    tag,
    summary: 'How long claims have sat in each stage, against the targets',
    answer: {
      json: ageingSchema,
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
      json: ageingSchema,
    },
  });
}
