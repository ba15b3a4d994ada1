import { Router } from 'express';
import { z } from 'zod';
import {
  createPolicySchema,
  policyListQuerySchema,
  policyTermsSchema,
  updatePolicySchema,
} from '../../../shared/schemas/catalogue';
import type { AppContext } from '../../context';
import { actorFromRequest } from '../../lib/audit';
import { conflict } from '../../lib/errors';
import { loadHistory } from '../../lib/history';
import { pageOf } from '../../lib/pagination';
import { authorize, authorizeNew, authorizeType, requireUser } from '../../middleware/auth';
import { parseBody, parseQuery, parseWith } from '../../middleware/validate';
import { presentPolicy, presentPolicyDetail } from './policies.presenter';
import { createPoliciesService } from './policies.service';

const idParam = z.strictObject({ id: z.uuid({ error: 'Not a valid id.' }) });
const versionParam = z.strictObject({
  id: z.uuid({ error: 'Not a valid id.' }),
  versionId: z.uuid({ error: 'Not a valid id.' }),
});

export function policiesRouter(ctx: AppContext) {
  const r = Router();
  const service = createPoliciesService(ctx.ds);
  r.use(requireUser);

  const detailOf = async (id: string) => {
    const policy = (await service.findById(id))!;
    const { versions, models } = await service.detail(policy);
    return presentPolicyDetail(policy, versions, models);
  };

  r.get('/', async (req, res) => {
    authorizeType(req, 'read', 'WarrantyPolicy');
    const q = parseQuery(policyListQuerySchema, req);
    const { items, total, models } = await service.list(q);
    res.json(
      pageOf(
        items.map((p) => presentPolicy(p, models)),
        total,
        q,
      ),
    );
  });

  r.post('/', async (req, res) => {
    const input = parseBody(createPolicySchema, req);
    authorizeNew(req, 'create', 'WarrantyPolicy', { manufacturerId: req.user!.organizationId });
    const id = await service.create(req.user!.organizationId, input, actorFromRequest(req));
    res.status(201).json({ policy: await detailOf(id) });
  });

  r.get('/:id', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const policy = await service.findById(id);
    authorize(req, 'read', 'WarrantyPolicy', policy, 'policy');
    res.json({ policy: await detailOf(id) });
  });

  r.patch('/:id', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const input = parseBody(updatePolicySchema, req);
    const policy = await service.findById(id);
    authorize(req, 'update', 'WarrantyPolicy', policy, 'policy');
    await service.update(policy, input, actorFromRequest(req));
    res.json({ policy: await detailOf(id) });
  });

  r.post('/:id/versions', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const terms = parseBody(policyTermsSchema, req);
    const policy = await service.findById(id);
    authorize(req, 'update', 'WarrantyPolicy', policy, 'policy');
    const versionId = await service.addVersion(policy, terms, actorFromRequest(req));
    const detail = await detailOf(id);
    res.status(201).json({ policy: detail, version: detail.versions.find((v) => v.id === versionId) });
  });

  // Versions are immutable: an edit is a new version (POST above). The refusal comes after loading and
  // authorising, so a stranger still sees 404 and a reader without rights 403.
  r.patch('/:id/versions/:versionId', async (req, res) => {
    const { id, versionId } = parseWith(versionParam, req.params, 'address');
    const policy = await service.findById(id);
    authorize(req, 'read', 'WarrantyPolicy', policy, 'policy');
    const version = await service.findVersion(id, versionId);
    authorize(req, 'update', 'WarrantyPolicy', version ? policy : null, 'policy version');
    void res;
    throw conflict(
      'policy.version_immutable',
      'A policy version cannot be changed once written. Add a new version with the new terms instead.',
    );
  });

  r.get('/:id/history', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const policy = await service.findById(id);
    authorize(req, 'read', 'WarrantyPolicy', policy, 'policy');
    res.json({ items: await loadHistory(ctx.ds, 'WarrantyPolicy', id, req.user!.organizationId) });
  });

  return r;
}
