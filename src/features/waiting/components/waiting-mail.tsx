import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { WAITING_MAIL_MODES, type WaitingMailMode } from '../../../../shared/schemas/waiting';
import { Card } from '../../../components/ui/card';
import { SelectField } from '../../../components/ui/field';
import { useToast } from '../../../components/ui/toast';
import { setWaitingMail, waitingMailQueries } from '../api/waiting-queries';

const LABEL: Record<WaitingMailMode, string> = {
  immediate: 'At once, for each new item',
  daily: 'A daily summary',
  none: 'Never',
};

/** The person's choice of e-mail about what waits on them; saved as soon as it is picked. */
export function WaitingMailChoice() {
  const qc = useQueryClient();
  const { notify } = useToast();
  const { data } = useQuery(waitingMailQueries.mode());
  const save = useMutation({
    mutationFn: (mode: WaitingMailMode) => setWaitingMail(mode),
    onSuccess: async ({ mode }) => {
      notify(`E-mail: ${LABEL[mode].toLowerCase()}.`);
      await qc.invalidateQueries({ queryKey: ['waiting', 'email'] });
    },
  });
  return (
    <Card className="px-4 py-3 sm:px-5">
      <SelectField
        label="E-mail me about these"
        hint="Every message has a link to stop them, which works without signing in."
        value={data?.mode ?? ''}
        disabled={!data || save.isPending}
        onChange={(e) => save.mutate(e.target.value as WaitingMailMode)}
      >
        {data ? null : <option value="">Loading…</option>}
        {WAITING_MAIL_MODES.map((m) => (
          <option key={m} value={m}>
            {LABEL[m]}
          </option>
        ))}
      </SelectField>
    </Card>
  );
}
