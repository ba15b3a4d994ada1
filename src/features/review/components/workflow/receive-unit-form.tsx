import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import {
  RECEIPT_CONDITION_LABELS,
  RECEIPT_CONDITIONS,
  receiveUnitSchema,
} from '../../../../../shared/claims/actions.schema';
import { Button } from '../../../../components/ui/button';
import { InputField } from '../../../../components/ui/field';
import { blankToUndefined } from './form-values';
import { NoteField } from './note-field';
import { useToday } from '../../../../lib/dates';

// The bench and receipt forms: react-hook-form with the move's own schema (the one the server checks), so a
// reviewer can record every result and condition the schema allows, and sees each field's problem beside it.

type ReceiptFormInput = z.input<typeof receiveUnitSchema>;
type ReceiptPayload = z.output<typeof receiveUnitSchema>;

export function ReceiveUnitForm({
  pending,
  onSubmit,
}: {
  pending: boolean;
  onSubmit: (payload: ReceiptPayload) => void;
}) {
  const today = useToday();
  const form = useForm<ReceiptFormInput, unknown, ReceiptPayload>({
    resolver: zodResolver(receiveUnitSchema),
    defaultValues: { receivedOn: today, condition: 'as_described' },
  });
  const errors = form.formState.errors;
  return (
    <form
      noValidate
      className="space-y-3"
      aria-label="Mark unit received"
      onSubmit={form.handleSubmit(onSubmit)}
    >
      <InputField
        label="Received on"
        type="date"
        error={errors.receivedOn?.message}
        {...form.register('receivedOn')}
      />
      <fieldset className="space-y-1">
        <legend className="text-sm font-medium">Condition on arrival</legend>
        {RECEIPT_CONDITIONS.map((c) => (
          <label key={c} className="flex min-h-11 items-center gap-2 text-sm">
            <input type="radio" value={c} {...form.register('condition')} />
            {RECEIPT_CONDITION_LABELS[c]}
          </label>
        ))}
      </fieldset>
      <NoteField
        label="Notes on arrival (optional)"
        error={errors.note?.message}
        {...form.register('note', { setValueAs: blankToUndefined })}
      />
      <Button type="submit" loading={pending}>
        Mark unit received
      </Button>
    </form>
  );
}
