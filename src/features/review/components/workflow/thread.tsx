import type { ClaimWorkflowDto } from '../../../../../shared/claims/workflow';
import { Card, CardHeader } from '../../../../components/ui/card';
import { CalendarDate, DateTime } from '../../../../components/ui/date-time';

export function Thread({ wf }: { wf: ClaimWorkflowDto }) {
  if (!wf.messages.length) return null;
  return (
    <Card>
      <CardHeader title="Questions and answers" />
      <ol className="space-y-3 px-4 py-4 sm:px-5">
        {wf.messages.map((m) => (
          <li
            key={m.id}
            className={
              m.author.side === 'manufacturer' ? 'rounded-lg bg-ink-50 p-3' : 'rounded-lg bg-brand-50 p-3'
            }
          >
            <p className="text-xs text-ink-600">
              {m.kind === 'info_request' ? 'Asked' : 'Answered'} by {m.author.name} ({m.author.organization})
              on <DateTime value={m.createdAt} />
              {m.dueOn ? (
                <>
                  {' '}
                  · answer due <CalendarDate value={m.dueOn} />
                </>
              ) : null}
            </p>
            <p className="whitespace-pre-wrap text-sm text-ink-900">{m.body}</p>
            {m.attachments.length ? (
              <ul className="mt-2 flex flex-wrap gap-2">
                {m.attachments.map((a) => (
                  <li key={a.id}>
                    {a.kind === 'photo' ? (
                      <a href={a.url} download={a.name}>
                        <img
                          src={a.thumbnailUrl ?? a.url}
                          alt={`Photo sent with the answer: ${a.name}`}
                          className="h-24 rounded border border-ink-200 object-cover"
                        />
                      </a>
                    ) : (
                      <a className="text-brand-700 underline" href={a.url}>
                        {a.name}
                      </a>
                    )}
                  </li>
                ))}
              </ul>
            ) : null}
          </li>
        ))}
      </ol>
    </Card>
  );
}
