import { PageHeader } from '../../../components/ui/page-header';
import { ImportOrAdd } from '../../../features/catalogue/components/import-or-add';
import { InstallationsTable } from '../../../features/catalogue/components/installations-table';
import { useAbility, useSession } from '../../../lib/ability';

export function InstallationsRoute() {
  const ability = useAbility();
  const { user } = useSession();
  return (
    <>
      <PageHeader
        title="Installations"
        description={
          user.organization.kind === 'contractor'
            ? 'What your crews installed, where and how.'
            : 'Installations of your products, as the contractors registered them.'
        }
        actions={
          ability.can('create', 'Installation') ? (
            <ImportOrAdd
              target="installations"
              addTo="/installations/new"
              addLabel="Register an installation"
            />
          ) : null
        }
      />
      <InstallationsTable />
    </>
  );
}
