import Papa from 'papaparse';
import type { Response } from 'express';
import { FAILURE_MODE_LABELS } from '../../../shared/analytics/failure-mode-rules';
import type { RankedCount } from '../../../shared/analytics/failure-modes';
import type {
  ClaimsAgeingDto,
  FailureModesDto,
  LifeAnalysisDto,
  ReserveDto,
} from '../../../shared/schemas/analytics';

// Every list of numbers the screens chart is also a CSV: the same numbers as the JSON, unrounded, one table per
// file. Cells that a spreadsheet would run as a formula are escaped (papaparse's escapeFormulae).

export type CsvTable = { name: string; fields: string[]; rows: (string | number | null)[][] };

export function sendCsv(res: Response, table: CsvTable) {
  const body = Papa.unparse(
    { fields: table.fields, data: table.rows },
    { escapeFormulae: true, newline: '\r\n' },
  );
  res.type('text/csv; charset=utf-8').attachment(`lumenproof-${table.name}.csv`).send(`${body}\r\n`);
}

const slug = (s: string) =>
  s
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-|-$/g, '');

export function lifeCsv(
  dto: LifeAnalysisDto,
  table: 'fit' | 'probability-plot' | 'kaplan-meier' | 'life-data',
): CsvTable {
  const name = `${table}-${slug(dto.population.label)}-${dto.lifeData.unit}`;
  if (table === 'fit') {
    const f = dto.fit;
    return {
      name,
      fields: ['method', 'shape', 'scale', 'b10', 'b50', 'meanLife', 'failures', 'units', 'unit'],
      rows: f
        ? [[f.method, f.shape, f.scale, f.b10, f.b50, f.meanLife, f.failures, f.units, dto.lifeData.unit]]
        : [],
    };
  }
  if (table === 'probability-plot') {
    return {
      name,
      fields: ['series', 'time', 'F', 'x', 'y', 'count'],
      rows: dto.probabilityPlot
        ? [
            ...dto.probabilityPlot.points.map((p) => ['failure', p.time, p.F, p.x, p.y, p.count]),
            ...dto.probabilityPlot.line.map((p) => ['fitted line', p.time, p.F, p.x, p.y, null]),
          ]
        : [],
    };
  }
  if (table === 'kaplan-meier') {
    return {
      name,
      fields: ['time', 'atRisk', 'failed', 'censored', 'survival', 'standardError', 'lower', 'upper'],
      rows: dto.kaplanMeier.map((r) => [
        r.time,
        r.atRisk,
        r.failed,
        r.censored,
        r.survival,
        r.standardError,
        r.lower,
        r.upper,
      ]),
    };
  }
  return {
    name,
    fields: ['status', 'age', 'units'],
    rows: [
      ...dto.lifeData.failureGroups.map((g) => ['failed', g.time, g.count]),
      ...dto.lifeData.suspensionGroups.map((g) => ['working', g.time, g.count]),
    ],
  };
}

const ranked = (rows: RankedCount[], label?: (key: string) => string) =>
  rows.map((r) => [label ? label(r.key) : r.key, r.claims, r.units, r.share]);

export function failureModesCsv(
  dto: FailureModesDto,
  table: 'modes' | 'environment' | 'lot' | 'contractor' | 'ageing',
): CsvTable {
  const base = slug(dto.population.label);
  if (table === 'modes')
    return {
      name: `failure-modes-${base}`,
      fields: ['failureMode', 'claims', 'units', 'share'],
      rows: ranked(dto.modes, (k) => FAILURE_MODE_LABELS[k] ?? k),
    };
  if (table === 'lot')
    return {
      name: `claims-by-lot-${base}`,
      fields: ['lot', 'claims', 'units', 'share'],
      rows: ranked(dto.lots),
    };
  if (table === 'contractor')
    return {
      name: `claims-by-contractor-${base}`,
      fields: ['contractor', 'claims', 'units', 'share'],
      rows: ranked(dto.contractors),
    };
  if (table === 'environment') {
    const ct = dto.crossTable;
    return {
      name: `failure-modes-by-${slug(ct.factor)}-${base}`,
      fields: ['failureMode', ...ct.columns, 'total'],
      rows: ct.rows.map((mode, i) => [FAILURE_MODE_LABELS[mode] ?? mode, ...ct.counts[i], ct.rowTotals[i]]),
    };
  }
  const a = dto.ageing;
  return {
    name: `claims-by-install-month-${base}`,
    fields: ['installMonth', ...a.monthsInService.map((m) => `month ${m}`), 'total'],
    rows: a.installMonths.map((month, i) => [month, ...a.counts[i], a.rowTotals[i]]),
  };
}

export function claimsAgeingCsv(dto: ClaimsAgeingDto, table: 'open' | 'throughput'): CsvTable {
  if (table === 'open') {
    return {
      name: `open-claims-by-age-${dto.asOf}`,
      fields: ['age', 'waitingOnManufacturer', 'waitingOnContractor', 'total'],
      rows: dto.open.map((r) => [r.band, r.manufacturer, r.contractor, r.total]),
    };
  }
  return {
    name: `decisions-per-week-${dto.asOf}`,
    fields: ['weekStarting', 'approved', 'denied', 'decided'],
    rows: dto.throughput.map((r) => [r.week, r.approved, r.denied, r.decided]),
  };
}

export function reserveCsv(dto: ReserveDto, table: 'months' | 'cohorts'): CsvTable {
  if (table === 'months') {
    const rows: (string | number)[][] = [];
    for (const t of dto.totals)
      dto.monthLabels.forEach((m, k) => rows.push([t.currency, m, t.monthlyClaims[k], t.monthlyAmounts[k]]));
    return {
      name: `reserve-by-month-${dto.asOf}`,
      fields: ['currency', 'month', 'expectedClaims', 'amount'],
      rows,
    };
  }
  return {
    name: `reserve-by-cohort-${dto.asOf}`,
    fields: [
      'model',
      'installMonth',
      'ageMonths',
      'survivors',
      'termMonths',
      'unitCredit',
      'currency',
      'expectedClaims',
      'amount',
      'fitFrom',
    ],
    rows: dto.cohorts.map((c) => [
      c.modelNumber,
      c.installMonth,
      c.ageMonths,
      c.survivors,
      c.termMonths,
      c.unitCredit,
      c.currency,
      c.expectedClaims,
      c.amount,
      c.fitFrom,
    ]),
  };
}
