import { useQuery } from '@tanstack/react-query';
import { useParams } from 'react-router';
import { subject } from '@casl/ability';
import { Badge } from '../../../components/ui/badge';
import { PageHeader } from '../../../components/ui/page-header';
import { Spinner } from '../../../components/ui/spinner';
import { claimQueries } from '../../../features/claims/api/claim-queries';
import { ClaimForm } from '../../../features/claims/components/claim-form';
import { ClaimView } from '../../../features/claims/components/claim-view';
import { EvaluationPanel } from '../../../features/evaluation/components/evaluation-panel';
import { useLiveEvaluation } from '../../../features/evaluation/hooks/use-live-evaluation';
import { ApiError } from '../../../lib/api-client';
import { useAbility } from '../../../lib/ability';
import { NotFoundRoute } from '../not-found';
import { DateTime } from '../../../components/ui/date-time';
import type { LoaderFunctionArgs } from 'react-router';
import { prefetched, queryClient } from '../../query-client';

const SUMMARY = {
  covered: ['ok', 'Likely covered'],
  review: ['warn', 'Needs a reviewer'],
  excluded: ['bad', 'Likely excluded'],
} as const;

// The claims feature and the evaluation feature meet here: the form hands its engine input to the live panel.
function LiveEvaluation({ input, variant }: { input: unknown; variant: 'panel' | 'summary' }) {
  const live = useLiveEvaluation(input);
  if (variant === 'summary') {
    const s = live.evaluation ? SUMMARY[live.evaluation.verdict] : null;
    return s ? <Badge tone={s[0]}>{s[1]}</Badge> : <Badge>Evaluation: fill in the claim</Badge>;
  }
  return (
    <div className="space-y-2">
      <EvaluationPanel evaluation={live.evaluation} pending={live.pending} />
      {!live.evaluation && live.issues.length ? (
        <p className="text-xs text-ink-600">The evaluation starts once the failure date and units are in.</p>
      ) : null}
    </div>
  );
}

/** The claim is needed before anything draws: fetched while the route loads. */
export const loader = ({ params }: LoaderFunctionArgs) =>
  prefetched(queryClient.ensureQueryData(claimQueries.detail(params.id ?? '')));

export function ClaimRoute() {
  const { id = '' } = useParams();
  const ability = useAbility();
  const q = useQuery(claimQueries.detail(id));
  if (q.isPending) return <Spinner label="Loading the claim" />;
  if (q.error)
    return q.error instanceof ApiError && (q.error.status === 404 || q.error.status === 400) ? (
      <NotFoundRoute />
    ) : (
      <p role="alert">{q.error.message}</p>
    );
  const c = q.data.claim;
  const asSubject = subject('Claim', {
    contractorId: c.contractor.id,
    manufacturerId: c.manufacturer.id,
    stage: c.stage,
  } as Record<string, unknown>);
  const editable = c.stage === 'draft' && ability.can('update', asSubject);
  return (
    <>
      <PageHeader
        title={c.number ? `Claim ${c.number}` : 'New claim'}
        description={`${c.product.modelNumber} · ${c.installationDetail.siteName}, ${c.installationDetail.siteCity} · ${c.manufacturer.name}`}
      />
      {editable ? (
        <ClaimForm
          key={c.id}
          claim={c}
          renderEvaluation={(input, variant) => <LiveEvaluation input={input} variant={variant} />}
        />
      ) : (
        <ClaimView
          claim={c}
          canWithdraw={ability.can('file', asSubject)}
          evaluation={
            c.evaluation ? (
              <div className="space-y-1">
                <EvaluationPanel evaluation={c.evaluation} />
                <p className="text-xs text-ink-600">
                  Evaluated when filed, <DateTime value={c.evaluation.evaluatedAt} />, engine{' '}
                  {c.evaluation.engineVersion}.
                </p>
              </div>
            ) : (
              <p className="text-sm text-ink-600">Not evaluated: the claim was never filed.</p>
            )
          }
        />
      )}
    </>
  );
}
