import {
  formatCalendarDate,
  formatDateTime,
  formatDay,
  formatExact,
  calendarDayIn,
  isCalendarDate,
} from '../../../shared/dates';
import { useDateRule } from '../../lib/dates';

// Every date and time on a screen goes through these three, so one claim never shows two formats. The hover
// (title) carries the exact instant with seconds and zone; screen readers get the machine value in dateTime.

/** An instant, to the minute, in the organisation's zone: "Nov 27, 2026, 3:00 PM". */
export function DateTime({ value, className }: { value: string | Date; className?: string }) {
  const rule = useDateRule();
  const iso = typeof value === 'string' ? value : value.toISOString();
  return (
    <time dateTime={iso} title={formatExact(iso, rule)} className={className}>
      {formatDateTime(iso, rule)}
    </time>
  );
}

/** The day an instant falls on in the organisation's zone ("Filed Nov 3, 2026"), the exact time on hover. */
export function DayOf({ value, className }: { value: string | Date; className?: string }) {
  const rule = useDateRule();
  const iso = typeof value === 'string' ? value : value.toISOString();
  return (
    <time dateTime={calendarDayIn(iso, rule.timeZone)} title={formatExact(iso, rule)} className={className}>
      {formatDay(iso, rule)}
    </time>
  );
}

/** A calendar date (failed on, installed on, due on): the same day in every zone. */
export function CalendarDate({ value, className }: { value: string; className?: string }) {
  const rule = useDateRule();
  // What a person typed (a batch file's row) may not be a date at all: show it as written.
  if (!isCalendarDate(value)) return <span className={className}>{value}</span>;
  return (
    <time dateTime={value} title={formatCalendarDate(value, rule, 'long')} className={className}>
      {formatCalendarDate(value, rule)}
    </time>
  );
}

export type DateText = ReturnType<typeof useDateText>;

/** The plain-text forms, for strings (descriptions, aria labels, CSV-free summaries). */
export function useDateText() {
  const rule = useDateRule();
  return {
    dateTime: (v: string | Date) => formatDateTime(v, rule),
    day: (v: string | Date) => formatDay(v, rule),
    calendar: (v: string) => (isCalendarDate(v) ? formatCalendarDate(v, rule) : v),
  };
}
