import { useQuery } from '@tanstack/react-query';
import { Bell } from 'lucide-react';
import { Link } from 'react-router';
import { cn } from '../../../lib/cn';
import { waitingQueries } from '../api/waiting-queries';

/** The bell in the header: how many things wait on this person and are not read yet. */
export function WaitingBell({ className }: { className?: string }) {
  const { data } = useQuery(waitingQueries.list());
  const unread = data?.unread ?? 0;
  return (
    <Link
      to="/waiting"
      aria-label={unread ? `Waiting on you: ${unread} unread` : 'Waiting on you: nothing unread'}
      className={cn(
        'relative inline-flex size-11 shrink-0 items-center justify-center rounded-lg text-ink-700 hover:bg-ink-100',
        className,
      )}
    >
      <Bell className="size-5" aria-hidden />
      {unread ? (
        <span
          aria-hidden
          className="absolute top-1 right-1 min-w-5 rounded-full bg-bad-700 px-1 text-center text-xs leading-5 font-semibold text-white"
        >
          {unread > 99 ? '99+' : unread}
        </span>
      ) : null}
    </Link>
  );
}
