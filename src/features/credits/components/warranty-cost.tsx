import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import type { CostRow } from '../../../../shared/schemas/credits';
import { toDecimal } from '../../../../shared/credits/money';
import { Card, CardHeader } from '../../../components/ui/card';
import { SelectField } from '../../../components/ui/field';
import { Spinner } from '../../../components/ui/spinner';
import { creditQueries } from '../api/credit-queries';
import { Money } from './money';

type View = 'byMonth' | 'byProduct' | 'byContractor';
const VIEWS: Record<View, string> = { byMonth: 'Month', byProduct: 'Product', byContractor: 'Contractor' };

/** Bars as plain CSS widths, the numbers beside them: readable without the chart. */
function Bars({ rows }: { rows: CostRow[] }) {
  const max = rows.reduce((m, r) => {
    const v = toDecimal(r.credited).plus(r.pending);
    return v.gt(m) ? v : m;
  }, toDecimal(0));
  const width = (v: string) =>
    max.isZero() ? 0 : toDecimal(v).div(max).times(100).toDecimalPlaces(1).toNumber();
  return (
    <ul className="space-y-3">
      {rows.map((r) => (
        <li key={`${r.key}|${r.currency}`}>
          <div className="flex flex-wrap items-baseline justify-between gap-x-3 text-sm">
            <span className="font-medium text-ink-900">{r.label}</span>
            <span className="text-ink-700">
              Credited <Money amount={r.credited} currency={r.currency} /> · Pending{' '}
              <Money amount={r.pending} currency={r.currency} />
            </span>
          </div>
          <div aria-hidden className="mt-1 flex h-3 overflow-hidden rounded bg-ink-100">
            <div className="h-full bg-brand-700" style={{ width: `${width(r.credited)}%` }} />
            <div className="h-full bg-warn-400" style={{ width: `${width(r.pending)}%` }} />
          </div>
        </li>
      ))}
    </ul>
  );
}

export function WarrantyCostPanel() {
  const [view, setView] = useState<View>('byMonth');
  const cost = useQuery(creditQueries.cost({}));
  const rows = cost.data?.[view] ?? [];
  return (
    <Card>
      <CardHeader
        title="Warranty cost at a glance"
        description="Credited (net of reversals) and pending (approved, not yet credited)."
      />
      <div className="space-y-4 px-4 py-4 sm:px-5">
        <div className="flex flex-wrap items-end justify-between gap-3">
          <SelectField
            label="Group by"
            value={view}
            onChange={(e) => setView(e.target.value as View)}
            className="w-48"
          >
            {Object.entries(VIEWS).map(([k, label]) => (
              <option key={k} value={k}>
                {label}
              </option>
            ))}
          </SelectField>
          <dl className="flex flex-wrap gap-6 text-sm">
            {cost.data?.totals.map((t) => (
              <div key={t.currency}>
                <dt className="text-xs font-medium text-ink-600 uppercase">
                  Credited · pending ({t.currency})
                </dt>
                <dd className="font-semibold text-ink-950">
                  <Money amount={t.credited} currency={t.currency} /> ·{' '}
                  <Money amount={t.pending} currency={t.currency} />
                </dd>
              </div>
            ))}
          </dl>
        </div>
        <p className="flex gap-4 text-xs text-ink-600">
          <span className="flex items-center gap-1.5">
            <span aria-hidden className="inline-block size-3 rounded-sm bg-brand-700" /> Credited
          </span>
          <span className="flex items-center gap-1.5">
            <span aria-hidden className="inline-block size-3 rounded-sm bg-warn-400" /> Pending
          </span>
        </p>
        {cost.isPending ? (
          <Spinner label="Loading warranty cost" />
        ) : rows.length ? (
          <Bars rows={rows} />
        ) : (
          <p className="text-sm text-ink-600">No credits or approved claims yet.</p>
        )}
      </div>
    </Card>
  );
}
