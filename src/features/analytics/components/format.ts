// Numbers for people: lives in months or hours, shares in per cent, money with its currency.

export function formatLife(value: number, unit: 'months' | 'hours'): string {
  if (!Number.isFinite(value)) return '—';
  if (unit === 'hours') return `${Math.round(value).toLocaleString('en-US')} h`;
  if (value >= 24) return `${(value / 12).toLocaleString('en-US', { maximumFractionDigits: 1 })} years`;
  return `${value.toLocaleString('en-US', { maximumFractionDigits: 1 })} months`;
}

export const formatNumber = (v: number, digits = 0) =>
  v.toLocaleString('en-US', { minimumFractionDigits: digits, maximumFractionDigits: digits });
export const formatPercent = (share: number, digits = 0) =>
  `${(share * 100).toLocaleString('en-US', { maximumFractionDigits: digits })} %`;
/** Money in a summary: whole units, the currency as its symbol ("$1,235"); see shared/money.ts. */
export const WHOLE_MONEY = { whole: true, code: false } as const;

/** Compact tick labels for a time axis. */
export function formatTick(value: number, unit: 'months' | 'hours'): string {
  if (unit === 'hours')
    return value >= 1000
      ? `${formatNumber(value / 1000, value < 10_000 ? 1 : 0)}k h`
      : `${formatNumber(value)} h`;
  return `${formatNumber(value, value < 1 ? 1 : 0)} mo`;
}
