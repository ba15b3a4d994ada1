import { BookOpen } from 'lucide-react';
import { Link } from 'react-router';
import { buttonClasses } from '../../../components/ui/button';
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
        actions={
          <Link to="/api-reference" className={buttonClasses('secondary')}>
            <BookOpen aria-hidden className="size-4" />
            API reference
          </Link>
        }
      />
      <div className="space-y-5">
        <ApiTokensCard />
        <WebhooksCard />
      </div>
    </>
  );
}
