import { useId, type InputHTMLAttributes } from 'react';
import type { AmpUnit } from '../../../../shared/claims/meter-number';
import { cn } from '../../../lib/cn';

type Props = InputHTMLAttributes<HTMLInputElement> & {
  label: string;
  unit: string;
  error?: string;
  hint?: string;
  /** When given, the unit is a choice (A or mA) the user makes to match the meter. */
  ampUnit?: { value: AmpUnit; onChange: (u: AmpUnit) => void };
};

/** A reading: big touch target, decimal keypad, its unit beside it, and the meter's own decimal comma accepted. */
export function MeterField({ label, unit, error, hint, ampUnit, className, ...rest }: Props) {
  const id = useId();
  const errorId = `${id}-error`;
  const hintId = `${id}-hint`;
  return (
    <div className={cn('min-w-0 space-y-1', className)}>
      <label htmlFor={id} className="block text-sm font-medium text-ink-800">
        {label} <span className="font-normal text-ink-500">({ampUnit ? ampUnit.value : unit})</span>
      </label>
      <div className="flex gap-2">
        <input
          id={id}
          type="text"
          inputMode="decimal"
          autoComplete="off"
          enterKeyHint="next"
          aria-invalid={error ? true : undefined}
          aria-describedby={[error ? errorId : '', hint ? hintId : ''].filter(Boolean).join(' ') || undefined}
          className={cn(
            'h-11 w-full min-w-0 rounded-lg border bg-white px-3 text-base tabular-nums text-ink-900 focus:border-brand-600 focus:ring-2 focus:ring-brand-600/30 focus:outline-none sm:text-sm',
            error ? 'border-bad-600' : 'border-ink-300',
          )}
          {...rest}
        />
        {ampUnit ? (
          <div
            role="group"
            aria-label={`Unit for ${label.toLowerCase()}`}
            className="flex shrink-0 overflow-hidden rounded-lg border border-ink-300"
          >
            {(['A', 'mA'] as const).map((u) => (
              <button
                key={u}
                type="button"
                aria-pressed={ampUnit.value === u}
                onClick={() => ampUnit.onChange(u)}
                className={cn(
                  'h-11 min-w-11 px-2 text-sm font-semibold',
                  ampUnit.value === u ? 'bg-brand-700 text-white' : 'bg-white text-ink-700',
                )}
              >
                {u}
              </button>
            ))}
          </div>
        ) : null}
      </div>
      {hint ? (
        <p id={hintId} className="text-xs text-ink-600">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={errorId} className="text-sm font-medium text-bad-700">
          {error}
        </p>
      ) : null}
    </div>
  );
}
