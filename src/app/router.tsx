import { createBrowserRouter } from 'react-router-dom';
import { ErrorRoute } from './routes/error';

// Every screen is its own lazily loaded module; the sign-in screen stays small.
export const router = createBrowserRouter([
  {
    path: '/sign-in',
    lazy: () => import('./routes/sign-in').then((m) => ({ Component: m.SignInRoute })),
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
    children: [
      { index: true, lazy: () => import('./routes/home').then((m) => ({ Component: m.HomeRoute })) },
      { path: 'admin/users', lazy: () => import('./routes/admin/users').then((m) => ({ Component: m.UsersRoute })) },
      { path: 'admin/mailbox', lazy: () => import('./routes/admin/mailbox').then((m) => ({ Component: m.MailboxRoute })) },
      { path: '*', lazy: () => import('./routes/not-found').then((m) => ({ Component: m.NotFoundRoute })) },
    ],
  },
]);
