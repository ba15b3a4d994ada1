import { OpenClaims } from '../../features/claims/components/open-claims';
import { AccountantDesk } from '../../features/credits/components/accountant-desk';
import { AdministratorHome, InstallerHome, ReviewerHome } from '../../features/home/components/home-panels';
import { useSession } from '../../lib/ability';

/** Each role lands on its own home; a user with several roles gets the one of their daily work first. */
export function HomeRoute() {
  const { user } = useSession();
  const props = { name: user.name, organization: user.organization.name };
  if (user.roles.includes('installer')) return <InstallerHome {...props} openClaims={<OpenClaims />} />;
  if (user.roles.includes('reviewer')) return <ReviewerHome {...props} />;
  if (user.roles.includes('accountant')) return <AccountantDesk {...props} />;
  return <AdministratorHome {...props} />;
}
