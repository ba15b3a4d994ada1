import { createBrowserRouter, type RouteObject } from 'react-router';
import { ErrorRoute } from './routes/error';
import { RouteError } from './routes/route-error';

// Every screen is its own lazily loaded module; the sign-in screen stays small. A screen that cannot draw
// without its record exports a `loader` that prefetches it into the query cache (see app/query-client.ts).
export const router = createBrowserRouter([
  {
    path: '/sign-in',
    lazy: () => import('./routes/sign-in').then((m) => ({ Component: m.SignInRoute })),
    errorElement: <ErrorRoute />,
  },
  {
    path: '/forgot-password',
    lazy: () => import('./routes/forgot-password').then((m) => ({ Component: m.ForgotPasswordRoute })),
    errorElement: <ErrorRoute />,
  },
  {
    path: '/reset-password/:token',
    lazy: () => import('./routes/reset-password').then((m) => ({ Component: m.ResetPasswordRoute })),
    errorElement: <ErrorRoute />,
  },
  {
    path: '/invitations/:token',
    lazy: () => import('./routes/invitation').then((m) => ({ Component: m.InvitationRoute })),
    errorElement: <ErrorRoute />,
  },
  {
    path: '/',
    lazy: () => import('./routes/app-root').then((m) => ({ Component: m.AppRoot })),
    errorElement: <ErrorRoute />,
    // Every screen in the shell has its own error element, so a failing screen keeps the navigation around it.
    children: (
      [
        { index: true, lazy: () => import('./routes/home').then((m) => ({ Component: m.HomeRoute })) },
        {
          path: 'account',
          lazy: () => import('./routes/account').then((m) => ({ Component: m.AccountRoute })),
        },
        {
          path: 'admin/users',
          lazy: () => import('./routes/admin/users').then((m) => ({ Component: m.UsersRoute })),
        },
        {
          path: 'admin/security-events',
          lazy: () =>
            import('./routes/admin/security-events').then((m) => ({ Component: m.SecurityEventsRoute })),
        },
        {
          path: 'security',
          lazy: () => import('./routes/security').then((m) => ({ Component: m.SecurityRoute })),
        },
        {
          path: 'admin/integrations',
          lazy: () => import('./routes/admin/integrations').then((m) => ({ Component: m.IntegrationsRoute })),
        },
        {
          path: 'api-reference',
          lazy: () => import('./routes/api-reference').then((m) => ({ Component: m.ApiReferenceRoute })),
        },
        {
          path: 'admin/mailbox',
          lazy: () => import('./routes/admin/mailbox').then((m) => ({ Component: m.MailboxRoute })),
        },
        {
          path: 'catalogue',
          lazy: () => import('./routes/catalogue/products').then((m) => ({ Component: m.ProductsRoute })),
        },
        {
          path: 'catalogue/new',
          lazy: () =>
            import('./routes/catalogue/product-new').then((m) => ({ Component: m.ProductNewRoute })),
        },
        {
          path: 'catalogue/:id',
          lazy: () =>
            import('./routes/catalogue/product').then((m) => ({
              Component: m.ProductRoute,
              loader: m.loader,
            })),
        },
        {
          path: 'policies',
          lazy: () => import('./routes/catalogue/policies').then((m) => ({ Component: m.PoliciesRoute })),
        },
        {
          path: 'policies/:id',
          lazy: () =>
            import('./routes/catalogue/policy').then((m) => ({ Component: m.PolicyRoute, loader: m.loader })),
        },
        {
          path: 'installations',
          lazy: () =>
            import('./routes/catalogue/installations').then((m) => ({ Component: m.InstallationsRoute })),
        },
        {
          path: 'installations/new',
          lazy: () =>
            import('./routes/catalogue/installation-new').then((m) => ({
              Component: m.InstallationNewRoute,
            })),
        },
        {
          path: 'installations/:id',
          lazy: () =>
            import('./routes/catalogue/installation').then((m) => ({
              Component: m.InstallationRoute,
              loader: m.loader,
            })),
        },
        {
          path: 'review',
          lazy: () => import('./routes/review/queue').then((m) => ({ Component: m.ReviewQueueRoute })),
        },
        {
          path: 'review/:id',
          lazy: () =>
            import('./routes/review/claim').then((m) => ({
              Component: m.ReviewClaimRoute,
              loader: m.loader,
            })),
        },
        {
          path: 'claims/:id/workflow',
          lazy: () =>
            import('./routes/claims/workflow').then((m) => ({
              Component: m.ClaimWorkflowRoute,
              loader: m.loader,
            })),
        },
        {
          path: 'claims',
          lazy: () => import('./routes/claims/claims').then((m) => ({ Component: m.ClaimsRoute })),
        },
        {
          path: 'claims/new',
          lazy: () => import('./routes/claims/claim-new').then((m) => ({ Component: m.ClaimNewRoute })),
        },
        {
          path: 'claims/batch',
          lazy: () => import('./routes/claims/claim-batch').then((m) => ({ Component: m.ClaimBatchRoute })),
        },
        {
          path: 'claims/:id',
          lazy: () =>
            import('./routes/claims/claim').then((m) => ({ Component: m.ClaimRoute, loader: m.loader })),
        },
        {
          path: 'analytics',
          lazy: () =>
            import('./routes/analytics/failure-analysis').then((m) => ({
              Component: m.FailureAnalysisRoute,
            })),
        },
        {
          path: 'reserve',
          lazy: () => import('./routes/analytics/reserve').then((m) => ({ Component: m.ReserveRoute })),
        },
        {
          path: 'credits',
          lazy: () => import('./routes/credits').then((m) => ({ Component: m.CreditsRoute })),
        },
        {
          path: 'waiting',
          lazy: () => import('./routes/waiting').then((m) => ({ Component: m.WaitingRoute })),
        },
        {
          path: 'ageing',
          lazy: () => import('./routes/ageing').then((m) => ({ Component: m.AgeingRoute })),
        },
        { path: '*', lazy: () => import('./routes/not-found').then((m) => ({ Component: m.NotFoundRoute })) },
      ] as RouteObject[]
    ).map((route) => ({ ...route, errorElement: <RouteError /> })),
  },
]);
