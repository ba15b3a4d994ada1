import { useQuery } from '@tanstack/react-query';
import { useSearchParams } from 'react-router';
import { Inbox, Paperclip } from 'lucide-react';
import { Card } from '../../../components/ui/card';
import { EmptyState } from '../../../components/ui/empty-state';
import { PageHeader } from '../../../components/ui/page-header';
import { Spinner } from '../../../components/ui/spinner';
import { cn } from '../../../lib/cn';
import { mailboxQueries } from '../api/mailbox-queries';
import { DateTime } from '../../../components/ui/date-time';

/** Demo mode only: the messages the local fake SMTP server received for people of this organisation. */
export function MailboxList() {
  const list = useQuery(mailboxQueries.list());
  // The open message is kept in the address, so Back and reload show the same one.
  const [search, setSearch] = useSearchParams();
  const openId = search.get('message');
  const setOpenId = (id: string) =>
    setSearch(
      (prev) => {
        const next = new URLSearchParams(prev);
        next.set('message', id);
        return next;
      },
      { replace: true },
    );
  const items = list.data?.items ?? [];
  const open = items.find((m) => m.id === openId) ?? items[0];
  return (
    <>
      <PageHeader
        title="Demo mailbox"
        description="E-mail Lumenproof sent to your organisation. In the demo nothing leaves this machine."
      />
      {list.isPending ? (
        <Spinner label="Loading messages" />
      ) : items.length === 0 ? (
        <Card>
          <EmptyState icon={<Inbox className="size-6" />} title="No messages yet">
            Invitations and claim updates for your organisation appear here.
          </EmptyState>
        </Card>
      ) : (
        <div className="grid gap-4 lg:grid-cols-[minmax(0,22rem)_1fr]">
          <Card className="overflow-hidden">
            <ul className="max-h-[70vh] divide-y divide-ink-100 overflow-y-auto">
              {items.map((m) => (
                <li key={m.id}>
                  <button
                    type="button"
                    onClick={() => setOpenId(m.id)}
                    aria-current={open?.id === m.id}
                    className={cn(
                      'block w-full px-4 py-3 text-left hover:bg-ink-50',
                      open?.id === m.id && 'bg-brand-50',
                    )}
                  >
                    <p className="truncate text-sm font-semibold text-ink-950">{m.subject}</p>
                    <p className="truncate text-xs text-ink-600">
                      To {m.to.join(', ')} · <DateTime value={m.receivedAt} />
                    </p>
                  </button>
                </li>
              ))}
            </ul>
          </Card>
          {open ? (
            <Card className="p-5">
              <h2 className="text-lg font-semibold text-ink-950">{open.subject}</h2>
              <p className="mt-1 text-sm text-ink-600">
                From {open.from} · to {open.to.join(', ')} · <DateTime value={open.receivedAt} />
              </p>
              {open.attachments.length ? (
                <ul className="mt-3 flex flex-wrap gap-2">
                  {open.attachments.map((a) => (
                    <li
                      key={a.filename}
                      className="inline-flex items-center gap-1 rounded-md bg-ink-100 px-2 py-1 text-xs text-ink-800"
                    >
                      <Paperclip className="size-3.5" aria-hidden /> {a.filename}
                    </li>
                  ))}
                </ul>
              ) : null}
              <pre className="mt-4 font-sans text-sm break-words whitespace-pre-wrap text-ink-900">
                {open.text}
              </pre>
            </Card>
          ) : null}
        </div>
      )}
    </>
  );
}
