import { Link } from 'react-router';
import { Logo } from '../../components/layout/logo';
import { Card } from '../../components/ui/card';
import { ForgotPasswordForm } from '../../features/auth/components/password-forms';

export function ForgotPasswordRoute() {
  return (
    <main className="flex min-h-dvh flex-col items-center justify-center bg-gradient-to-b from-brand-50 to-ink-50 px-4 py-10">
      <div className="w-full max-w-sm">
        <div className="mb-6 text-center">
          <Logo className="text-2xl text-ink-950" />
        </div>
        <Card className="p-5 sm:p-6">
          <h1 className="mb-3 text-lg font-semibold text-ink-950">Forgot your password?</h1>
          <ForgotPasswordForm />
        </Card>
        <p className="mt-4 text-center text-sm">
          <Link to="/sign-in" className="inline-block py-2 font-medium text-brand-800 underline">
            Back to sign in
          </Link>
        </p>
      </div>
    </main>
  );
}
