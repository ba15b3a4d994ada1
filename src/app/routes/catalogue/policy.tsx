import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useParams } from 'react-router';
import { subject } from '@casl/ability';
import { Button } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { PageHeader } from '../../../components/ui/page-header';
import { Spinner } from '../../../components/ui/spinner';
import { policyQueries } from '../../../features/catalogue/api/policy-queries';
import { HistoryPanel } from '../../../features/catalogue/components/history-panel';
import { PolicyTermsDialog } from '../../../features/catalogue/components/policy-terms-dialog';
import { PolicyVersions } from '../../../features/catalogue/components/policy-versions';
import { useAbility } from '../../../lib/ability';
import { ApiError } from '../../../lib/api-client';
import { NotFoundRoute } from '../not-found';
import type { LoaderFunctionArgs } from 'react-router';
import { prefetched, queryClient } from '../../query-client';

/** The record is needed before anything draws: fetched while the route loads. */
export const loader = ({ params }: LoaderFunctionArgs) =>
  prefetched(queryClient.ensureQueryData(policyQueries.detail(params.id ?? '')));

export function PolicyRoute() {
  const { id = '' } = useParams();
  const ability = useAbility();
  const [adding, setAdding] = useState(false);
  const q = useQuery(policyQueries.detail(id));
  if (q.isPending) return <Spinner label="Loading the policy" />;
  if (q.error)
    return q.error instanceof ApiError && (q.error.status === 404 || q.error.status === 400) ? (
      <NotFoundRoute />
    ) : (
      <p role="alert">{q.error.message}</p>
    );
  const p = q.data.policy;
  const canEdit = ability.can(
    'update',
    subject('WarrantyPolicy', { manufacturerId: p.manufacturer.id } as Record<string, unknown>),
  );
  return (
    <>
      <PageHeader
        title={p.name}
        description={`${p.manufacturer.name} · ${p.versions.length} ${p.versions.length === 1 ? 'version' : 'versions'}`}
        actions={canEdit ? <Button onClick={() => setAdding(true)}>New version</Button> : null}
      />
      <div className="space-y-5">
        <Card>
          <CardHeader
            title="Versions side by side"
            description="Highlighted values changed from the version before. A claim is judged by the version in force when the units were bought or installed."
          />
          <PolicyVersions versions={p.versions} />
        </Card>
        <Card>
          <CardHeader title="Models covered" />
          <ul className="flex flex-wrap gap-2 p-4 sm:p-5">
            {p.models.map((m) => (
              <li key={m.id}>
                <Link
                  to={`/catalogue/${m.id}`}
                  className="inline-flex min-h-11 items-center rounded-lg border border-ink-200 px-3 text-sm hover:bg-ink-50"
                >
                  {m.modelNumber} · {m.name}
                </Link>
              </li>
            ))}
          </ul>
        </Card>
        <HistoryPanel query={policyQueries.history(id)} />
      </div>
      {adding ? <PolicyTermsDialog open policy={p} onClose={() => setAdding(false)} /> : null}
    </>
  );
}
