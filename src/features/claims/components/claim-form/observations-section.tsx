import type { UseFormRegister } from 'react-hook-form';
import { OBSERVATION_LABELS, OBSERVATIONS } from '../../../../../shared/schemas/claims';
import type { FieldError } from '../../hooks/use-claim-form';
import type { ClaimFormValues } from '../claim-form-values';
import { Section } from './section';

/** Section 3: what the installer found at the fixture, ticked and in their own words. */
export function ObservationsSection({
  register,
  err,
}: {
  register: UseFormRegister<ClaimFormValues>;
  err: FieldError;
}) {
  return (
    <Section n={3} title="What you saw">
      <fieldset>
        <legend className="mb-2 text-sm font-medium text-ink-800">Tick what you found at the fixture</legend>
        <div className="grid grid-cols-1 gap-2 sm:grid-cols-2">
          {OBSERVATIONS.map((k) => (
            <label
              key={k}
              className="flex min-h-11 items-center gap-3 rounded-lg border border-ink-200 px-3 text-sm"
            >
              <input type="checkbox" className="size-5" {...register(`observations.${k}`)} />
              {OBSERVATION_LABELS[k]}
            </label>
          ))}
        </div>
      </fieldset>
      <div className="space-y-1.5">
        <label htmlFor="claim-narrative" className="block text-sm font-medium text-ink-800">
          What happened
        </label>
        <textarea
          id="claim-narrative"
          rows={4}
          aria-invalid={err('narrative') ? true : undefined}
          className="block w-full rounded-lg border border-ink-300 px-3 py-2 text-base sm:text-sm"
          placeholder="When it started, what it does now, what you checked."
          {...register('narrative')}
        />
        {err('narrative') ? <p className="text-sm font-medium text-bad-700">{err('narrative')}</p> : null}
      </div>
    </Section>
  );
}
