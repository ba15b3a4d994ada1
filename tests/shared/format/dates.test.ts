import { describe, expect, it } from 'vitest';
import {
  calendarDayIn,
  todayIn,
  formatCalendarDate,
  formatDateTime,
  formatDay,
  formatExact,
  isLocale,
  isTimeZone,
  timeZones,
} from '../../../shared/dates';

// Intl output may separate time and AM/PM with a narrow no-break space (CLDR 42+); compare on plain spaces.
const plain = (s: string) => s.replace(/[\u202f\u00a0]/g, ' ');

describe('one rule for dates and times', () => {
  it('shows an instant in the organisation zone, to the minute', () => {
    // 2026-11-27 is after the first Sunday of November: Central Standard Time, UTC-6
    // (15 U.S.C. 260a, as amended by the Energy Policy Act of 2005, s. 110)
    expect(
      plain(formatDateTime('2026-11-27T21:00:00Z', { locale: 'en-US', timeZone: 'America/Chicago' })),
    ).toBe('Nov 27, 2026, 3:00 PM');
    // Central European Time in November is UTC+1 (Directive 2000/84/EC: summer time ends the last Sunday of
    // October); CLDR de medium date "dd.MM.y", short time "HH:mm"
    expect(
      plain(formatDateTime('2026-11-27T21:00:00Z', { locale: 'de-DE', timeZone: 'Europe/Berlin' })),
    ).toBe('27.11.2026, 22:00');
  });

  it('follows daylight saving time: the same wall clock is another UTC hour in July', () => {
    // Central Daylight Time, UTC-5, from the second Sunday of March (15 U.S.C. 260a)
    expect(
      plain(formatDateTime('2026-07-01T20:00:00Z', { locale: 'en-US', timeZone: 'America/Chicago' })),
    ).toBe('Jul 1, 2026, 3:00 PM');
  });

  it('gives the exact time, seconds and zone name, for a hover', () => {
    // CLDR en-US full date "EEEE, MMMM d, y", time "h:mm:ss a z"; CST as the short US zone name
    expect(plain(formatExact('2026-11-27T21:00:07Z', { locale: 'en-US', timeZone: 'America/Chicago' }))).toBe(
      'Friday, November 27, 2026 at 3:00:07 PM CST',
    );
  });

  it('never moves a calendar date with the zone', () => {
    // A failure dated 3 November is 3 November to a reader in Honolulu (UTC-10) and in Auckland (UTC+13 in
    // November, NZ Daylight Time Order 2007): the value is a day, not an instant. CLDR en-US medium "MMM d, y".
    expect(formatCalendarDate('2026-11-03', { locale: 'en-US', timeZone: 'Pacific/Honolulu' })).toBe(
      'Nov 3, 2026',
    );
    expect(formatCalendarDate('2026-11-03', { locale: 'en-US', timeZone: 'Pacific/Auckland' })).toBe(
      'Nov 3, 2026',
    );
    // CLDR en-GB long "d MMMM y"
    expect(formatCalendarDate('2025-03-04', { locale: 'en-GB' }, 'long')).toBe('4 March 2025');
  });

  it('refuses what is not a calendar date', () => {
    expect(() => formatCalendarDate('2026-02-29')).toThrow(/no such day/); // 2026 is not a leap year (Gregorian)
    expect(() => formatCalendarDate('11/03/2026')).toThrow(/YYYY-MM-DD/);
    expect(() => formatDateTime('not a time')).toThrow(/timestamp/);
  });

  it('dates an instant by the day it falls on in the zone', () => {
    // 01:30 UTC on 28 November is 19:30 on 27 November in Chicago (CST, UTC-6) and 10:30 on 28 November in
    // Tokyo (JST, UTC+9, no daylight saving since 1951)
    expect(calendarDayIn('2026-11-28T01:30:00Z', 'America/Chicago')).toBe('2026-11-27');
    expect(calendarDayIn('2026-11-28T01:30:00Z', 'Asia/Tokyo')).toBe('2026-11-28');
    expect(formatDay('2026-11-28T01:30:00Z', { locale: 'en-US', timeZone: 'America/Chicago' })).toBe(
      'Nov 27, 2026',
    );
  });

  it('falls back to en-US and UTC on an unknown locale or zone, and knows the IANA zones', () => {
    expect(isTimeZone('America/Chicago')).toBe(true);
    expect(isTimeZone('Mars/Olympus_Mons')).toBe(false);
    expect(isLocale('fr-CA')).toBe(true);
    expect(isLocale('not a locale')).toBe(false);
    expect(plain(formatDateTime('2026-11-27T21:00:00Z', { locale: '', timeZone: 'Nowhere/Else' }))).toBe(
      'Nov 27, 2026, 9:00 PM',
    );
    expect(timeZones()[0]).toBe('UTC');
    expect(timeZones()).toContain('Europe/Berlin');
  });
});

describe("today in the organisation's time zone", () => {
  it('is the calendar day of now in that zone, UTC when none is given', () => {
    // IANA tz database: America/Chicago is UTC-6 (CST) in December; Asia/Tokyo is UTC+9 (JST) with no DST.
    const evening = new Date('2026-12-03T04:00:00Z'); // 22:00 on Dec 2 in Chicago
    expect(todayIn('America/Chicago', evening)).toBe('2026-12-02');
    expect(todayIn(undefined, evening)).toBe('2026-12-03');
    const afternoon = new Date('2026-12-03T16:00:00Z'); // 01:00 on Dec 4 in Tokyo
    expect(todayIn('Asia/Tokyo', afternoon)).toBe('2026-12-04');
    expect(todayIn('Not/A_Zone', afternoon)).toBe('2026-12-03');
  });
});
