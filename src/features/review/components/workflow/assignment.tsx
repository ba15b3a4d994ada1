import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState, type FormEvent } from 'react';
import type { ClaimWorkflowDto } from '../../../../../shared/claims/workflow';
import { Button } from '../../../../components/ui/button';
import { SelectField } from '../../../../components/ui/field';
import { ApiError } from '../../../../lib/api-client';
import { assignClaim } from '../../api/perform-claim-action';
import { reviewQueries } from '../../api/review-queries';
import { ErrorText } from './error-text';

/**
 * Who on the manufacturer's team has the claim: take it, give it back to the queue, or hand it to a colleague
 * (not a stage move). Every change carries the version on screen; a 409 says someone changed the claim first.
 */
export function Assignment({ wf, meId }: { wf: ClaimWorkflowDto; meId: string }) {
  const qc = useQueryClient();
  const [error, setError] = useState<ApiError | null>(null);
  const [handing, setHanding] = useState(false);
  const [colleague, setColleague] = useState('');
  const [pickError, setPickError] = useState<string | undefined>();
  const reviewers = useQuery({ ...reviewQueries.reviewers(), enabled: handing });
  const reload = () => {
    setError(null);
    return qc.invalidateQueries({ queryKey: ['claims'] });
  };
  const m = useMutation({
    mutationFn: (assigneeId: string | null) => assignClaim(wf.claim.id, assigneeId, wf.claim.version),
    onSuccess: () => {
      setHanding(false);
      setColleague('');
      return reload();
    },
    onError: (e) => setError(e instanceof ApiError ? e : new ApiError(0, 'unknown', 'Something went wrong.')),
  });
  if (['draft', 'closed', 'withdrawn'].includes(wf.claim.stage)) return null;
  const who = wf.claim.assignee;
  const others = (reviewers.data?.items ?? []).filter((r) => r.id !== meId && r.id !== who?.id);

  function hand(e: FormEvent) {
    e.preventDefault();
    if (!colleague) return setPickError('Choose a colleague to hand the claim to.');
    setPickError(undefined);
    m.mutate(colleague);
  }

  return (
    <div className="space-y-2" role="group" aria-label="Assignment">
      <p className="text-sm text-ink-700">
        {who
          ? who.id === meId
            ? 'Assigned to you'
            : `Assigned to ${who.name}`
          : 'Not assigned to anyone yet'}
      </p>
      <div className="flex flex-wrap gap-2">
        {who?.id !== meId ? (
          <Button variant="secondary" loading={m.isPending} onClick={() => m.mutate(meId)}>
            Assign to me
          </Button>
        ) : null}
        {who ? (
          <Button variant="secondary" loading={m.isPending} onClick={() => m.mutate(null)}>
            Give back to the queue
          </Button>
        ) : null}
        {!handing ? (
          <Button variant="secondary" onClick={() => setHanding(true)}>
            Hand to a colleague
          </Button>
        ) : null}
      </div>
      {handing ? (
        <form className="space-y-2" aria-label="Hand to a colleague" onSubmit={hand}>
          <SelectField
            label="Colleague"
            value={colleague}
            error={pickError}
            hint={
              reviewers.isPending
                ? 'Loading your team’s reviewers…'
                : reviewers.isError
                  ? 'The list of reviewers could not be loaded. Try again in a moment.'
                  : others.length === 0
                    ? 'No other active reviewer on your team.'
                    : 'Active reviewers of your team. They get an e-mail saying the claim is theirs.'
            }
            onChange={(e) => setColleague(e.target.value)}
          >
            <option value="">Choose a reviewer</option>
            {others.map((r) => (
              <option key={r.id} value={r.id}>
                {r.name}
              </option>
            ))}
          </SelectField>
          <div className="flex flex-wrap gap-2">
            <Button type="submit" loading={m.isPending} disabled={others.length === 0}>
              Hand over
            </Button>
            <Button
              variant="ghost"
              onClick={() => {
                setHanding(false);
                setColleague('');
                setPickError(undefined);
              }}
            >
              Cancel
            </Button>
          </div>
        </form>
      ) : null}
      <ErrorText error={error} />
      {error?.status === 409 ? (
        <Button variant="secondary" onClick={reload}>
          Reload the claim
        </Button>
      ) : null}
    </div>
  );
}
