import { isRouteErrorResponse, Link, useRouteError } from 'react-router';
import { buttonClasses } from '../../components/ui/button';
import { Logo } from '../../components/layout/logo';
import { cn } from '../../lib/cn';

export function ErrorRoute() {
  const error = useRouteError();
  const notFound = isRouteErrorResponse(error) && error.status === 404;
  return (
    <main className="grid min-h-dvh place-items-center px-6">
      <div className="max-w-md text-center">
        <Logo className="mb-8 text-lg text-ink-950" />
        <h1 className="text-2xl font-bold text-ink-950">
          {notFound ? 'Page not found' : 'Something went wrong'}
        </h1>
        <p className="mt-2 text-ink-600">
          {notFound
            ? 'That address does not lead anywhere in Lumenproof.'
            : 'The screen could not be shown. Reload the page; if it happens again, tell your administrator.'}
        </p>
        <ErrorActions className="mt-6" />
      </div>
    </main>
  );
}

/** The two ways out of a screen that could not be shown: reload it, or go home. */
export function ErrorActions({ className }: { className?: string }) {
  return (
    <div className={cn('flex flex-wrap justify-center gap-2', className)}>
      <button type="button" className={buttonClasses('secondary')} onClick={() => window.location.reload()}>
        Reload
      </button>
      <Link to="/" className={buttonClasses('primary')}>
        Go to home
      </Link>
    </div>
  );
}
