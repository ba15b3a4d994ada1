import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router';
import type { ProductDto } from '../../../../shared/schemas/catalogue';
import { Card, CardHeader } from '../../../components/ui/card';
import { policyQueries } from '../api/policy-queries';
import { ratingRows } from './format';

/** A product's ratings with their units, and the policy covering it. */
export function ProductRatings({ product }: { product: ProductDto }) {
  const policy = useQuery(policyQueries.list({ page: 1, productModelId: product.id }));
  const covering = policy.data?.items[0];
  return (
    <div className="grid gap-5 lg:grid-cols-3">
      <Card className="lg:col-span-2">
        <CardHeader title="Ratings" description={`${product.manufacturer.name} · ${product.modelNumber}`} />
        <dl className="grid gap-x-6 gap-y-3 p-4 sm:grid-cols-2 sm:p-5">
          {ratingRows(product).map(([k, v]) => (
            <div key={k} className="min-w-0">
              <dt className="text-xs font-medium tracking-wide text-ink-600 uppercase">{k}</dt>
              <dd className="text-sm text-ink-900">{v}</dd>
            </div>
          ))}
        </dl>
      </Card>
      <Card>
        <CardHeader title="Warranty" />
        <div className="p-4 text-sm sm:p-5">
          {covering ? (
            <>
              <Link to={`/policies/${covering.id}`} className="font-medium text-brand-800 underline">
                {covering.name}
              </Link>
              {covering.latestVersion ? (
                <p className="mt-1 text-ink-700">
                  Version {covering.latestVersion.versionNumber}, from {covering.latestVersion.effectiveFrom}:{' '}
                  {covering.latestVersion.termMonths} months, {covering.latestVersion.fullCoverageMonths} at
                  full coverage.
                </p>
              ) : null}
            </>
          ) : policy.isPending ? (
            <p className="text-ink-600">Loading…</p>
          ) : (
            <p className="text-ink-600">No warranty policy covers this model yet.</p>
          )}
        </div>
      </Card>
    </div>
  );
}
