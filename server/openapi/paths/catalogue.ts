import { z } from 'zod';
import { evaluationInputSchema, evaluationSchema } from '../../../shared/engine';
import { pageSchema } from '../../../shared/schemas/answer-parts';
import {
  createPolicySchema,
  historyEventSchema,
  importQuerySchema,
  importRequestSchema,
  importResultSchema,
  installationDetailSchema as installationDetail,
  installationInputSchema,
  installationListQuerySchema,
  installationSchema,
  policyDetailSchema as policyDetail,
  policyListQuerySchema,
  policySchema as policy,
  policyTermsSchema,
  policyVersionSchema,
  productInputSchema,
  productListQuerySchema,
  productSchema as product,
  updateInstallationSchema,
  updatePolicySchema,
  updateProductSchema,
} from '../../../shared/schemas/catalogue';
import { itemsOf } from '../answers';
import { op, type Registry } from '../registry';

const history = itemsOf(historyEventSchema);

export function cataloguePaths(reg: Registry) {
  const tag = 'Products, policies, installations';

  op(reg, {
    method: 'get',
    path: '/api/products',
    tag,
    summary: 'Product models',
    query: productListQuerySchema,
    answer: { json: pageSchema(product) },
  });
  op(reg, {
    method: 'post',
    path: '/api/products',
    tag,
    summary: 'Add a product model',
    body: productInputSchema,
    status: 201,
    answer: { json: z.object({ product }) },
    errors: [409],
  });
  importOps(reg, tag, 'products', 'product', 'product models');
  op(reg, {
    method: 'get',
    path: '/api/products/:id',
    tag,
    summary: 'One product model',
    answer: { json: z.object({ product }) },
  });
  op(reg, {
    method: 'patch',
    path: '/api/products/:id',
    tag,
    summary: 'Change a product model',
    body: updateProductSchema,
    answer: { json: z.object({ product }) },
    errors: [409],
  });
  op(reg, {
    method: 'get',
    path: '/api/products/:id/history',
    tag,
    summary: 'A product model’s changes',
    answer: { json: history },
  });

  op(reg, {
    method: 'get',
    path: '/api/policies',
    tag,
    summary: 'Warranty policies',
    query: policyListQuerySchema,
    answer: { json: pageSchema(policy) },
  });
  op(reg, {
    method: 'post',
    path: '/api/policies',
    tag,
    summary: 'Write a warranty policy',
    body: createPolicySchema,
    status: 201,
    answer: { json: z.object({ policy: policyDetail }) },
  });
  op(reg, {
    method: 'get',
    path: '/api/policies/:id',
    tag,
    summary: 'One policy with its versions',
    answer: { json: z.object({ policy: policyDetail }) },
  });
  op(reg, {
    method: 'patch',
    path: '/api/policies/:id',
    tag,
    summary: 'Rename a policy or change its products',
    body: updatePolicySchema,
    answer: { json: z.object({ policy: policyDetail }) },
  });
  op(reg, {
    method: 'post',
    path: '/api/policies/:id/versions',
    tag,
    summary: 'Add a version of the terms (claims keep the version they were filed under)',
    body: policyTermsSchema,
    status: 201,
    answer: { json: z.object({ policy: policyDetail, version: policyVersionSchema }) },
  });
  op(reg, {
    method: 'patch',
    path: '/api/policies/:id/versions/:versionId',
    tag,
    summary: 'Refused: a version of the terms is never changed',
    description: 'Always 409 `policy.version_immutable`: add a new version instead.',
    answer: { none: true, description: 'Never answered: every request is refused with 409.' },
    errors: [409],
  });
  op(reg, {
    method: 'get',
    path: '/api/policies/:id/history',
    tag,
    summary: 'A policy’s changes',
    answer: { json: history },
  });

  op(reg, {
    method: 'get',
    path: '/api/installations',
    tag,
    summary: 'Installations (sites where products were fitted)',
    query: installationListQuerySchema,
    answer: { json: pageSchema(installationSchema) },
  });
  op(reg, {
    method: 'post',
    path: '/api/installations',
    tag,
    summary: 'Record an installation',
    body: installationInputSchema,
    status: 201,
    answer: { json: z.object({ installation: installationDetail }) },
  });
  importOps(reg, tag, 'installations', 'installation', 'installations');
  op(reg, {
    method: 'get',
    path: '/api/installations/:id',
    tag,
    summary: 'One installation',
    answer: { json: z.object({ installation: installationDetail }) },
  });
  op(reg, {
    method: 'patch',
    path: '/api/installations/:id',
    tag,
    summary: 'Change an installation',
    body: updateInstallationSchema,
    answer: { json: z.object({ installation: installationDetail }) },
    errors: [409],
  });
  op(reg, {
    method: 'get',
    path: '/api/installations/:id/history',
    tag,
    summary: 'An installation’s changes',
    answer: { json: history },
  });

  op(reg, {
    method: 'post',
    path: '/api/evaluations',
    tag: 'Claims',
    summary: 'Run the evaluation engine on a claim’s facts (nothing is stored)',
    body: evaluationInputSchema,
    answer: { json: evaluationSchema },
  });
}

/** A CSV import's two routes: its template and the import itself (server/lib/csv-import.ts), alike for each. */
function importOps(reg: Registry, tag: string, resource: string, noun: string, records: string) {
  op(reg, {
    method: 'get',
    path: `/api/${resource}/import-template`,
    tag,
    summary: `The ${noun} import’s CSV template`,
    answer: { file: 'text/csv', description: 'The CSV header row the import takes.' },
  });
  op(reg, {
    method: 'post',
    path: `/api/${resource}/import`,
    tag,
    summary: `Import ${records} from CSV text (\`dryRun=true\` checks only)`,
    query: importQuerySchema,
    body: importRequestSchema,
    status: 201,
    alsoStatus: 200,
    answer: {
      json: importResultSchema,
      description: '201 when rows were imported; 200 on a dry run or when none were.',
    },
  });
}
