import {
  Area,
  Bar,
  BarChart,
  CartesianGrid,
  ComposedChart,
  Line,
  ResponsiveContainer,
  Scatter,
  Tooltip,
  XAxis,
  YAxis,
} from 'recharts';
import type { KaplanMeierRow } from '../../../../shared/analytics/kaplan-meier';
import type { AgeingTable, RankedCount } from '../../../../shared/analytics/failure-modes';
import type { ProbabilityPlot } from '../../../../shared/analytics/weibull';
import { formatNumber, formatPercent, formatTick } from './format';

// The charts themselves (recharts). Colours from the palette, at contrasts that read on white.
const POINT = '#0d5c57'; // brand-700
const LINE = '#c25e06'; // warn-600
const BAND = '#a9e6da'; // brand-200
const BAR = '#167b71'; // brand-600
const GRID = '#d5ddda'; // ink-200
const AXIS = '#424f4b'; // ink-700

const PERCENT_TICKS = [0.01, 0.02, 0.05, 0.1, 0.2, 0.5, 0.9, 0.99];
const weibullY = (F: number) => Math.log(-Math.log1p(-F));

function niceTimes(min: number, max: number): number[] {
  const out: number[] = [];
  for (let e = -1; e <= 7; e++) {
    for (const m of [1, 2, 5]) {
      const v = m * 10 ** e;
      if (v >= min * 0.8 && v <= max * 1.25) out.push(v);
    }
  }
  return out;
}

/** Weibull paper: x = ln t, y = ln(-ln(1 - F)), labelled in hours or months and in per cent failed. */
export function ProbabilityPlotChart({ plot, unit }: { plot: ProbabilityPlot; unit: 'months' | 'hours' }) {
  const points = plot.points.map((p) => ({ x: p.x, y: p.y, time: p.time, F: p.F }));
  const line = plot.line.map((p) => ({ x: p.x, line: p.y }));
  const times = points.map((p) => p.time);
  const xTicks = niceTimes(Math.min(...times, plot.line[0].time), Math.max(...times, plot.line[1].time)).map(
    Math.log,
  );
  const ys = [...points.map((p) => p.y), ...line.map((l) => l.line)];
  const yMin = Math.min(...ys);
  const yMax = Math.max(...ys);
  const yTicks = PERCENT_TICKS.map(weibullY).filter((y) => y >= yMin - 0.6 && y <= yMax + 0.6);
  return (
    <div className="h-72">
      <ResponsiveContainer width="100%" height="100%">
        <ComposedChart margin={{ top: 8, right: 16, bottom: 20, left: 8 }} accessibilityLayer={false}>
          <CartesianGrid stroke={GRID} />
          <XAxis
            type="number"
            dataKey="x"
            domain={['dataMin - 0.2', 'dataMax + 0.2']}
            ticks={xTicks}
            tickFormatter={(x: number) => formatTick(Math.exp(x), unit)}
            stroke={AXIS}
            label={{
              value: `Age at failure (${unit}, log scale)`,
              position: 'insideBottom',
              offset: -12,
              fill: AXIS,
            }}
            allowDuplicatedCategory={false}
          />
          <YAxis
            type="number"
            domain={[Math.min(yMin, ...yTicks) - 0.2, Math.max(yMax, ...yTicks) + 0.2]}
            ticks={yTicks}
            tickFormatter={(y: number) => formatPercent(-Math.expm1(-Math.exp(y)), 0)}
            stroke={AXIS}
            width={52}
          />
          <Tooltip
            formatter={(value, name) => [
              name === 'line' ? 'fitted' : formatPercent(-Math.expm1(-Math.exp(Number(value))), 1),
              name === 'line' ? 'Weibull fit' : 'failed by then',
            ]}
            labelFormatter={(x) => formatTick(Math.exp(Number(x)), unit)}
          />
          <Line
            data={line}
            dataKey="line"
            stroke={LINE}
            strokeWidth={2}
            dot={false}
            isAnimationActive={false}
          />
          <Scatter data={points} dataKey="y" fill={POINT} isAnimationActive={false} />
        </ComposedChart>
      </ResponsiveContainer>
    </div>
  );
}

/** At most `max` rows, evenly spread, first and last kept: a chart does not need 5,000 steps. */
export function thin<T>(rows: readonly T[], max = 400): T[] {
  if (rows.length <= max) return [...rows];
  const step = (rows.length - 1) / (max - 1);
  return Array.from({ length: max }, (_, i) => rows[Math.round(i * step)]);
}

export function SurvivalChart({ rows, unit }: { rows: readonly KaplanMeierRow[]; unit: 'months' | 'hours' }) {
  const data = [
    { time: 0, survival: 1, band: [1, 1] as [number, number] },
    ...thin(rows).map((r) => ({
      time: r.time,
      survival: r.survival,
      band: [r.lower, r.upper] as [number, number],
    })),
  ];
  const low = Math.min(...data.map((d) => d.band[0]));
  const floor = Math.max(0, Math.floor((low - 0.01) * 100) / 100);
  return (
    <div className="h-72">
      <ResponsiveContainer width="100%" height="100%">
        <ComposedChart
          data={data}
          margin={{ top: 8, right: 16, bottom: 20, left: 8 }}
          accessibilityLayer={false}
        >
          <CartesianGrid stroke={GRID} />
          <XAxis
            type="number"
            dataKey="time"
            domain={[0, 'dataMax']}
            tickFormatter={(t: number) => formatTick(t, unit)}
            stroke={AXIS}
            label={{ value: `Age (${unit})`, position: 'insideBottom', offset: -12, fill: AXIS }}
          />
          <YAxis
            type="number"
            domain={[floor, 1]}
            tickFormatter={(v: number) => formatPercent(v, 1)}
            stroke={AXIS}
            width={56}
          />
          <Tooltip
            formatter={(v) =>
              Array.isArray(v)
                ? `${formatPercent(Number(v[0]), 1)} – ${formatPercent(Number(v[1]), 1)}`
                : formatPercent(Number(v), 2)
            }
            labelFormatter={(t) => formatTick(Number(t), unit)}
          />
          <Area
            type="stepAfter"
            dataKey="band"
            stroke="none"
            fill={BAND}
            fillOpacity={0.7}
            isAnimationActive={false}
            name="95 % band"
          />
          <Line
            type="stepAfter"
            dataKey="survival"
            stroke={POINT}
            strokeWidth={2}
            dot={false}
            isAnimationActive={false}
            name="still working"
          />
        </ComposedChart>
      </ResponsiveContainer>
    </div>
  );
}

export function RankedBars({
  rows,
  label,
}: {
  rows: readonly (RankedCount & { label?: string })[];
  label?: (key: string) => string;
}) {
  const data = rows
    .slice(0, 10)
    .map((r) => ({ name: r.label ?? (label ? label(r.key) : r.key), claims: r.claims }));
  return (
    <div style={{ height: Math.max(120, data.length * 34 + 40) }}>
      <ResponsiveContainer width="100%" height="100%">
        <BarChart
          data={data}
          layout="vertical"
          margin={{ top: 4, right: 24, bottom: 4, left: 8 }}
          accessibilityLayer={false}
        >
          <CartesianGrid stroke={GRID} horizontal={false} />
          <XAxis type="number" allowDecimals={false} stroke={AXIS} />
          <YAxis type="category" dataKey="name" width={190} stroke={AXIS} tick={{ fontSize: 12 }} />
          <Tooltip />
          <Bar dataKey="claims" fill={BAR} isAnimationActive={false} name="claims" />
        </BarChart>
      </ResponsiveContainer>
    </div>
  );
}

/** The install-month x months-in-service table, each cell shaded by its count (the count is always written). */
export function AgeingHeatTable({ table }: { table: AgeingTable }) {
  const max = Math.max(1, ...table.counts.flat());
  return (
    <div
      className="overflow-x-auto"
      tabIndex={0}
      role="region"
      aria-label="Claims by install month and months in service"
    >
      <table className="text-xs tabular-nums">
        <caption className="sr-only">
          Claims by install month (rows) and whole months in service at failure (columns)
        </caption>
        <thead>
          <tr>
            <th scope="col" className="sticky left-0 bg-white px-2 py-1 text-left font-semibold text-ink-700">
              Installed
            </th>
            {table.monthsInService.map((m) => (
              <th key={m} scope="col" className="px-1 py-1 font-semibold text-ink-700">
                {m}
              </th>
            ))}
            <th scope="col" className="px-2 py-1 font-semibold text-ink-700">
              Total
            </th>
          </tr>
        </thead>
        <tbody>
          {table.installMonths.map((month, i) => (
            <tr key={month}>
              <th
                scope="row"
                className="sticky left-0 bg-white px-2 py-0.5 text-left font-medium text-ink-800"
              >
                {month}
              </th>
              {table.counts[i].map((n, m) => {
                const level = n === 0 ? 0 : 0.12 + 0.88 * (n / max);
                return (
                  <td
                    key={m}
                    className="min-w-7 px-1 py-0.5 text-center"
                    style={{
                      backgroundColor: n ? `rgba(13, 92, 87, ${level})` : undefined,
                      color: level > 0.5 ? '#ffffff' : '#1b2320',
                    }}
                  >
                    {n || ''}
                  </td>
                );
              })}
              <td className="px-2 py-0.5 text-right font-semibold text-ink-900">{table.rowTotals[i]}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

export function MonthlyBars({
  data,
  series,
}: {
  data: Record<string, string | number>[];
  series: { key: string; label: string; color: string }[];
}) {
  return (
    <div className="h-72">
      <ResponsiveContainer width="100%" height="100%">
        <BarChart data={data} margin={{ top: 8, right: 16, bottom: 8, left: 8 }} accessibilityLayer={false}>
          <CartesianGrid stroke={GRID} vertical={false} />
          <XAxis dataKey="month" stroke={AXIS} />
          <YAxis stroke={AXIS} tickFormatter={(v: number) => formatNumber(v)} width={64} />
          <Tooltip formatter={(v) => formatNumber(Number(v), 2)} />
          {series.map((s) => (
            <Bar key={s.key} dataKey={s.key} name={s.label} fill={s.color} isAnimationActive={false} />
          ))}
        </BarChart>
      </ResponsiveContainer>
    </div>
  );
}
