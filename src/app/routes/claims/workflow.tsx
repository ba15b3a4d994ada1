import { useQuery } from '@tanstack/react-query';
import { useParams } from 'react-router';
import { PageHeader } from '../../../components/ui/page-header';
import { Spinner } from '../../../components/ui/spinner';
import { reviewQueries } from '../../../features/review/api/review-queries';
import { InstallerWorkflow } from '../../../features/review/components/claim-workflow';
import type { LoaderFunctionArgs } from 'react-router';
import { prefetched, queryClient } from '../../query-client';

/** The installer's view of the review: what was asked and by when, the return, the decision and its letter. */
/** The workflow is needed before anything draws: fetched while the route loads. */
export const loader = ({ params }: LoaderFunctionArgs) =>
  prefetched(queryClient.ensureQueryData(reviewQueries.workflow(params.id ?? '')));

export function ClaimWorkflowRoute() {
  const { id = '' } = useParams();
  const wf = useQuery(reviewQueries.workflow(id));
  if (wf.isPending) return <Spinner label="Loading the claim" />;
  if (wf.isError) return <p className="text-bad-700">This claim does not exist or is not shared with you.</p>;
  return (
    <>
      <PageHeader
        title={`Claim ${wf.data.claim.number ?? ''}`}
        description="Requests, returns and the decision"
      />
      <InstallerWorkflow wf={wf.data} />
    </>
  );
}
