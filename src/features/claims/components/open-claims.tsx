import { useQuery } from '@tanstack/react-query';
import { HardHat } from 'lucide-react';
import { Link } from 'react-router';
import { EmptyState } from '../../../components/ui/empty-state';
import { Spinner } from '../../../components/ui/spinner';
import { claimQueries } from '../api/claim-queries';
import { StageBadge, waitingText } from './stage-badge';

/** The installer's open claims and what each waits for: their own turn first. */
export function OpenClaims() {
  const list = useQuery(claimQueries.list({ page: 1, pageSize: 8, open: 'true', sort: '-updatedAt' }));
  if (list.isPending)
    return (
      <div className="p-5">
        <Spinner label="Loading open claims" />
      </div>
    );
  if (list.error)
    return (
      <p role="alert" className="p-5 text-bad-700">
        {list.error.message}
      </p>
    );
  if (!list.data.items.length) {
    return (
      <EmptyState icon={<HardHat className="size-6" />} title="No open claims">
        When a fixture fails on site, file a claim from its installation with readings and photos; it shows up
        here with what the manufacturer asks of you.
      </EmptyState>
    );
  }
  const mineFirst = [...list.data.items].sort(
    (a, b) => Number(b.waitingOn !== 'manufacturer') - Number(a.waitingOn !== 'manufacturer'),
  );
  return (
    <>
      <ul className="divide-y divide-ink-100" aria-label="Open claims">
        {mineFirst.map((c) => (
          <li key={c.id}>
            <Link
              to={`/claims/${c.id}`}
              className="grid min-w-0 gap-1 px-4 py-3 hover:bg-ink-50 sm:grid-cols-[minmax(0,1fr)_auto] sm:items-center sm:gap-3 sm:px-5"
            >
              <span className="block min-w-0">
                <span className="flex flex-wrap items-center gap-2">
                  <span className="font-mono text-sm font-semibold">{c.number ?? 'Draft'}</span>
                  <StageBadge stage={c.stage} />
                </span>
                <span className="block truncate text-sm text-ink-600">
                  {c.product.modelNumber} · {c.installation.siteName}
                </span>
              </span>
              <span className="text-sm text-ink-800">{waitingText(c.stage, c.waitingOn)}</span>
            </Link>
          </li>
        ))}
      </ul>
      <p className="px-4 py-3 text-sm sm:px-5">
        <Link to="/claims?open=true" className="font-medium text-brand-800 underline">
          All claims ({list.data.total} open)
        </Link>
      </p>
    </>
  );
}
