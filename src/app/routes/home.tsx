import { OpenClaims } from '../../features/claims/components/open-claims';
import { AccountantDesk } from '../../features/credits/components/accountant-desk';
import { InstallerHome } from '../../features/home/components/home-panels';
import { AdministratorHome } from '../../features/users/components/administrator-home';
import { useSession } from '../../lib/ability';
import { PageHeader } from '../../components/ui/page-header';
import { ReviewDeskSummary } from '../../features/review/components/review-queue';

/** Each role lands on its own home; a user with several roles gets the one of their daily work first. */
export function HomeRoute() {
  const { user } = useSession();
  const props = { name: user.name, organization: user.organization.name };
  if (user.roles.includes('installer')) return <InstallerHome {...props} openClaims={<OpenClaims />} />;
  if (user.roles.includes('reviewer')) {
    return (
      <>
        <PageHeader title="Review desk" description={`${props.organization} · signed in as ${props.name}`} />
        <ReviewDeskSummary />
      </>
    );
  }
  if (user.roles.includes('accountant')) return <AccountantDesk {...props} />;
  return <AdministratorHome {...props} />;
}
