import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import express, { type Express, type Router } from 'express';
import helmet from 'helmet';
import { pinoHttp } from 'pino-http';
import type session from 'express-session';
import { createPassport } from './auth/passport';
import { createSessionStore, sessionMiddleware } from './auth/session';
import type { AppConfig } from './config/env';
import type { AppContext } from './context';
import type { AppDataSource } from './db/data-source';
import { armCrashPoint } from './lib/crash-point';
import { AppError } from './lib/errors';
import type { Logger } from './lib/logger';
import { createStorage, type Storage } from './lib/storage';
import { apiTokenAuth } from './middleware/api-token';
import { sessionPolicy } from './middleware/auth';
import { readYourWrites } from './middleware/read-your-writes';
import { bodyGate, jsonBodies } from './middleware/body';
import { errorHandler } from './middleware/error-handler';
import { requireSecondFactorEnrollment } from './middleware/second-factor';
import { sameOrigin } from './middleware/same-origin';
import { requireJsonBody } from './middleware/validate';
import { analyticsRouter } from './modules/analytics/analytics.router';
import { apiTokensRouter } from './modules/api-tokens/api-tokens.router';
import { authRouter } from './modules/auth/auth.router';
import { claimActionsRouter } from './modules/claim-actions/claim-actions.router';
import { accountingRouter } from './modules/credits/accounting.router';
import { claimCreditsRouter, creditsRouter } from './modules/credits/credits.router';
import { claimsRouter } from './modules/claims/claims.router';
import { evaluationsRouter } from './modules/evaluations/evaluations.router';
import { healthRouter } from './modules/health/health.router';
import { installationsRouter } from './modules/installations/installations.router';
import { invitationsRouter } from './modules/invitations/invitations.router';
import { mailboxRouter } from './modules/mailbox/mailbox.router';
import { passwordsRouter } from './modules/passwords/passwords.router';
import { organizationsRouter } from './modules/organizations/organizations.router';
import { savedViewsRouter } from './modules/saved-views/saved-views.router';
import { waitingRouter } from './modules/waiting/waiting.router';
import { ageingRouter } from './modules/ageing/ageing.router';
import { reviewRouter } from './modules/review/review.router';
import { policiesRouter } from './modules/policies/policies.router';
import { productsRouter } from './modules/products/products.router';
import { reserveRouter } from './modules/reserve/reserve.router';
import { secondFactorResetRouter, secondFactorRouter } from './modules/second-factor/second-factor.router';
import { securityEventsRouter } from './modules/security-events/security-events.router';
import { sessionsRouter } from './modules/sessions/sessions.router';
import { usersRouter } from './modules/users/users.router';
import { webhooksRouter } from './modules/webhooks/webhooks.router';
import { openApiRouter } from './openapi/openapi.router';

export type CreateAppOptions = {
  config: AppConfig;
  ds: AppDataSource;
  logger: Logger;
  databaseUrl: string;
  /** Where the built client lives; served when it exists. */
  clientDir?: string;
  /** Attachment storage; by default the one config.storage describes. */
  storage?: Storage;
  /** More routers under /api, after the built-in ones and before the 404 (tests mount test-only owners here). */
  mountApi?: (api: Router, ctx: AppContext) => void;
};

export type App = Express & { close: () => Promise<void>; sessionStore: session.Store };

export function createApp(opts: CreateAppOptions): App {
  const { config, ds, logger } = opts;
  const app = express() as App;
  const base = config.publicUrl ?? `http://${config.host}:${config.port}`;
  const storage = opts.storage ?? createStorage(config);
  armCrashPoint(config.testCrashPoint);
  const ctx: AppContext = { config, ds, logger, storage, publicUrl: (p) => new URL(p, base).toString() };

  app.disable('x-powered-by');
  app.set('trust proxy', config.trustProxy ? 1 : false);
  app.set('query parser', 'simple');
  // No ETags: every API answer is Cache-Control: no-store, so hashing each body bought nothing; the built client's
  // files are served with their own validators (express.static).
  app.set('etag', false);

  app.use(
    pinoHttp({
      logger,
      genReqId: (_req, res) => {
        const id = crypto.randomUUID();
        res.setHeader('X-Request-Id', id);
        return id;
      },
      autoLogging: config.env !== 'test',
      serializers: { req: (req) => ({ id: req.id, method: req.method, url: req.url }) },
    }),
  );

  // Only our own origin: scripts, styles, fonts and images all ship with the app.
  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: false,
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          styleSrc: ["'self'"],
          fontSrc: ["'self'"],
          imgSrc: ["'self'", 'data:', 'blob:'],
          connectSrc: ["'self'"],
          objectSrc: ["'none'"],
          baseUri: ["'self'"],
          formAction: ["'self'"],
          frameAncestors: ["'none'"],
          ...(config.publicUrl?.startsWith('https://') ? { upgradeInsecureRequests: [] } : {}),
        },
      },
      crossOriginEmbedderPolicy: false,
      referrerPolicy: { policy: 'same-origin' },
      strictTransportSecurity: config.publicUrl?.startsWith('https://') ? undefined : false,
    }),
  );

  // With read replicas: a client's reads right after its own write go to the primary.
  const readRouting = ds.driver.isReplicated ? readYourWrites(config) : null;
  if (readRouting) app.use(readRouting);

  const sessionStore = createSessionStore(ds);
  const pp = createPassport(ds);
  const api = express.Router();
  api.use((_req, res, next) => {
    res.setHeader('Cache-Control', 'no-store');
    next();
  });
  api.use(sameOrigin(config.publicUrl));
  api.use(requireJsonBody);
  api.use('/health', healthRouter(ctx));
  // The API's own description: public, before any session or token is read.
  api.use(openApiRouter());
  // A bearer token authenticates on its own: no session is read or written for it.
  const tokens = apiTokenAuth(ctx);
  api.use(tokens.authenticate);
  api.use(tokens.unlessToken(sessionMiddleware(config, sessionStore)));
  api.use(pp.initialize());
  api.use(tokens.unlessToken(pp.session()));
  api.use(sessionPolicy({ demoMode: config.mode === 'demo' }));
  // The session first, then the body: a signed-out request is refused on its headers, and each route reads at
  // most its own limit (server/middleware/body.ts).
  if (readRouting) api.use(readRouting);
  api.use(bodyGate);
  api.use(jsonBodies());
  api.use(requireSecondFactorEnrollment(config));
  // An API token acts within the product's records; it never signs in or out, nor touches passwords, factors
  // or sessions (it has no session). Who it is stays readable.
  api.use('/auth', (req, _res, next) =>
    req.apiToken && !(req.method === 'GET' && req.path === '/me')
      ? next(
          new AppError(
            403,
            'api_token.not_allowed',
            'An API token cannot manage sign-in, passwords or sessions.',
          ),
        )
      : next(),
  );
  api.use('/auth/password', passwordsRouter(ctx));
  api.use('/auth', secondFactorRouter(ctx));
  api.use('/auth/sessions', sessionsRouter(ctx));
  api.use('/auth', authRouter(ctx, pp));
  api.use('/invitations', invitationsRouter(ctx));
  api.use('/users', secondFactorResetRouter(ctx));
  api.use('/users', usersRouter(ctx));
  api.use('/organizations', organizationsRouter(ctx));
  api.use('/security-events', securityEventsRouter(ctx));
  api.use('/api-tokens', apiTokensRouter(ctx));
  api.use('/webhooks', webhooksRouter(ctx));
  api.use('/evaluations', evaluationsRouter());
  api.use('/products', productsRouter(ctx));
  api.use('/policies', policiesRouter(ctx));
  api.use('/installations', installationsRouter(ctx));
  // The review workflow's and the credits' routes first: they are specific paths under /:id; the claims router
  // has the rest.
  api.use('/claims', claimActionsRouter(ctx));
  api.use('/claims', claimCreditsRouter(ctx));
  api.use('/claims', claimsRouter(ctx));
  api.use('/review', reviewRouter(ctx));
  api.use('/credits', accountingRouter(ctx));
  api.use('/credits', creditsRouter(ctx));
  api.use('/analytics', analyticsRouter(ctx));
  api.use('/reserve', reserveRouter(ctx));
  api.use('/saved-views', savedViewsRouter(ctx));
  api.use('/waiting', waitingRouter(ctx));
  api.use('/ageing', ageingRouter(ctx));
  if (config.mode === 'demo') api.use('/mailbox', mailboxRouter(ctx));
  opts.mountApi?.(api, ctx);
  api.use((req, _res, next) =>
    next(new AppError(404, 'route.not_found', `No route ${req.method} ${req.baseUrl}${req.path}.`)),
  );
  app.use('/api', api);

  const clientDir = opts.clientDir;
  if (clientDir && fs.existsSync(path.join(clientDir, 'index.html'))) {
    app.use(
      '/assets',
      express.static(path.join(clientDir, 'assets'), { immutable: true, maxAge: '1y', fallthrough: false }),
    );
    app.use(express.static(clientDir, { index: false, maxAge: '1h' }));
    const indexHtml = fs.readFileSync(path.join(clientDir, 'index.html'));
    app.get(/^(?!\/api\/).*/, (_req, res) => {
      res.setHeader('Cache-Control', 'no-cache');
      res.type('html').send(indexHtml);
    });
  }

  app.use(errorHandler);
  app.sessionStore = sessionStore;
  app.close = async () => {
    await (sessionStore as unknown as { close(): Promise<void> }).close();
  };
  return app;
}
