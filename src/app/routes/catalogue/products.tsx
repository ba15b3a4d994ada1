import { PageHeader } from '../../../components/ui/page-header';
import { ImportOrAdd } from '../../../features/catalogue/components/import-or-add';
import { ProductsTable } from '../../../features/catalogue/components/products-table';
import { useAbility } from '../../../lib/ability';
import { CatalogueTabs } from './catalogue-tabs';

export function ProductsRoute() {
  const ability = useAbility();
  return (
    <>
      <PageHeader
        title="Catalogue"
        description="Every manufacturer's product models and their ratings."
        actions={
          ability.can('create', 'ProductModel') ? (
            <ImportOrAdd target="products" addTo="/catalogue/new" addLabel="Add a model" />
          ) : null
        }
      />
      <CatalogueTabs />
      <ProductsTable />
    </>
  );
}
