import { useMemo } from 'react';
import { todayIn, type DateRule } from '../../shared/dates';
import { useOptionalSession } from './ability';

/** The reader's locale (the browser's) and their organisation's time zone: the rule every date here follows. */
export function useDateRule(): DateRule {
  const session = useOptionalSession();
  const timeZone = session?.user.organization.timeZone;
  return useMemo(
    () => ({ locale: typeof navigator === 'undefined' ? undefined : navigator.language, timeZone }),
    [timeZone],
  );
}

/** Today ("YYYY-MM-DD") in the organisation's time zone: the default of a date the user records. */
export function useToday(): string {
  return todayIn(useDateRule().timeZone);
}
