import { useParams } from 'react-router';
import { Logo } from '../../components/layout/logo';
import { Card } from '../../components/ui/card';
import { ResetPasswordForm } from '../../features/auth/components/password-forms';

export function ResetPasswordRoute() {
  const { token = '' } = useParams();
  return (
    <main className="flex min-h-dvh flex-col items-center justify-center bg-gradient-to-b from-brand-50 to-ink-50 px-4 py-10">
      <div className="w-full max-w-sm">
        <div className="mb-6 text-center">
          <Logo className="text-2xl text-ink-950" />
        </div>
        <Card className="p-5 sm:p-6">
          <h1 className="mb-3 text-lg font-semibold text-ink-950">Choose a new password</h1>
          <ResetPasswordForm token={token} />
        </Card>
      </div>
    </main>
  );
}
