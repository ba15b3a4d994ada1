import { useQuery } from '@tanstack/react-query';
import { PageHeader } from '../../../components/ui/page-header';
import { Spinner } from '../../../components/ui/spinner';
import { FailureAnalysis } from '../../../features/analytics/components/failure-analysis';
import { productQueries } from '../../../features/catalogue/api/product-queries';
import { useSession } from '../../../lib/ability';

export function FailureAnalysisRoute() {
  const session = useSession();
  const models = useQuery(
    productQueries.list({
      page: 1,
      pageSize: 200,
      manufacturerId: session.user.organization.id,
      sort: 'modelNumber',
    }),
  );
  return (
    <>
      <PageHeader
        title="Failure analysis"
        description="How long your products last in the field, and where the failures come from. Installed units that still work count as survivors."
      />
      {models.data ? (
        <FailureAnalysis models={models.data.items} />
      ) : (
        <div className="flex justify-center py-10">
          <Spinner label="Loading models" />
        </div>
      )}
    </>
  );
}
