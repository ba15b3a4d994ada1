import { useNavigate } from 'react-router';
import { PageHeader } from '../../../components/ui/page-header';
import { useToast } from '../../../components/ui/toast';
import { ProductForm } from '../../../features/catalogue/components/product-form';
import { useAbility } from '../../../lib/ability';
import { NotFoundRoute } from '../not-found';

export function ProductNewRoute() {
  const ability = useAbility();
  const navigate = useNavigate();
  const { notify } = useToast();
  if (!ability.can('create', 'ProductModel')) return <NotFoundRoute />;
  return (
    <>
      <PageHeader
        title="Add a product model"
        description="Every rating the claim screening needs, with its unit."
      />
      <ProductForm
        onCancel={() => navigate('/catalogue')}
        onSaved={(p) => {
          notify(`${p.modelNumber} is in the catalogue.`);
          navigate(`/catalogue/${p.id}`);
        }}
      />
    </>
  );
}
