import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { EmptyState } from '../../../components/ui/empty-state';
import { Spinner } from '../../../components/ui/spinner';
import { RESERVE_AGE_RULE, RESERVE_ROUNDING_RULE } from '../../../../shared/analytics/reserve';
import { analyticsQueries, csvUrl } from '../api/analytics-queries';
import { ChartCard, NumbersTable } from './chart-card';
import { formatMoney } from '../../../../shared/money';
import { formatNumber, WHOLE_MONEY } from './format';
import { MonthlyBars } from './reliability-charts';

const COLORS = ['#167b71', '#2850c9', '#c25e06', '#ad281a'];

export function WarrantyReserve() {
  const reserve = useQuery(analyticsQueries.reserve(12));
  const [allCohorts, setAllCohorts] = useState(false);
  if (reserve.isError)
    return (
      <EmptyState title="The reserve could not be computed">{(reserve.error as Error).message}</EmptyState>
    );
  if (!reserve.data)
    return (
      <div className="flex justify-center py-10">
        <Spinner label="Forecasting" />
      </div>
    );
  const r = reserve.data;
  const shown = allCohorts ? r.cohorts : r.cohorts.slice(0, 25);
  const monthly = r.monthLabels.map((month, k) =>
    Object.fromEntries([['month', month], ...r.totals.map((t) => [t.currency, Number(t.monthlyAmounts[k])])]),
  );
  return (
    <div className="space-y-5">
      <dl className="grid gap-3 sm:grid-cols-3" aria-label="Reserve totals">
        {r.totals.length === 0 ? (
          <Card className="px-4 py-3 sm:col-span-3">
            <p className="text-sm">No units under warranty to forecast.</p>
          </Card>
        ) : (
          r.totals.map((t) => (
            <Card key={t.currency} className="px-4 py-3">
              <dt className="text-xs font-semibold tracking-wide text-ink-600 uppercase">
                Reserve, next {r.months} months ({t.currency})
              </dt>
              <dd
                className="mt-1 text-2xl font-bold text-ink-950 tabular-nums"
                data-testid={`reserve-total-${t.currency}`}
              >
                {formatMoney(t.amount, t.currency, WHOLE_MONEY)}
              </dd>
              <dd className="mt-1 text-xs text-ink-700">
                About {formatNumber(t.expectedClaims)} claimed units expected, prorated by coverage.
              </dd>
            </Card>
          ))
        )}
      </dl>
      <section aria-label="How the reserve is counted" className="space-y-1 text-sm text-ink-700">
        <p>
          <strong className="font-semibold text-ink-900">Age.</strong> {RESERVE_AGE_RULE}
        </p>
        <p>
          <strong className="font-semibold text-ink-900">Rounding.</strong> {RESERVE_ROUNDING_RULE}
        </p>
        <p>
          <strong className="font-semibold text-ink-900">Proration.</strong> Past a policy’s full-coverage
          months the credit falls linearly with the age at failure to nothing at the term (linear pro-rata).
        </p>
      </section>
      <ChartCard
        title="Expected credits by month"
        description={`From ${r.monthLabels[0]} to ${r.monthLabels[r.monthLabels.length - 1]}, each currency on its own.`}
        summary={
          r.totals
            .map(
              (t) =>
                `${t.currency}: ${formatMoney(t.amount, t.currency, WHOLE_MONEY)} over ${r.months} months, ${formatMoney(t.monthlyAmounts[0], t.currency, WHOLE_MONEY)} in the first.`,
            )
            .join(' ') || 'Nothing to forecast.'
        }
        csvHref={csvUrl('/reserve', { table: 'months' })}
        table={
          <NumbersTable
            caption="Reserve by month"
            head={['Month', ...r.totals.flatMap((t) => [`Claims (${t.currency})`, `Amount (${t.currency})`])]}
            rows={r.monthLabels.map((m, k) => [
              m,
              ...r.totals.flatMap((t) => [formatNumber(t.monthlyClaims[k], 2), t.monthlyAmounts[k]]),
            ])}
          />
        }
      >
        <MonthlyBars
          data={monthly}
          series={r.totals.map((t, i) => ({
            key: t.currency,
            label: t.currency,
            color: COLORS[i % COLORS.length],
          }))}
        />
      </ChartCard>
      <ChartCard
        title="By cohort"
        description="Units of one model installed in one month under one set of terms, still working today. Largest reserve first."
        summary={`${formatNumber(r.cohorts.length)} cohorts from ${formatNumber(r.fits.length)} fitted models${r.unforecast.length ? `; ${r.unforecast.length} models have too few failures to forecast` : ''}.`}
        csvHref={csvUrl('/reserve', { table: 'cohorts' })}
        decorative={false}
        table={
          <NumbersTable
            caption="Fitted life models"
            head={['Model', 'Shape', 'Scale (months)', 'Fitted from']}
            rows={r.fits.map((f) => [
              f.modelNumber,
              formatNumber(f.shape, 2),
              formatNumber(f.scale, 1),
              f.from === 'model' ? 'its own claims' : 'its family',
            ])}
          />
        }
      >
        <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="Reserve by cohort">
          <table className="min-w-full divide-y divide-ink-200 text-left text-sm">
            <caption className="sr-only">Reserve by cohort</caption>
            <thead className="bg-ink-50">
              <tr>
                {[
                  'Model',
                  'Installed',
                  'Age (months)',
                  'Working units',
                  'Term',
                  'Unit credit',
                  'Expected claims',
                  'Reserve',
                ].map((h) => (
                  <th key={h} scope="col" className="px-3 py-2 text-xs font-semibold text-ink-700">
                    {h}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {shown.map((c) => (
                <tr key={c.key}>
                  <td className="px-3 py-1.5">{c.modelNumber}</td>
                  <td className="px-3 py-1.5 tabular-nums">{c.installMonth}</td>
                  <td className="px-3 py-1.5 tabular-nums">{c.ageMonths}</td>
                  <td className="px-3 py-1.5 tabular-nums">{formatNumber(c.survivors)}</td>
                  <td className="px-3 py-1.5 tabular-nums">{c.termMonths} mo</td>
                  <td className="px-3 py-1.5 tabular-nums">
                    {formatMoney(c.unitCredit, c.currency, WHOLE_MONEY)}
                  </td>
                  <td className="px-3 py-1.5 tabular-nums">{formatNumber(c.expectedClaims, 2)}</td>
                  <td className="px-3 py-1.5 font-semibold tabular-nums">
                    {formatMoney(c.amount, c.currency, WHOLE_MONEY)}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </ChartCard>
      {r.cohorts.length > 25 ? (
        <Button variant="secondary" onClick={() => setAllCohorts((v) => !v)}>
          {allCohorts ? 'Show the 25 largest cohorts' : `Show all ${formatNumber(r.cohorts.length)} cohorts`}
        </Button>
      ) : null}
    </div>
  );
}
