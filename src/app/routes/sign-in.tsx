import { useQuery } from '@tanstack/react-query';
import { Link, Navigate, useNavigate, useSearchParams } from 'react-router';
import { Logo } from '../../components/layout/logo';
import { Card } from '../../components/ui/card';
import { authQueries } from '../../features/auth/api/auth-queries';
import { SignInForm } from '../../features/auth/components/sign-in-form';

function safeNext(next: string | null) {
  return next && next.startsWith('/') && !next.startsWith('//') ? next : '/';
}

export function SignInRoute() {
  const navigate = useNavigate();
  const [params] = useSearchParams();
  const session = useQuery(authQueries.me());
  const next = safeNext(params.get('next'));
  if (session.data) return <Navigate to={next} replace />;
  return (
    <main className="flex min-h-dvh flex-col items-center justify-center bg-gradient-to-b from-brand-50 to-ink-50 px-4 py-10">
      <div className="w-full max-w-sm">
        <div className="mb-6 text-center">
          <Logo className="text-2xl text-ink-950" />
          <p className="mt-2 text-sm text-ink-600">Warranty and return claims for commercial LED lighting</p>
        </div>
        <Card className="p-5 sm:p-6">
          <h1 className="mb-4 text-lg font-semibold text-ink-950">Sign in</h1>
          <SignInForm onSignedIn={() => navigate(next, { replace: true })} />
          <p className="mt-3 text-center text-sm">
            <Link to="/forgot-password" className="inline-block py-2 font-medium text-brand-800 underline">
              Forgot password?
            </Link>
          </p>
        </Card>
        {params.get('ended') ? (
          <p role="status" className="mt-4 text-center text-sm text-ink-600">
            Your session has ended. Sign in again to carry on.
          </p>
        ) : null}
      </div>
    </main>
  );
}
