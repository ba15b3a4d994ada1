import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Monitor } from 'lucide-react';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { Spinner } from '../../../components/ui/spinner';
import { useToast } from '../../../components/ui/toast';
import { ApiError } from '../../../lib/api-client';
import { endOtherSessions, endSession, securityQueries } from '../api/security-api';

const when = (iso: string | null) =>
  iso ? new Date(iso).toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'short' }) : 'unknown';

/** Where the person is signed in: each browser with its address and times; end one, or all but this one. */
export function SessionsCard() {
  const qc = useQueryClient();
  const { notify } = useToast();
  const sessions = useQuery(securityQueries.sessions());
  const onError = (e: unknown) => notify(e instanceof ApiError ? e.message : 'Could not sign it out.', 'bad');
  const refresh = () => qc.invalidateQueries({ queryKey: securityQueries.sessions().queryKey });
  const one = useMutation({
    mutationFn: endSession,
    onSuccess: async () => {
      notify('That session is signed out.');
      await refresh();
    },
    onError,
  });
  const others = useMutation({
    mutationFn: endOtherSessions,
    onSuccess: async ({ ended }) => {
      notify(ended === 1 ? 'Signed out 1 other session.' : `Signed out ${ended} other sessions.`);
      await refresh();
    },
    onError,
  });
  const items = sessions.data?.items ?? [];
  return (
    <Card>
      <CardHeader
        title="Where you are signed in"
        description="Sessions end after 30 minutes without use and 8 hours after signing in."
        actions={
          items.length > 1 ? (
            <Button variant="secondary" onClick={() => others.mutate()} loading={others.isPending}>
              Sign out everywhere else
            </Button>
          ) : null
        }
      />
      {sessions.isPending ? (
        <div className="p-6">
          <Spinner label="Loading your sessions" />
        </div>
      ) : !sessions.data ? (
        <p role="alert" className="p-5 text-sm text-bad-800">
          Could not load your sessions.
        </p>
      ) : (
        <ul aria-label="Sessions" className="divide-y divide-ink-100">
          {items.map((s) => (
            <li key={s.id} className="flex flex-wrap items-center justify-between gap-3 px-4 py-3 sm:px-5">
              <div className="flex min-w-0 items-start gap-3">
                <Monitor className="mt-0.5 size-5 shrink-0 text-ink-500" aria-hidden />
                <div className="min-w-0">
                  <p className="font-medium text-ink-950">
                    {s.device}{' '}
                    {s.current ? (
                      <Badge tone="brand" className="ml-1">
                        This device
                      </Badge>
                    ) : null}
                  </p>
                  <p className="text-xs text-ink-600">
                    {s.ip ?? 'Unknown address'} · signed in {when(s.signedInAt)} · last seen{' '}
                    {when(s.lastSeenAt)}
                  </p>
                </div>
              </div>
              {s.current ? null : (
                <Button
                  variant="ghost"
                  size="md"
                  onClick={() => one.mutate(s.id)}
                  aria-label={`Sign out ${s.device}, last seen ${when(s.lastSeenAt)}`}
                >
                  Sign out
                </Button>
              )}
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
