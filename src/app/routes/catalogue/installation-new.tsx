import { useNavigate } from 'react-router';
import { PageHeader } from '../../../components/ui/page-header';
import { useToast } from '../../../components/ui/toast';
import { InstallationForm } from '../../../features/catalogue/components/installation-form';
import { useAbility } from '../../../lib/ability';
import { NotFoundRoute } from '../not-found';

export function InstallationNewRoute() {
  const ability = useAbility();
  const navigate = useNavigate();
  const { notify } = useToast();
  if (!ability.can('create', 'Installation')) return <NotFoundRoute />;
  return (
    <>
      <PageHeader
        title="Register an installation"
        description="The product, the site and the conditions as installed."
      />
      <InstallationForm
        onCancel={() => navigate('/installations')}
        onSaved={(i) => {
          notify(`Installation at ${i.siteName} registered.`);
          navigate(`/installations/${i.id}`);
        }}
      />
    </>
  );
}
