import { useQuery } from '@tanstack/react-query';
import { useParams } from 'react-router';
import { PageHeader } from '../../../components/ui/page-header';
import { Spinner } from '../../../components/ui/spinner';
import { reviewQueries } from '../../../features/review/api/review-queries';
import { InstallerWorkflow } from '../../../features/review/components/claim-workflow';

/** The installer's view of the review: what was asked and by when, the return, the decision and its letter. */
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
