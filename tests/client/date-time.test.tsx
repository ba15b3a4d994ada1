import { cleanup, render, screen } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import type { SessionDto } from '../../src/lib/session';
import { CalendarDate, DateTime, DayOf } from '../../src/components/ui/date-time';
import { SessionProvider } from '../../src/lib/ability';

afterEach(cleanup);

const session = (timeZone: string): SessionDto => ({
  user: {
    id: 'u1',
    email: 'r@example.test',
    name: 'R',
    roles: ['reviewer'],
    organization: { id: 'o1', name: 'O', kind: 'manufacturer', timeZone, locale: 'en-US' },
  },
  app: { mode: 'production' },
});
const plain = (s: string | null) => (s ?? '').replace(/[\u202f\u00a0]/g, ' ');

describe('dates on screen', () => {
  it("shows an instant in the organisation's zone with the exact time on hover", () => {
    render(
      <SessionProvider session={session('America/Chicago')}>
        <DateTime value="2026-11-28T01:30:05Z" />
        <DayOf value="2026-11-28T01:30:05Z" />
      </SessionProvider>,
    );
    // 01:30 UTC is 19:30 the evening before in Chicago (CST, UTC-6: 15 U.S.C. 260a)
    const [time, day] = screen.getAllByRole('time', { hidden: true }) as HTMLTimeElement[];
    expect(plain(time.textContent)).toBe('Nov 27, 2026, 7:30 PM');
    expect(time.dateTime).toBe('2026-11-28T01:30:05Z');
    expect(plain(time.title)).toBe('Friday, November 27, 2026 at 7:30:05 PM CST');
    expect(day.textContent).toBe('Nov 27, 2026');
    expect(day.dateTime).toBe('2026-11-27');
  });

  it('never moves a calendar date, whatever the zone', () => {
    for (const zone of ['Pacific/Honolulu', 'Pacific/Kiritimati']) {
      render(
        <SessionProvider session={session(zone)}>
          <CalendarDate value="2026-11-03" />
        </SessionProvider>,
      );
      // Honolulu is UTC-10, Kiritimati UTC+14 (IANA tz database): a shifted date would land a day off
      expect(screen.getByText('Nov 3, 2026').getAttribute('datetime')).toBe('2026-11-03');
      cleanup();
    }
  });
});
