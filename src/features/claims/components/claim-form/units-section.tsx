import { useState } from 'react';
import type { UseFormRegister, UseFormSetValue } from 'react-hook-form';
import { SYMPTOM_LABELS, SYMPTOMS, type ClaimDetailDto } from '../../../../../shared/schemas/claims';
import { InputField } from '../../../../components/ui/field';
import { todayIn } from '../../../../../shared/dates';
import type { FieldError } from '../../hooks/use-claim-form';
import type { ClaimFormValues } from '../claim-form-values';
import { Section } from './section';

/** Section 1: which units failed (picked from the installation's serials, or typed), when, and how. */
export function UnitsSection({
  inst,
  selectedSerials,
  register,
  setValue,
  err,
}: {
  inst: ClaimDetailDto['installationDetail'];
  selectedSerials: string[];
  register: UseFormRegister<ClaimFormValues>;
  setValue: UseFormSetValue<ClaimFormValues>;
  err: FieldError;
}) {
  const [serialFilter, setSerialFilter] = useState('');
  const serialsShown = inst.serials
    .filter((s) => !serialFilter || s.toLowerCase().includes(serialFilter.toLowerCase()))
    .slice(0, 60);
  return (
    <Section n={1} title="The failed units">
      {inst.serials.length ? (
        <fieldset className="space-y-2">
          <legend className="text-sm font-medium text-ink-800">Serial numbers of the failed units</legend>
          {inst.serials.length > 8 ? (
            <InputField
              label="Find a serial"
              value={serialFilter}
              onChange={(e) => setSerialFilter(e.target.value)}
            />
          ) : null}
          <div className="grid grid-cols-1 gap-2 sm:grid-cols-2">
            {serialsShown.map((s) => (
              <label
                key={s}
                className="flex min-h-11 items-center gap-3 rounded-lg border border-ink-200 px-3"
              >
                <input type="checkbox" value={s} className="size-5" {...register('serials')} />
                <span className="font-mono text-sm">{s}</span>
              </label>
            ))}
          </div>
          {err('serials') ? <p className="text-sm font-medium text-bad-700">{err('serials')}</p> : null}
        </fieldset>
      ) : (
        <InputField
          label="Serial numbers or date codes"
          hint="Separate several with commas."
          defaultValue={selectedSerials.join(', ')}
          onChange={(e) =>
            setValue('serials', e.target.value.split(/[,;\s]+/).filter(Boolean), { shouldDirty: true })
          }
          error={err('serials')}
        />
      )}
      <div className="grid gap-4 sm:grid-cols-2">
        <InputField
          label="Units failed"
          inputMode="numeric"
          placeholder={selectedSerials.length ? String(selectedSerials.length) : '1'}
          hint={`Of ${inst.quantity} installed.`}
          error={err('units')}
          {...register('units')}
        />
        <InputField
          label="Failure date"
          type="date"
          max={todayIn()}
          error={err('failedOn')}
          {...register('failedOn')}
        />
      </div>
      <fieldset>
        <legend className="mb-2 text-sm font-medium text-ink-800">What the fixture does</legend>
        <div className="grid grid-cols-1 gap-2 sm:grid-cols-2">
          {SYMPTOMS.map((s) => (
            <label
              key={s}
              className="flex min-h-11 items-center gap-3 rounded-lg border border-ink-200 px-3 text-sm"
            >
              <input type="checkbox" value={s} className="size-5" {...register('symptoms')} />
              {SYMPTOM_LABELS[s]}
            </label>
          ))}
        </div>
        {err('symptoms') ? <p className="mt-1 text-sm font-medium text-bad-700">{err('symptoms')}</p> : null}
      </fieldset>
    </Section>
  );
}
