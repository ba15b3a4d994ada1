import { useState } from 'react';
import { Link } from 'react-router-dom';
import { FileUp, Plus } from 'lucide-react';
import { Button, buttonClasses } from '../../../components/ui/button';
import { PageHeader } from '../../../components/ui/page-header';
import { ImportDialog } from '../../../features/catalogue/components/import-dialog';
import { ProductsTable } from '../../../features/catalogue/components/products-table';
import { useAbility } from '../../../lib/ability';
import { CatalogueTabs } from './catalogue-tabs';

export function ProductsRoute() {
  const ability = useAbility();
  const [importing, setImporting] = useState(false);
  const canCreate = ability.can('create', 'ProductModel');
  return (
    <>
      <PageHeader
        title="Catalogue"
        description="Every manufacturer's product models and their ratings."
        actions={
          canCreate ? (
            <>
              <Button variant="secondary" icon={<FileUp className="size-4" aria-hidden />} onClick={() => setImporting(true)}>
                Import CSV
              </Button>
              <Link to="/catalogue/new" className={buttonClasses('primary')}>
                <Plus className="size-4" aria-hidden /> Add a model
              </Link>
            </>
          ) : null
        }
      />
      <CatalogueTabs />
      <ProductsTable />
      {canCreate ? <ImportDialog target="products" open={importing} onClose={() => setImporting(false)} /> : null}
    </>
  );
}
