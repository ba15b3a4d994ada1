import { Router } from 'express';
import { z } from 'zod';
import {
  importQuerySchema,
  importRequestSchema,
  productInputSchema,
  productListQuerySchema,
  updateProductSchema,
} from '../../../shared/schemas/catalogue';
import type { AppContext } from '../../context';
import { actorFromRequest } from '../../lib/audit';
import { templateCsv } from '../../lib/csv-import';
import { loadHistory } from '../../lib/history';
import { pageOf } from '../../lib/pagination';
import { authorize, authorizeNew, authorizeType, requireUser } from '../../middleware/auth';
import { parseBody, parseQuery, parseWith } from '../../middleware/validate';
import { presentProduct } from './products.presenter';
import { createProductsService, PRODUCT_COLUMNS } from './products.service';

const idParam = z.strictObject({ id: z.uuid({ error: 'Not a valid id.' }) });

export function productsRouter(ctx: AppContext) {
  const r = Router();
  const service = createProductsService(ctx.ds);
  r.use(requireUser);

  r.get('/', async (req, res) => {
    authorizeType(req, 'read', 'ProductModel');
    const q = parseQuery(productListQuerySchema, req);
    const { items, total } = await service.list(q);
    res.json(pageOf(items.map(presentProduct), total, q));
  });

  r.post('/', async (req, res) => {
    const input = parseBody(productInputSchema, req);
    authorizeNew(req, 'create', 'ProductModel', { manufacturerId: req.user!.organizationId });
    const id = await service.create(req.user!.organizationId, input, actorFromRequest(req));
    res.status(201).json({ product: presentProduct((await service.findById(id))!) });
  });

  r.get('/import-template', (req, res) => {
    authorizeType(req, 'create', 'ProductModel');
    res.type('text/csv').attachment('lumenproof-products-template.csv').send(templateCsv(PRODUCT_COLUMNS));
  });

  r.post('/import', async (req, res) => {
    const { dryRun } = parseQuery(importQuerySchema, req);
    const input = parseBody(importRequestSchema, req);
    authorizeNew(req, 'create', 'ProductModel', { manufacturerId: req.user!.organizationId });
    const result = await service.importRows(req.user!.organizationId, input, dryRun, actorFromRequest(req));
    res.status(dryRun || result.imported === 0 ? 200 : 201).json(result);
  });

  r.get('/:id', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const product = await service.findById(id);
    authorize(req, 'read', 'ProductModel', product, 'product');
    res.json({ product: presentProduct(product) });
  });

  r.patch('/:id', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const input = parseBody(updateProductSchema, req);
    const product = await service.findById(id);
    authorize(req, 'update', 'ProductModel', product, 'product');
    await service.update(product, input, actorFromRequest(req));
    res.json({ product: presentProduct((await service.findById(id))!) });
  });

  r.get('/:id/history', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const product = await service.findById(id);
    authorize(req, 'read', 'ProductModel', product, 'product');
    res.json({ items: await loadHistory(ctx.ds, 'ProductModel', id, req.user!.organizationId) });
  });

  return r;
}
