import { PageHeader } from '../../../components/ui/page-header';
import { ApiTokensCard } from '../../../features/integrations/components/api-tokens-card';
import { WebhooksCard } from '../../../features/integrations/components/webhooks-card';
import { useAbility, useSession } from '../../../lib/ability';
import { NotFoundRoute } from '../not-found';

export function IntegrationsRoute() {
  const ability = useAbility();
  const { user } = useSession();
  if (!ability.can('read', 'ApiToken')) return <NotFoundRoute />;
  return (
    <>
      <PageHeader
        title="Integrations"
        description={`How ${user.organization.name}'s own systems read from and hear from Lumenproof.`}
      />
      <div className="space-y-5">
        <ApiTokensCard />
        <WebhooksCard />
      </div>
    </>
  );
}
