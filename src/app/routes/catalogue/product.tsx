import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useParams } from 'react-router';
import { subject } from '@casl/ability';
import { Button } from '../../../components/ui/button';
import { PageHeader } from '../../../components/ui/page-header';
import { Spinner } from '../../../components/ui/spinner';
import { useToast } from '../../../components/ui/toast';
import { productQueries } from '../../../features/catalogue/api/product-queries';
import { HistoryPanel } from '../../../features/catalogue/components/history-panel';
import { ProductRatings } from '../../../features/catalogue/components/product-detail';
import { ProductForm } from '../../../features/catalogue/components/product-form';
import { useAbility } from '../../../lib/ability';
import { ApiError } from '../../../lib/api-client';
import { NotFoundRoute } from '../not-found';
import type { LoaderFunctionArgs } from 'react-router';
import { prefetched, queryClient } from '../../query-client';

/** The record is needed before anything draws: fetched while the route loads. */
export const loader = ({ params }: LoaderFunctionArgs) =>
  prefetched(queryClient.ensureQueryData(productQueries.detail(params.id ?? '')));

export function ProductRoute() {
  const { id = '' } = useParams();
  const ability = useAbility();
  const { notify } = useToast();
  const [editing, setEditing] = useState(false);
  const q = useQuery(productQueries.detail(id));
  if (q.isPending) return <Spinner label="Loading the model" />;
  if (q.error)
    return q.error instanceof ApiError && (q.error.status === 404 || q.error.status === 400) ? (
      <NotFoundRoute />
    ) : (
      <p role="alert">{q.error.message}</p>
    );
  const p = q.data.product;
  const canEdit = ability.can(
    'update',
    subject('ProductModel', { manufacturerId: p.manufacturer.id } as Record<string, unknown>),
  );
  return (
    <>
      <PageHeader
        title={`${p.modelNumber}`}
        description={p.name}
        actions={canEdit && !editing ? <Button onClick={() => setEditing(true)}>Edit ratings</Button> : null}
      />
      <div className="space-y-5">
        {editing ? (
          <ProductForm
            product={p}
            onCancel={() => setEditing(false)}
            onSaved={() => {
              notify('Ratings saved.');
              setEditing(false);
            }}
          />
        ) : (
          <ProductRatings product={p} />
        )}
        <HistoryPanel query={productQueries.history(id)} />
      </div>
    </>
  );
}
