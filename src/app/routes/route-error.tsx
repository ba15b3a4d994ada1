import { RotateCcw } from 'lucide-react';
import { isRouteErrorResponse, useRouteError } from 'react-router';
import { Card } from '../../components/ui/card';
import { EmptyState } from '../../components/ui/empty-state';
import { ApiError } from '../../lib/api-client';
import { ErrorActions } from './error';
import { NotFoundRoute } from './not-found';

/**
 * The error element of every screen inside the shell: a screen that fails to load or to draw says so in its
 * place, and the navigation stays usable. A missing or unshared record reads like a wrong address.
 */
export function RouteError() {
  const error = useRouteError();
  const missing =
    (isRouteErrorResponse(error) && error.status === 404) ||
    (error instanceof ApiError && (error.status === 404 || error.status === 400));
  if (missing) return <NotFoundRoute />;
  return (
    <Card>
      <EmptyState
        icon={<RotateCcw className="size-6" />}
        title="This screen could not be shown"
        action={<ErrorActions />}
      >
        Reload the page; if it happens again, tell your administrator.
      </EmptyState>
    </Card>
  );
}
