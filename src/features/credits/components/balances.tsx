import { useQuery } from '@tanstack/react-query';
import { Card, CardHeader } from '../../../components/ui/card';
import { Spinner } from '../../../components/ui/spinner';
import { creditQueries } from '../api/credit-queries';
import { Money } from './money';

/** The contractor's account with each manufacturer: the sum of its ledger entries, per currency. */
export function Balances({ side }: { side: 'contractor' | 'manufacturer' }) {
  const balances = useQuery(creditQueries.balances());
  const items = balances.data?.items ?? [];
  return (
    <Card>
      <CardHeader
        title={side === 'contractor' ? 'Your balance with each manufacturer' : 'Balances by contractor'}
        description="Credits less reversals, summed from the ledger."
      />
      {balances.isPending ? (
        <div className="px-5 py-6">
          <Spinner label="Loading balances" />
        </div>
      ) : items.length === 0 ? (
        <p className="px-5 py-6 text-sm text-ink-600">No credits yet.</p>
      ) : (
        <ul className="grid gap-3 px-4 py-4 sm:grid-cols-2 sm:px-5 lg:grid-cols-3">
          {items.map((b) => (
            <li
              key={`${b.contractor.id}|${b.manufacturer.id}|${b.currency}`}
              className="rounded-lg border border-ink-200 px-4 py-3"
            >
              <p className="text-sm font-medium text-ink-700">
                {side === 'contractor' ? b.manufacturer.name : b.contractor.name}
              </p>
              <p className="text-2xl font-bold text-ink-950">
                <Money amount={b.balance} currency={b.currency} />
              </p>
              <p className="text-xs text-ink-600">{b.memos === 1 ? '1 memo' : `${b.memos} memos`}</p>
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
