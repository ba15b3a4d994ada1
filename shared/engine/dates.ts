// Calendar arithmetic on ISO dates (YYYY-MM-DD) with integers only: no Date objects, no time zones,
// so the same input gives the same answer in every browser and on the server.

/** Days since 1970-01-01 of a proleptic Gregorian date (Howard Hinnant's days_from_civil). */
export function daysFromCivil(year: number, month: number, day: number): number {
  const y = month <= 2 ? year - 1 : year;
  const era = Math.floor(y / 400);
  const yoe = y - era * 400;
  const mp = (month + 9) % 12;
  const doy = Math.floor((153 * mp + 2) / 5) + day - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 719468;
}

export function isLeapYear(year: number): boolean {
  return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0;
}

export function daysInMonth(year: number, month: number): number {
  if (month === 2) return isLeapYear(year) ? 29 : 28;
  return month === 4 || month === 6 || month === 9 || month === 11 ? 30 : 31;
}

// Reads the digits by char code: the input is already validated as YYYY-MM-DD.
function digits(s: string, from: number, to: number): number {
  let n = 0;
  for (let i = from; i < to; i++) n = n * 10 + (s.charCodeAt(i) - 48);
  return n;
}

export function isoYear(iso: string): number {
  return digits(iso, 0, 4);
}
export function isoMonth(iso: string): number {
  return digits(iso, 5, 7);
}
export function isoDay(iso: string): number {
  return digits(iso, 8, 10);
}

/** Days since 1970-01-01 of an ISO date string. */
export function isoToDays(iso: string): number {
  return daysFromCivil(isoYear(iso), isoMonth(iso), isoDay(iso));
}

/** Whole days from `from` to `to` (negative when `to` is earlier). */
export function daysBetween(from: string, to: string): number {
  return isoToDays(to) - isoToDays(from);
}

/**
 * Whole calendar months completed from `from` to `to`: the largest n for which the n-month anniversary
 * of `from` is on or before `to`. An anniversary that falls on a day the month does not have moves to that
 * month's last day (Jan 31 + 1 month = Feb 28, or Feb 29 in a leap year), so Jan 31 -> Feb 28 (2025) is one
 * month and Jan 31 -> Feb 27 is none. Never below 0.
 */
export function wholeMonthsBetween(from: string, to: string): number {
  const y1 = isoYear(from);
  const m1 = isoMonth(from);
  const d1 = isoDay(from);
  const y2 = isoYear(to);
  const m2 = isoMonth(to);
  const d2 = isoDay(to);
  let months = (y2 - y1) * 12 + (m2 - m1);
  const anniversaryDay = Math.min(d1, daysInMonth(y2, m2));
  if (d2 < anniversaryDay) months -= 1;
  return months < 0 ? 0 : months;
}
