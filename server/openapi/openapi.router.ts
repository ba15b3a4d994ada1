import { Router } from 'express';
import { servedOpenApiDocument } from './document';

/**
 * GET /api/openapi.json: public (integrators read it before they have a token), built once per process and
 * cached by clients for five minutes, then revalidated against its ETag (a new release has a new document).
 */
export function openApiRouter() {
  const r = Router();
  r.get('/openapi.json', (req, res) => {
    const doc = servedOpenApiDocument();
    res.setHeader('Cache-Control', 'public, max-age=300, must-revalidate');
    res.setHeader('ETag', doc.etag);
    if (req.headers['if-none-match'] === doc.etag) return void res.status(304).end();
    res.type('application/json').send(doc.body);
  });
  return r;
}
