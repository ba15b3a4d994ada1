import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Inbox } from 'lucide-react';
import { Link } from 'react-router';
import { WAITING_TEXT, type WaitingItemDto } from '../../../../shared/schemas/waiting';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { DateTime, DayOf } from '../../../components/ui/date-time';
import { EmptyState } from '../../../components/ui/empty-state';
import { Spinner } from '../../../components/ui/spinner';
import { markWaitingRead, waitingQueries } from '../api/waiting-queries';

/** Everything that waits on the signed-in person, oldest first, each with the place to act. */
export function WaitingList() {
  const qc = useQueryClient();
  const { data, isPending, isError } = useQuery(waitingQueries.list());
  const mark = useMutation({
    mutationFn: (keys: string[]) => markWaitingRead(keys),
    onSuccess: () => qc.invalidateQueries({ queryKey: waitingQueries.all }),
  });
  if (isPending) return <Spinner label="Loading what waits on you" />;
  if (isError) return <p role="alert">The list could not be loaded. Try again in a moment.</p>;
  const unreadKeys = data.items.filter((i) => !i.read).map((i) => i.key);
  if (!data.items.length)
    return (
      <Card>
        <EmptyState icon={<Inbox className="size-6" />} title="Nothing waits on you">
          When a claim needs you, it appears here and the bell counts it.
        </EmptyState>
      </Card>
    );
  return (
    <Card>
      <div className="flex flex-wrap items-center justify-between gap-2 border-b border-ink-100 px-4 py-3 sm:px-5">
        <p className="text-sm text-ink-700">
          {data.items.length} {data.items.length === 1 ? 'thing waits' : 'things wait'} on you, {data.unread}{' '}
          unread.
        </p>
        <Button
          variant="secondary"
          size="sm"
          disabled={!unreadKeys.length}
          loading={mark.isPending}
          onClick={() => mark.mutate(unreadKeys)}
        >
          Mark all read
        </Button>
      </div>
      <ul aria-label="Waiting on you" className="divide-y divide-ink-100">
        {data.items.map((i) => (
          <Item key={i.key} item={i} onOpen={() => (i.read ? undefined : mark.mutate([i.key]))} />
        ))}
      </ul>
    </Card>
  );
}

function Item({ item: i, onOpen }: { item: WaitingItemDto; onOpen: () => void }) {
  return (
    <li className={i.read ? 'bg-white' : 'bg-brand-50/60'}>
      <Link
        to={i.link}
        onClick={onOpen}
        className="flex min-h-11 flex-col gap-1 px-4 py-3 hover:bg-ink-50 sm:px-5"
      >
        <span className="flex flex-wrap items-center gap-2">
          {i.read ? null : <Badge tone="info">Unread</Badge>}
          <span className="font-medium text-ink-900">{WAITING_TEXT[i.kind]}</span>
        </span>
        <span className="text-sm text-ink-700">
          Claim <span className="font-mono">{i.claimNumber}</span> · {i.siteName} · since{' '}
          {i.kind === 'return_overdue' ? <DayOf value={i.since} /> : <DateTime value={i.since} />}
        </span>
      </Link>
    </li>
  );
}
