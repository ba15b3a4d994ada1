import { useState } from 'react';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreditMemoDto, VoidCreditInput } from '../../../../shared/schemas/credits';
import { voidCreditSchema } from '../../../../shared/schemas/credits';
import { Button } from '../../../components/ui/button';
import { Dialog } from '../../../components/ui/dialog';
import { FieldShell } from '../../../components/ui/field';
import { apiErrorText } from '../../../components/ui/form';
import { useToast } from '../../../components/ui/toast';
import { invalidateAfterCredit } from '../api/credit-queries';
import { voidCredit } from '../api/void-credit';

/** Voiding never edits the memo: it issues a reversal memo with the reason, and the claim returns to approved. */
export function VoidCreditDialog({ memo, onClose }: { memo: CreditMemoDto | null; onClose: () => void }) {
  const qc = useQueryClient();
  const { notify } = useToast();
  const [reason, setReason] = useState('');
  const [invalid, setInvalid] = useState<string>();
  const mutation = useMutation({
    mutationFn: ({ memo, input }: { memo: CreditMemoDto; input: VoidCreditInput }) =>
      voidCredit(memo.id, input),
    onSuccess: async (r, { memo }) => {
      notify(`Memo ${memo.number} voided by reversal ${r.creditMemo.number}.`);
      setReason('');
      setInvalid(undefined);
      onClose();
      await invalidateAfterCredit(qc);
    },
  });
  const error = invalid ?? apiErrorText(mutation.error, 'The memo could not be voided. Try again.');

  function submit() {
    if (!memo) return;
    const parsed = voidCreditSchema.safeParse({ reason });
    if (!parsed.success) return setInvalid(parsed.error.issues[0].message);
    setInvalid(undefined);
    mutation.mutate({ memo, input: parsed.data });
  }

  return (
    <Dialog
      open={memo !== null}
      onClose={onClose}
      title={memo ? `Void credit memo ${memo.number}` : 'Void credit memo'}
      description="A reversal memo takes the full amount back off the contractor's account and the claim returns to approved. The original memo stays on record."
      footer={
        <>
          <Button variant="secondary" onClick={onClose}>
            Keep the memo
          </Button>
          <Button variant="danger" onClick={submit} loading={mutation.isPending}>
            Void with reversal
          </Button>
        </>
      }
    >
      <FieldShell
        label="Reason for the reversal"
        error={error}
        hint="The contractor reads this on the reversal memo."
      >
        {({ id, describedBy }) => (
          <textarea
            id={id}
            aria-describedby={describedBy}
            rows={3}
            value={reason}
            onChange={(e) => setReason(e.target.value)}
            className="block w-full rounded-lg border border-ink-300 px-3 py-2 text-base sm:text-sm"
          />
        )}
      </FieldShell>
    </Dialog>
  );
}
