import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { FAILURE_MODE_LABELS } from '../../../../shared/analytics/failure-mode-rules';
import type { LifeAnalysisDto } from '../../../../shared/schemas/analytics';
import { FAMILY_LABELS, PRODUCT_FAMILIES } from '../../../../shared/schemas/catalogue';
import { Card } from '../../../components/ui/card';
import { EmptyState } from '../../../components/ui/empty-state';
import { InputField, SelectField } from '../../../components/ui/field';
import { Spinner } from '../../../components/ui/spinner';
import { analyticsQueries, csvUrl, type LifeFilters, type Population } from '../api/analytics-queries';
import { ChartCard, NumbersTable } from './chart-card';
import { formatLife, formatNumber, formatPercent } from './format';
import {
  AgeingHeatTable,
  MonthlyBars,
  ProbabilityPlotChart,
  RankedBars,
  SurvivalChart,
} from './reliability-charts';

export type ModelOption = { id: string; modelNumber: string; name: string };

const FACTORS = [
  ['enclosure', 'Enclosure'],
  ['location', 'Location'],
  ['dimmer', 'Dimmer'],
  ['supply', 'Supply voltage'],
  ['ambientBand', 'Ambient temperature'],
] as const;

function FitCards({ life }: { life: LifeAnalysisDto }) {
  const f = life.fit;
  const unit = life.lifeData.unit;
  if (!f) {
    return (
      <Card className="px-5 py-4">
        <p className="text-sm text-ink-800" role="status">
          No fit yet: {life.fitError?.message ?? 'not enough failures.'} {formatNumber(life.lifeData.units)}{' '}
          units, {formatNumber(life.lifeData.failed)} failed.
        </p>
      </Card>
    );
  }
  const cards = [
    {
      label: 'B10 life',
      value: formatLife(f.b10, unit),
      words: `10 % of units fail by ${formatLife(f.b10, unit)}.`,
    },
    {
      label: 'B50 life',
      value: formatLife(f.b50, unit),
      words: `Half of them by ${formatLife(f.b50, unit)}.`,
    },
    { label: 'Mean life', value: formatLife(f.meanLife, unit), words: 'The average unit lasts this long.' },
    {
      label: 'Shape (β)',
      value: formatNumber(f.shape, 2),
      words:
        f.shape < 0.95
          ? 'Below 1: early failures (infant mortality).'
          : f.shape <= 1.05
            ? 'About 1: failures at random.'
            : 'Above 1: wear-out, failures grow with age.',
    },
    { label: 'Scale (η)', value: formatLife(f.scale, unit), words: '63.2 % of units fail by this age.' },
    {
      label: 'Units',
      value: formatNumber(life.lifeData.units),
      words: `${formatNumber(life.lifeData.failed)} failed, ${formatNumber(life.lifeData.survivors)} still working.`,
    },
  ];
  return (
    <dl className="grid grid-cols-2 gap-3 lg:grid-cols-6" aria-label="Weibull fit">
      {cards.map((c) => (
        <Card key={c.label} className="px-4 py-3">
          <dt className="text-xs font-semibold tracking-wide text-ink-600 uppercase">{c.label}</dt>
          <dd className="mt-1 text-xl font-bold text-ink-950 tabular-nums" data-testid={`fit-${c.label}`}>
            {c.value}
          </dd>
          <dd className="mt-1 text-xs text-ink-700">{c.words}</dd>
        </Card>
      ))}
    </dl>
  );
}

export function FailureAnalysis({ models }: { models: ModelOption[] }) {
  const [kind, setKind] = useState<'model' | 'family' | 'lot'>('model');
  const [modelId, setModelId] = useState(models[0]?.id ?? '');
  const [family, setFamily] = useState<string>('high_bay');
  const [lot, setLot] = useState('');
  const [ageUnit, setAgeUnit] = useState<'months' | 'hours'>('months');
  const [method, setMethod] = useState<'mle' | 'mrr'>('mle');
  const [factor, setFactor] = useState<string>('enclosure');

  const population: Population =
    kind === 'model'
      ? { productModelId: modelId || undefined }
      : kind === 'family'
        ? { family }
        : { lot: lot.trim() || undefined };
  const filters: LifeFilters = { ...population, ageUnit, method };
  const life = useQuery(analyticsQueries.life(filters));
  const modes = useQuery(analyticsQueries.failureModes({ ...population, factor }));
  const ageing = useQuery(analyticsQueries.claimsAgeing());
  const lotOptions = modes.data?.lots.map((l) => l.key).filter((k) => k !== 'not recorded') ?? [];

  return (
    <div className="space-y-5">
      <Card className="px-4 py-4 sm:px-5">
        <form
          className="grid gap-4 sm:grid-cols-2 lg:grid-cols-5"
          onSubmit={(e) => e.preventDefault()}
          aria-label="What to analyse"
        >
          <SelectField label="Analyse" value={kind} onChange={(e) => setKind(e.target.value as typeof kind)}>
            <option value="model">A product model</option>
            <option value="family">A product family</option>
            <option value="lot">A lot (date code)</option>
          </SelectField>
          {kind === 'model' ? (
            <SelectField label="Product model" value={modelId} onChange={(e) => setModelId(e.target.value)}>
              {models.map((m) => (
                <option key={m.id} value={m.id}>
                  {m.modelNumber} — {m.name}
                </option>
              ))}
            </SelectField>
          ) : kind === 'family' ? (
            <SelectField label="Family" value={family} onChange={(e) => setFamily(e.target.value)}>
              {PRODUCT_FAMILIES.map((f) => (
                <option key={f} value={f}>
                  {FAMILY_LABELS[f]}
                </option>
              ))}
            </SelectField>
          ) : (
            <>
              <InputField
                label="Lot (date code)"
                value={lot}
                onChange={(e) => setLot(e.target.value)}
                list="lot-options"
                placeholder="e.g. ACH2502"
              />
              <datalist id="lot-options">
                {lotOptions.map((l) => (
                  <option key={l} value={l} />
                ))}
              </datalist>
            </>
          )}
          <SelectField
            label="Ages in"
            value={ageUnit}
            onChange={(e) => setAgeUnit(e.target.value as typeof ageUnit)}
          >
            <option value="months">Months in service</option>
            <option value="hours">Operating hours</option>
          </SelectField>
          <SelectField
            label="Fit"
            value={method}
            onChange={(e) => setMethod(e.target.value as typeof method)}
            hint="Maximum likelihood uses the survivors fully."
          >
            <option value="mle">Maximum likelihood</option>
            <option value="mrr">Median-rank regression</option>
          </SelectField>
          <SelectField label="Environment factor" value={factor} onChange={(e) => setFactor(e.target.value)}>
            {FACTORS.map(([k, l]) => (
              <option key={k} value={k}>
                {l}
              </option>
            ))}
          </SelectField>
        </form>
      </Card>

      {life.isError ? (
        <EmptyState title="Nothing to analyse">{(life.error as Error).message}</EmptyState>
      ) : !life.data ? (
        <div className="flex justify-center py-10">
          {life.fetchStatus === 'idle' ? (
            <p className="text-sm text-ink-700">Pick what to analyse.</p>
          ) : (
            <Spinner label="Fitting" />
          )}
        </div>
      ) : (
        <LifeSection life={life.data} filters={filters} />
      )}

      {modes.data ? (
        <div className="grid grid-cols-1 gap-5 lg:grid-cols-2">
          <ChartCard
            title="Failure modes"
            description="Covered claims by what failed (symptoms, site observations and the engine's findings)."
            summary={
              modes.data.modes.length
                ? `${formatNumber(modes.data.claims)} covered claims; the most common mode is ${modes.data.modes[0].label} (${formatPercent(modes.data.modes[0].share)}).`
                : 'No covered claims yet.'
            }
            csvHref={csvUrl('/analytics/failure-modes', { ...population, table: 'modes' })}
            table={
              <NumbersTable
                caption="Failure modes"
                head={['Failure mode', 'Claims', 'Units', 'Share']}
                rows={modes.data.modes.map((m) => [m.label, m.claims, m.units, formatPercent(m.share, 1)])}
              />
            }
          >
            <RankedBars rows={modes.data.modes} />
          </ChartCard>
          <ChartCard
            title={`By ${FACTORS.find(([k]) => k === factor)?.[1].toLowerCase()}`}
            description="Where the claimed units were installed."
            summary={
              modes.data.environment[factor as keyof typeof modes.data.environment]?.[0]
                ? `Most claims come from ${modes.data.environment[factor as keyof typeof modes.data.environment][0].key} installations (${formatPercent(modes.data.environment[factor as keyof typeof modes.data.environment][0].share)}).`
                : 'No covered claims yet.'
            }
            csvHref={csvUrl('/analytics/failure-modes', { ...population, table: 'environment', factor })}
            table={
              <NumbersTable
                caption={`Failure modes by ${factor}`}
                head={['Failure mode', ...modes.data.crossTable.columns, 'Total']}
                rows={modes.data.crossTable.rows.map((r, i) => [
                  FAILURE_MODE_LABELS[r] ?? r,
                  ...modes.data.crossTable.counts[i],
                  modes.data.crossTable.rowTotals[i],
                ])}
              />
            }
          >
            <RankedBars rows={modes.data.environment[factor as keyof typeof modes.data.environment] ?? []} />
          </ChartCard>
          <ChartCard
            title="By lot (date code)"
            summary={
              modes.data.lots[0]
                ? `Lot ${modes.data.lots[0].key} has the most claims: ${formatNumber(modes.data.lots[0].claims)} (${formatPercent(modes.data.lots[0].share)}).`
                : 'No covered claims yet.'
            }
            csvHref={csvUrl('/analytics/failure-modes', { ...population, table: 'lot' })}
            table={
              <NumbersTable
                caption="Claims by lot"
                head={['Lot', 'Claims', 'Units', 'Share']}
                rows={modes.data.lots.map((m) => [m.key, m.claims, m.units, formatPercent(m.share, 1)])}
              />
            }
          >
            <RankedBars rows={modes.data.lots} />
          </ChartCard>
          <ChartCard
            title="By contractor"
            summary={
              modes.data.contractors[0]
                ? `${modes.data.contractors[0].key} filed ${formatPercent(modes.data.contractors[0].share)} of the covered claims.`
                : 'No covered claims yet.'
            }
            csvHref={csvUrl('/analytics/failure-modes', { ...population, table: 'contractor' })}
            table={
              <NumbersTable
                caption="Claims by contractor"
                head={['Contractor', 'Claims', 'Units', 'Share']}
                rows={modes.data.contractors.map((m) => [
                  m.key,
                  m.claims,
                  m.units,
                  formatPercent(m.share, 1),
                ])}
              />
            }
          >
            <RankedBars rows={modes.data.contractors} />
          </ChartCard>
          <div className="lg:col-span-2">
            <ChartCard
              title="Claims by install month and months in service"
              description="Each row is the units installed in a month; each column how long they ran before the claim. A hot row is a bad batch; a hot column a wear-out age."
              summary={`${formatNumber(modes.data.ageing.rowTotals.reduce((a, b) => a + b, 0))} claims over ${modes.data.ageing.installMonths.length} install months.`}
              csvHref={csvUrl('/analytics/failure-modes', { ...population, table: 'ageing' })}
              decorative={false}
              table={
                <NumbersTable
                  caption="Claims by install month and months in service"
                  head={['Installed', 'Total', ...modes.data.ageing.monthsInService.map((m) => `${m} mo`)]}
                  rows={modes.data.ageing.installMonths.map((m, i) => [
                    m,
                    modes.data.ageing.rowTotals[i],
                    ...modes.data.ageing.counts[i],
                  ])}
                />
              }
            >
              <AgeingHeatTable table={modes.data.ageing} />
            </ChartCard>
          </div>
        </div>
      ) : null}

      {ageing.data ? (
        <div className="grid grid-cols-1 gap-5 lg:grid-cols-2">
          <ChartCard
            title="Open claims by age"
            description="Days since filing, and whether the claim waits on you or on the contractor."
            summary={`${formatNumber(ageing.data.open.reduce((n, b) => n + b.total, 0))} open claims; ${formatNumber(ageing.data.open.reduce((n, b) => n + b.manufacturer, 0))} wait on you.`}
            csvHref={csvUrl('/analytics/claims-ageing', { table: 'open' })}
            table={
              <NumbersTable
                caption="Open claims by age"
                head={['Age', 'Waiting on you', 'Waiting on contractor', 'Total']}
                rows={ageing.data.open.map((b) => [b.band, b.manufacturer, b.contractor, b.total])}
              />
            }
          >
            <MonthlyBars
              data={ageing.data.open.map((b) => ({
                month: b.band,
                manufacturer: b.manufacturer,
                contractor: b.contractor,
              }))}
              series={[
                { key: 'manufacturer', label: 'Waiting on you', color: '#0d5c57' },
                { key: 'contractor', label: 'Waiting on contractor', color: '#c25e06' },
              ]}
            />
          </ChartCard>
          <ChartCard
            title="Decisions per week"
            summary={`${formatNumber(ageing.data.throughput.reduce((n, w) => n + w.decided, 0))} claims decided in the last ${ageing.data.throughput.length} weeks.`}
            csvHref={csvUrl('/analytics/claims-ageing', { table: 'throughput' })}
            table={
              <NumbersTable
                caption="Decisions per week"
                head={['Week of', 'Approved', 'Denied', 'Decided']}
                rows={ageing.data.throughput.map((w) => [w.week, w.approved, w.denied, w.decided])}
              />
            }
          >
            <MonthlyBars
              data={ageing.data.throughput.map((w) => ({
                month: w.week.slice(5),
                approved: w.approved,
                denied: w.denied,
              }))}
              series={[
                { key: 'approved', label: 'Approved', color: '#167b71' },
                { key: 'denied', label: 'Denied', color: '#ad281a' },
              ]}
            />
          </ChartCard>
        </div>
      ) : null}
    </div>
  );
}

function LifeSection({ life, filters }: { life: LifeAnalysisDto; filters: LifeFilters }) {
  const unit = life.lifeData.unit;
  const f = life.fit;
  const params = { ...filters } as Record<string, string>;
  return (
    <div className="space-y-5">
      <h2 className="text-lg font-semibold text-ink-900">{life.population.label}</h2>
      <FitCards life={life} />
      <div className="grid grid-cols-1 gap-5 lg:grid-cols-2">
        <ChartCard
          title="Probability plot"
          description="Weibull paper: failures on a straight line follow the fit."
          summary={
            f && life.probabilityPlot
              ? `${life.probabilityPlot.points.length} failure ages plotted against the ${f.method === 'mle' ? 'maximum-likelihood' : 'regression'} fit: shape ${formatNumber(f.shape, 2)}, scale ${formatLife(f.scale, unit)}.`
              : 'No fit to plot yet.'
          }
          csvHref={csvUrl('/analytics/life', { ...params, table: 'probability-plot' })}
          table={
            life.probabilityPlot ? (
              <NumbersTable
                caption="Probability plot points"
                head={[`Age (${unit})`, 'Failed', 'Fraction failed F', 'ln t', 'ln(−ln(1−F))']}
                rows={life.probabilityPlot.points.map((p) => [
                  formatNumber(p.time, 1),
                  p.count,
                  formatPercent(p.F, 2),
                  formatNumber(p.x, 3),
                  formatNumber(p.y, 3),
                ])}
              />
            ) : (
              <p className="p-3 text-sm">No points.</p>
            )
          }
        >
          {life.probabilityPlot && life.probabilityPlot.points.length ? (
            <ProbabilityPlotChart plot={life.probabilityPlot} unit={unit} />
          ) : (
            <p className="text-sm text-ink-700">No failures to plot.</p>
          )}
        </ChartCard>
        <ChartCard
          title="Survival (Kaplan-Meier)"
          description="Share of units still working by age, with its 95 % band (Greenwood)."
          summary={
            life.kaplanMeier.length
              ? `${formatPercent(life.kaplanMeier[life.kaplanMeier.length - 1].survival, 1)} of units still working at ${formatLife(life.kaplanMeier[life.kaplanMeier.length - 1].time, unit)}.`
              : 'No units installed.'
          }
          csvHref={csvUrl('/analytics/life', { ...params, table: 'kaplan-meier' })}
          table={
            <NumbersTable
              caption="Kaplan-Meier table"
              head={[`Age (${unit})`, 'At risk', 'Failed', 'Censored', 'Survival', 'Lower', 'Upper']}
              rows={life.kaplanMeier
                .filter((r) => r.failed > 0)
                .map((r) => [
                  formatNumber(r.time, 1),
                  r.atRisk,
                  r.failed,
                  r.censored,
                  formatPercent(r.survival, 2),
                  formatPercent(r.lower, 2),
                  formatPercent(r.upper, 2),
                ])}
            />
          }
        >
          {life.kaplanMeier.length ? <SurvivalChart rows={life.kaplanMeier} unit={unit} /> : null}
        </ChartCard>
      </div>
    </div>
  );
}
