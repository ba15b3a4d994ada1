// The one way Lumenproof shows a date or a time, on screens, in PDFs and in e-mails: Intl.DateTimeFormat in the
// reader's locale and their organisation's time zone. Two kinds of value, never mixed:
//  - an instant (filed at, decided at, a history entry): an ISO timestamp, shown in the organisation's zone;
//  - a calendar date (failed on, installed on, answer due): "YYYY-MM-DD", a day on the calendar that belongs to
//    no zone, formatted as that very day whatever the reader's zone.

export type DateRule = {
  /** A BCP 47 tag ("en-US", "de-DE"); an unknown or empty one falls back to en-US. */
  locale?: string;
  /** An IANA zone ("America/Chicago"); an unknown or empty one falls back to UTC. */
  timeZone?: string;
};

export const DEFAULT_LOCALE = 'en-US';
export const DEFAULT_TIME_ZONE = 'UTC';

const CALENDAR_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;
const formatters = new Map<string, Intl.DateTimeFormat>();

/** True for a zone this runtime's Intl knows ("Europe/Berlin", "UTC"); false for anything else. */
export function isTimeZone(zone: string): boolean {
  if (!zone || zone.length > 64) return false;
  try {
    new Intl.DateTimeFormat('en-US', { timeZone: zone });
    return true;
  } catch {
    return false;
  }
}

/** True for a locale tag Intl accepts and supports ("en-GB", "fr-CA"). */
export function isLocale(tag: string): boolean {
  if (!tag || tag.length > 35) return false;
  try {
    return Intl.DateTimeFormat.supportedLocalesOf([tag]).length > 0;
  } catch {
    return false;
  }
}

function ruleOf(rule: DateRule | undefined) {
  const locale = rule?.locale && isLocale(rule.locale) ? rule.locale : DEFAULT_LOCALE;
  const timeZone = rule?.timeZone && isTimeZone(rule.timeZone) ? rule.timeZone : DEFAULT_TIME_ZONE;
  return { locale, timeZone };
}

function formatter(locale: string, options: Intl.DateTimeFormatOptions) {
  const key = `${locale}|${JSON.stringify(options)}`;
  let f = formatters.get(key);
  if (!f) {
    f = new Intl.DateTimeFormat(locale, options);
    formatters.set(key, f);
  }
  return f;
}

function instantOf(value: string | Date): Date {
  const d = typeof value === 'string' ? new Date(value) : value;
  if (Number.isNaN(d.getTime())) throw new Error(`expected a timestamp, got "${String(value)}"`);
  return d;
}

/** True for an existing day written "YYYY-MM-DD". */
export function isCalendarDate(value: string): boolean {
  try {
    calendarInstant(value);
    return true;
  } catch {
    return false;
  }
}

/** Noon UTC of a calendar date: far enough from midnight that the date is that day in every zone. */
function calendarInstant(iso: string): Date {
  const m = CALENDAR_DATE.exec(iso);
  if (!m) throw new Error(`expected a date as YYYY-MM-DD, got "${iso}"`);
  const d = new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3]), 12));
  if (d.getUTCMonth() !== Number(m[2]) - 1 || d.getUTCDate() !== Number(m[3])) {
    throw new Error(`no such day: "${iso}"`);
  }
  return d;
}

/** An instant as date and time to the minute, in the rule's zone: "Nov 27, 2026, 3:00 PM" (en-US). */
export function formatDateTime(value: string | Date, rule?: DateRule): string {
  const { locale, timeZone } = ruleOf(rule);
  return formatter(locale, { dateStyle: 'medium', timeStyle: 'short', timeZone }).format(instantOf(value));
}

/** An instant as the calendar day it falls on in the rule's zone: "Nov 27, 2026" (en-US). */
export function formatDay(value: string | Date, rule?: DateRule): string {
  const { locale, timeZone } = ruleOf(rule);
  return formatter(locale, { dateStyle: 'medium', timeZone }).format(instantOf(value));
}

/** The exact instant, to the second and with the zone's name: what a hover shows. */
export function formatExact(value: string | Date, rule?: DateRule): string {
  const { locale, timeZone } = ruleOf(rule);
  return formatter(locale, {
    year: 'numeric',
    month: 'long',
    day: 'numeric',
    weekday: 'long',
    hour: 'numeric',
    minute: '2-digit',
    second: '2-digit',
    timeZone,
    timeZoneName: 'short',
  }).format(instantOf(value));
}

/** A calendar date ("2026-11-03") as that same day in the rule's locale: "Nov 3, 2026"; the zone never moves it. */
export function formatCalendarDate(
  iso: string,
  rule?: DateRule,
  style: 'medium' | 'long' = 'medium',
): string {
  const { locale } = ruleOf(rule);
  return formatter(locale, { dateStyle: style, timeZone: 'UTC' }).format(calendarInstant(iso));
}

/** The calendar day ("YYYY-MM-DD") an instant falls on in a zone: a letter decided at 01:00 UTC in Chicago is
 *  dated the evening before. */
export function calendarDayIn(value: string | Date, timeZone?: string): string {
  const zone = timeZone && isTimeZone(timeZone) ? timeZone : DEFAULT_TIME_ZONE;
  const parts = formatter('en-US', {
    year: 'numeric',
    month: '2-digit',
    day: '2-digit',
    timeZone: zone,
  }).formatToParts(instantOf(value));
  const get = (t: string) => parts.find((p) => p.type === t)?.value ?? '';
  return `${get('year')}-${get('month')}-${get('day')}`;
}

/** Today ("YYYY-MM-DD") in a zone, UTC when none is given: the one "today" of both sides. The server passes
 *  its clock (`clock.today()`), the client its organisation's zone (`useToday()`). */
export function todayIn(timeZone?: string, now: Date = new Date()): string {
  return calendarDayIn(now, timeZone);
}

/** Every IANA zone this runtime knows, for a picker (UTC first). */
export function timeZones(): string[] {
  const intl = Intl as unknown as { supportedValuesOf?: (k: string) => string[] };
  const all = intl.supportedValuesOf ? intl.supportedValuesOf('timeZone') : [];
  return ['UTC', ...all.filter((z) => z !== 'UTC')];
}
