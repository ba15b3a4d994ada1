import { PageHeader } from '../../components/ui/page-header';
import { AgeingView } from '../../features/ageing/components/ageing-view';
import { useAbility } from '../../lib/ability';
import { NotFoundRoute } from './not-found';

export function AgeingRoute() {
  const ability = useAbility();
  if (!ability.can('read', 'Ageing')) return <NotFoundRoute />;
  return (
    <>
      <PageHeader
        title="Claim ageing"
        description="How long your open claims have waited, by stage and by reviewer, against your targets."
      />
      <AgeingView />
    </>
  );
}
