import { Router } from 'express';
import { z } from 'zod';
import {
  importQuerySchema,
  importRequestSchema,
  installationListQuerySchema,
} from '../../../shared/schemas/catalogue';
import type { AppContext } from '../../context';
import { actorFromRequest } from '../../lib/audit';
import { templateCsv } from '../../lib/csv-import';
import { streamImport, wantsProgress } from '../../lib/import-stream';
import { AppError } from '../../lib/errors';
import { loadHistory } from '../../lib/history';
import { pageOf } from '../../lib/pagination';
import { authorize, authorizeNew, authorizeType, requireUser } from '../../middleware/auth';
import { parseBody, parseQuery, parseWith } from '../../middleware/validate';
import { presentInstallation, presentInstallationDetail } from './installations.presenter';
import {
  createInstallationsService,
  INSTALLATION_COLUMNS,
  installationSchemasNow,
} from './installations.service';

const idParam = z.strictObject({ id: z.uuid({ error: 'Not a valid id.' }) });

export function installationsRouter(ctx: AppContext) {
  const r = Router();
  const service = createInstallationsService(ctx.ds);
  r.use(requireUser);

  r.get('/', async (req, res) => {
    authorizeType(req, 'read', 'Installation');
    const q = parseQuery(installationListQuerySchema, req);
    const { items, total } = await service.list(req.ability, q);
    res.json(pageOf(items.map(presentInstallation), total, q));
  });

  r.post('/', async (req, res) => {
    const input = parseBody(installationSchemasNow().input, req);
    const product = await service.findProduct(input.productModelId);
    if (!product) {
      throw new AppError(400, 'validation.failed', 'The request body has invalid fields.', [
        { path: 'productModelId', message: 'No such product model in the catalogue.' },
      ]);
    }
    authorizeNew(req, 'create', 'Installation', {
      contractorId: req.user!.organizationId,
      manufacturerId: product.manufacturerId,
    });
    const id = await service.create(req.user!.organizationId, product, input, actorFromRequest(req));
    res.status(201).json({ installation: presentInstallationDetail((await service.findById(id))!) });
  });

  r.get('/import-template', (req, res) => {
    authorizeType(req, 'create', 'Installation');
    res
      .type('text/csv')
      .attachment('lumenproof-installations-template.csv')
      .send(templateCsv(INSTALLATION_COLUMNS));
  });

  r.post('/import', async (req, res) => {
    const { dryRun } = parseQuery(importQuerySchema, req);
    const input = parseBody(importRequestSchema, req);
    authorizeNew(req, 'create', 'Installation', { contractorId: req.user!.organizationId });
    if (wantsProgress(req))
      return streamImport(req, res, (onProgress) =>
        service.importRows(req.user!.organizationId, input, dryRun, actorFromRequest(req), onProgress),
      );
    const result = await service.importRows(req.user!.organizationId, input, dryRun, actorFromRequest(req));
    res.status(dryRun || result.imported === 0 ? 200 : 201).json(result);
  });

  r.get('/:id', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const inst = await service.findById(id);
    authorize(req, 'read', 'Installation', inst, 'installation');
    res.json({ installation: presentInstallationDetail(inst) });
  });

  r.patch('/:id', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const input = parseBody(installationSchemasNow().update, req);
    const inst = await service.findById(id);
    authorize(req, 'update', 'Installation', inst, 'installation');
    await service.update(inst, input, actorFromRequest(req));
    res.json({ installation: presentInstallationDetail((await service.findById(id))!) });
  });

  r.get('/:id/history', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const inst = await service.findById(id);
    authorize(req, 'read', 'Installation', inst, 'installation');
    res.json({ items: await loadHistory(ctx.ds, 'Installation', id, req.user!.organizationId) });
  });

  return r;
}
