import { useQuery } from '@tanstack/react-query';
import { useParams } from 'react-router';
import { PageHeader } from '../../../components/ui/page-header';
import { Spinner } from '../../../components/ui/spinner';
import { installationQueries } from '../../../features/catalogue/api/installation-queries';
import { HistoryPanel } from '../../../features/catalogue/components/history-panel';
import { InstallationDetail } from '../../../features/catalogue/components/installation-detail';
import { StartClaimButton } from '../../../features/claims/components/start-claim';
import { ApiError } from '../../../lib/api-client';
import { useAbility } from '../../../lib/ability';
import { NotFoundRoute } from '../not-found';
import { useDateText } from '../../../components/ui/date-time';
import type { LoaderFunctionArgs } from 'react-router';
import { prefetched, queryClient } from '../../query-client';

/** The record is needed before anything draws: fetched while the route loads. */
export const loader = ({ params }: LoaderFunctionArgs) =>
  prefetched(queryClient.ensureQueryData(installationQueries.detail(params.id ?? '')));

export function InstallationRoute() {
  const { id = '' } = useParams();
  const ability = useAbility();
  const dates = useDateText();
  const q = useQuery(installationQueries.detail(id));
  if (q.isPending) return <Spinner label="Loading the installation" />;
  if (q.error)
    return q.error instanceof ApiError && (q.error.status === 404 || q.error.status === 400) ? (
      <NotFoundRoute />
    ) : (
      <p role="alert">{q.error.message}</p>
    );
  const i = q.data.installation;
  return (
    <>
      <PageHeader
        title={i.siteName}
        description={`${i.quantity} × ${i.product.modelNumber}, installed ${dates.calendar(i.installDate)}`}
        actions={ability.can('create', 'Claim') ? <StartClaimButton installationId={i.id} /> : null}
      />
      <div className="space-y-5">
        <InstallationDetail installation={i} />
        <HistoryPanel query={installationQueries.history(id)} />
      </div>
    </>
  );
}
