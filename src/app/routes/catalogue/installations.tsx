import { useState } from 'react';
import { Link } from 'react-router-dom';
import { FileUp, Plus } from 'lucide-react';
import { Button, buttonClasses } from '../../../components/ui/button';
import { PageHeader } from '../../../components/ui/page-header';
import { ImportDialog } from '../../../features/catalogue/components/import-dialog';
import { InstallationsTable } from '../../../features/catalogue/components/installations-table';
import { useAbility, useSession } from '../../../lib/ability';

export function InstallationsRoute() {
  const ability = useAbility();
  const { user } = useSession();
  const [importing, setImporting] = useState(false);
  const canCreate = ability.can('create', 'Installation');
  return (
    <>
      <PageHeader
        title="Installations"
        description={user.organization.kind === 'contractor' ? 'What your crews installed, where and how.' : 'Installations of your products, as the contractors registered them.'}
        actions={
          canCreate ? (
            <>
              <Button variant="secondary" icon={<FileUp className="size-4" aria-hidden />} onClick={() => setImporting(true)}>
                Import CSV
              </Button>
              <Link to="/installations/new" className={buttonClasses('primary')}>
                <Plus className="size-4" aria-hidden /> Register an installation
              </Link>
            </>
          ) : null
        }
      />
      <InstallationsTable />
      {canCreate ? <ImportDialog target="installations" open={importing} onClose={() => setImporting(false)} /> : null}
    </>
  );
}
