import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import {
  BENCH_RESULT_LABELS,
  BENCH_RESULTS,
  recordBenchTestSchema,
} from '../../../../../shared/claims/actions.schema';
import { Button } from '../../../../components/ui/button';
import { InputField, SelectField } from '../../../../components/ui/field';
import { blankToUndefined, numberOrUndefined } from './form-values';
import { NoteField } from './note-field';
import { useToday } from '../../../../lib/dates';

// The bench and receipt forms: react-hook-form with the move's own schema (the one the server checks), so a
// reviewer can record every result and condition the schema allows, and sees each field's problem beside it.

const BENCH_READINGS = [
  { key: 'supplyVolts', label: 'Supply', unit: 'V' },
  { key: 'inputWatts', label: 'Input power', unit: 'W' },
  { key: 'powerFactor', label: 'Power factor', unit: undefined },
  { key: 'driverOutputVolts', label: 'Driver output voltage', unit: 'V' },
  { key: 'driverOutputAmps', label: 'Driver output current', unit: 'A' },
  { key: 'lightOutputPercent', label: 'Light output', unit: '% of initial' },
] as const;

type BenchFormInput = z.input<typeof recordBenchTestSchema>;
type BenchPayload = z.output<typeof recordBenchTestSchema>;

export function BenchTestForm({
  pending,
  onSubmit,
}: {
  pending: boolean;
  onSubmit: (payload: BenchPayload) => void;
}) {
  const today = useToday();
  const form = useForm<BenchFormInput, unknown, BenchPayload>({
    resolver: zodResolver(recordBenchTestSchema),
    defaultValues: {
      testedOn: today,
      result: 'failure_confirmed',
      readings: {},
      next: 'decide',
    },
  });
  const errors = form.formState.errors;
  const readingErrors = (errors.readings ?? {}) as Record<string, { message?: string } | undefined>;
  return (
    <form
      noValidate
      className="space-y-3"
      aria-label="Record bench test"
      onSubmit={form.handleSubmit(onSubmit)}
    >
      <InputField
        label="Tested on"
        type="date"
        error={errors.testedOn?.message}
        {...form.register('testedOn')}
      />
      <fieldset className="space-y-1">
        <legend className="text-sm font-medium">What the bench found</legend>
        {BENCH_RESULTS.map((r) => (
          <label key={r} className="flex min-h-11 items-center gap-2 text-sm">
            <input type="radio" value={r} {...form.register('result')} />
            {BENCH_RESULT_LABELS[r]}
          </label>
        ))}
        {errors.result?.message ? <p className="text-sm text-bad-700">{errors.result.message}</p> : null}
      </fieldset>
      <div className="grid gap-3 sm:grid-cols-2">
        {BENCH_READINGS.map((r) => (
          <InputField
            key={r.key}
            label={r.label}
            unit={r.unit}
            inputMode="decimal"
            error={readingErrors[r.key]?.message}
            {...form.register(`readings.${r.key}`, { setValueAs: numberOrUndefined })}
          />
        ))}
      </div>
      {errors.readings?.message ? (
        <p role="alert" className="text-sm text-bad-700">
          {errors.readings.message}
        </p>
      ) : null}
      <SelectField label="Then" error={errors.next?.message} {...form.register('next')}>
        <option value="decide">Keep the claim here, ready for a decision</option>
        <option value="review">Send the claim back to review</option>
      </SelectField>
      <NoteField
        label="Bench notes (optional)"
        error={errors.note?.message}
        {...form.register('note', { setValueAs: blankToUndefined })}
      />
      <p className="text-xs text-ink-600">
        The engine judges the claim again on these readings; the decision options follow what the bench found.
      </p>
      <Button type="submit" loading={pending}>
        Record bench test
      </Button>
    </form>
  );
}
