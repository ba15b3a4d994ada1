import { Card } from '../../components/ui/card';
import { PageHeader } from '../../components/ui/page-header';
import { ChangePasswordForm } from '../../features/auth/components/password-forms';
import { useSession } from '../../lib/ability';

export function AccountRoute() {
  const { user } = useSession();
  return (
    <>
      <PageHeader title="Your account" description={`${user.name} · ${user.email}`} />
      <Card className="p-5 sm:p-6">
        <ChangePasswordForm />
      </Card>
    </>
  );
}
