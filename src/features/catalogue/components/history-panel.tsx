import { useQuery } from '@tanstack/react-query';
import { History } from 'lucide-react';
import { Card, CardHeader } from '../../../components/ui/card';
import { Spinner } from '../../../components/ui/spinner';
import type { productQueries } from '../api/product-queries';
import { DateTime } from '../../../components/ui/date-time';

const ACTION_TEXT: Record<string, string> = {
  'product.created': 'Added to the catalogue',
  'product.imported': 'Imported from a spreadsheet',
  'product.updated': 'Ratings changed',
  'policy.created': 'Policy created',
  'policy.updated': 'Policy renamed or models changed',
  'policy.version_created': 'New version of the terms',
  'installation.created': 'Installation registered',
  'installation.imported': 'Imported from a spreadsheet',
  'installation.updated': 'Installation changed',
};

const show = (v: unknown) =>
  v === null || v === undefined
    ? '—'
    : Array.isArray(v)
      ? v.length
        ? v.map((x) => (typeof x === 'object' ? JSON.stringify(x) : String(x))).join(', ')
        : 'none'
      : String(v);

/** The append-only audit trail of one record, newest first. */
/** Takes any of the history query options (products, policies and installations share one shape). */
export function HistoryPanel({ query }: { query: ReturnType<typeof productQueries.history> }) {
  const history = useQuery(query);
  const items = [...(history.data?.items ?? [])].reverse();
  return (
    <Card>
      <CardHeader title="History" description="Every change, kept for good." />
      {history.isPending ? (
        <div className="p-6">
          <Spinner label="Loading history" />
        </div>
      ) : items.length === 0 ? (
        <p className="p-5 text-sm text-ink-600">No changes recorded yet.</p>
      ) : (
        <ol className="divide-y divide-ink-100">
          {items.map((e) => {
            const changed = e.before ? Object.keys(e.after ?? {}) : [];
            return (
              <li key={e.id} className="px-4 py-3 sm:px-5">
                <div className="flex flex-wrap items-baseline justify-between gap-2">
                  <p className="flex items-center gap-2 text-sm font-medium text-ink-900">
                    <History className="size-4 text-ink-500" aria-hidden />
                    {ACTION_TEXT[e.action] ?? e.action}
                  </p>
                  <p className="text-xs text-ink-600">
                    <DateTime value={e.occurredAt} />
                    {e.actor ? ` · ${e.actor.name}` : ' · system'}
                  </p>
                </div>
                {changed.length ? (
                  <ul className="mt-1.5 space-y-0.5 text-xs text-ink-700">
                    {changed.map((k) => (
                      <li key={k} className="break-words">
                        <span className="font-medium">{k}</span>: {show(e.before?.[k])} → {show(e.after?.[k])}
                      </li>
                    ))}
                  </ul>
                ) : null}
              </li>
            );
          })}
        </ol>
      )}
    </Card>
  );
}
