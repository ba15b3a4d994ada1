import { todayIn } from '../../shared/dates';

// One source of "now" for the server, so that timeouts and windows can be tested with a fake clock.
let offsetMs = 0;

export const clock = {
  now(): Date {
    return new Date(Date.now() + offsetMs);
  },
  nowMs(): number {
    return Date.now() + offsetMs;
  },
  /** Today ("YYYY-MM-DD") on this clock in a zone; UTC when none is given. */
  today(timeZone?: string): string {
    return todayIn(timeZone, new Date(Date.now() + offsetMs));
  },
  /** Tests only: move the server's clock forward. */
  advance(ms: number) {
    offsetMs += ms;
  },
  reset() {
    offsetMs = 0;
  },
};
