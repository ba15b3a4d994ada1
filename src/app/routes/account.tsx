import { Link } from 'react-router';
import { ShieldCheck } from 'lucide-react';
import { Card } from '../../components/ui/card';
import { PageHeader } from '../../components/ui/page-header';
import { ChangePasswordForm } from '../../features/auth/components/password-forms';
import { useSession } from '../../lib/ability';

export function AccountRoute() {
  const { user } = useSession();
  return (
    <>
      <PageHeader title="Your account" description={`${user.name} · ${user.email}`} />
      <div className="space-y-4">
        <Card className="p-5 sm:p-6">
          <ChangePasswordForm />
        </Card>
        <Card className="flex flex-wrap items-center justify-between gap-3 p-5 sm:p-6">
          <p className="text-sm text-ink-700">
            Your second factor and the places you are signed in are under Security.
          </p>
          <Link
            to="/security"
            className="inline-flex items-center gap-2 rounded-lg px-3 py-2 text-sm font-medium text-brand-700 hover:bg-ink-100"
          >
            <ShieldCheck className="size-4" aria-hidden /> Security
          </Link>
        </Card>
      </div>
    </>
  );
}
