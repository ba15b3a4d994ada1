import { describe, expect, it } from 'vitest';

import {
  ageingTable,
  ambientBand,
  crossTabulate,
  failureModesByEnvironment,
  NOT_RECORDED,
  rankByContractor,
  rankByEnvironment,
  rankByLot,
  rankFailureModes,
  type ClaimRow,
} from '../../../shared/analytics/failure-modes';

// Invented demo rows.
const rows: ClaimRow[] = [
  {
    failureMode: 'driver',
    installedOn: '2024-01-10',
    failedOn: '2024-03-12',
    lot: 'L2',
    contractor: 'Brightline',
    enclosure: 'enclosed',
    units: 4,
  },
  {
    failureMode: 'driver',
    installedOn: '2024-01-20',
    failedOn: '2024-02-25',
    lot: 'L2',
    contractor: 'Brightline',
    enclosure: 'enclosed',
  },
  {
    failureMode: 'dark-leds',
    installedOn: '2024-03-01',
    failedOn: '2024-03-31',
    lot: 'L1',
    contractor: 'Voltworks',
    enclosure: 'open',
    units: 2,
  },
  {
    failureMode: 'driver',
    installedOn: '2024-03-05',
    failedOn: '2024-09-05',
    lot: 'L1',
    contractor: 'Voltworks',
    enclosure: null,
  },
  {
    failureMode: 'fan',
    installedOn: '2024-01-02',
    failedOn: '2024-01-30',
    lot: null,
    contractor: 'Voltworks',
    enclosure: 'open',
  },
];

describe('failure-mode rankings', () => {
  it('ranks by failure mode: most claims first, with units and shares', () => {
    expect(rankFailureModes(rows)).toEqual([
      { key: 'driver', claims: 3, units: 6, share: 0.6 },
      { key: 'dark-leds', claims: 1, units: 2, share: 0.2 },
      { key: 'fan', claims: 1, units: 1, share: 0.2 },
    ]);
  });

  it('ranks by a condition, by lot and by contractor; missing values are "not recorded"', () => {
    expect(rankByEnvironment(rows, 'enclosure').map((r) => [r.key, r.claims])).toEqual([
      ['enclosed', 2],
      ['open', 2],
      [NOT_RECORDED, 1],
    ]);
    // L1 and L2 have two claims each; L2's name more units.
    expect(rankByLot(rows).map((r) => r.key)).toEqual(['L2', 'L1', NOT_RECORDED]);
    expect(rankByContractor(rows)[0]).toMatchObject({ key: 'Voltworks', claims: 3 });
    expect(rankFailureModes([])).toEqual([]);
  });

  it('failure mode x condition table with totals', () => {
    const table = failureModesByEnvironment(rows, 'enclosure');
    expect(table.rows).toEqual(['driver', 'dark-leds', 'fan']);
    expect(table.columns).toEqual(['enclosed', 'open', NOT_RECORDED]);
    expect(table.counts).toEqual([
      [2, 0, 1],
      [0, 1, 0],
      [0, 1, 0],
    ]);
    expect(table.rowTotals).toEqual([3, 1, 1]);
    expect(table.columnTotals).toEqual([2, 2, 1]);
    expect(
      crossTabulate(
        rows,
        (r) => r.lot,
        (r) => r.contractor,
      ).total,
    ).toBe(5);
  });

  it('ambient bands: an edge belongs to the band above it', () => {
    expect(ambientBand(10)).toBe('below 25 °C');
    expect(ambientBand(25)).toBe('25-35 °C');
    expect(ambientBand(44.9)).toBe('35-45 °C');
    expect(ambientBand(45)).toBe('45 °C and above');
    expect(ambientBand(null)).toBeNull();
    expect(ambientBand(30, [40])).toBe('below 40 °C');
  });

  it('ageing table: install month x whole months in service, months without claims kept', () => {
    const table = ageingTable(rows);
    expect(table.installMonths).toEqual(['2024-01', '2024-02', '2024-03']);
    expect(table.monthsInService).toEqual([0, 1, 2, 3, 4, 5, 6]);
    expect(table.counts).toEqual([
      [1, 1, 1, 0, 0, 0, 0],
      [0, 0, 0, 0, 0, 0, 0],
      [1, 0, 0, 0, 0, 0, 1],
    ]);
    expect(table.rowTotals).toEqual([3, 0, 2]);
    expect(table.columnTotals).toEqual([2, 1, 1, 0, 0, 0, 1]);
    expect(ageingTable([]).counts).toEqual([]);
  });

  it('the ageing table spans a year end', () => {
    const table = ageingTable([
      { failureMode: 'driver', installedOn: '2023-11-30', failedOn: '2024-01-02' },
      { failureMode: 'driver', installedOn: '2024-01-03', failedOn: '2024-01-04' },
    ]);
    expect(table.installMonths).toEqual(['2023-11', '2023-12', '2024-01']);
    expect(table.counts[0]).toEqual([0, 1]);
  });
});
