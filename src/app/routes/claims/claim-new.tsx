import { PageHeader } from '../../../components/ui/page-header';
import { InstallationPicker } from '../../../features/claims/components/start-claim';
import { useAbility } from '../../../lib/ability';
import { NotFoundRoute } from '../not-found';

export function ClaimNewRoute() {
  const ability = useAbility();
  if (!ability.can('create', 'Claim')) return <NotFoundRoute />;
  return (
    <>
      <PageHeader
        title="New claim"
        description="A claim starts from the installation the failed units belong to."
      />
      <InstallationPicker />
    </>
  );
}
