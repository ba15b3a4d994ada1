import { cleanup, render, screen } from '@testing-library/react';
import { createMemoryRouter, Outlet, RouterProvider } from 'react-router';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { RouteError } from '../../src/app/routes/route-error';
import { ApiError } from '../../src/lib/api-client';

// Every screen inside the shell has RouteError as its error element: the shell stays, the screen explains.

afterEach(cleanup);

function renderAt(child: { loader?: () => unknown; Component?: () => never }) {
  const router = createMemoryRouter(
    [
      {
        path: '/',
        element: (
          <div>
            <nav aria-label="Main">Shell navigation</nav>
            <Outlet />
          </div>
        ),
        children: [{ path: 'thing', errorElement: <RouteError />, ...child }],
      },
    ],
    { initialEntries: ['/thing'] },
  );
  return render(<RouterProvider router={router} />);
}

describe('RouteError', () => {
  it('keeps the shell and says the screen could not be shown when it throws while drawing', async () => {
    vi.spyOn(console, 'error').mockImplementation(() => {}); // React reports the thrown error
    renderAt({
      Component: () => {
        throw new TypeError('x is undefined');
      },
    });
    expect(
      await screen.findByRole('heading', { name: 'This screen could not be shown' }),
    ).toBeInTheDocument();
    expect(screen.getByRole('navigation', { name: 'Main' })).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Reload' })).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Go to home' })).toHaveAttribute('href', '/');
    vi.restoreAllMocks();
  });

  it('reads a record the server says is missing (404) as a wrong address', async () => {
    renderAt({
      loader: () => {
        throw new ApiError(404, 'claim.not_found', 'No such claim.');
      },
    });
    expect(await screen.findByRole('heading', { name: 'Page not found' })).toBeInTheDocument();
    expect(screen.getByRole('navigation', { name: 'Main' })).toBeInTheDocument();
  });
});

describe('the app router', () => {
  it('gives every screen inside the shell its own error element, and the shell and outside routes theirs', async () => {
    const { router } = await import('../../src/app/router');
    const shell = router.routes.find((r) => r.path === '/')!;
    expect(shell.children!.length).toBeGreaterThan(20);
    for (const r of shell.children!) expect(r.errorElement, r.path ?? 'index').toBeTruthy();
    for (const r of router.routes) expect(r.errorElement, r.path).toBeTruthy();
    router.dispose();
  });
});
