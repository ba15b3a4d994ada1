import {
  useId,
  type InputHTMLAttributes,
  type ReactNode,
  type SelectHTMLAttributes,
  forwardRef,
} from 'react';
import { cn } from '../../lib/cn';

const control =
  'block w-full rounded-lg border bg-white px-3 text-base text-ink-900 placeholder:text-ink-400 focus:border-brand-600 focus:outline-none focus:ring-2 focus:ring-brand-600/30 disabled:bg-ink-100 sm:text-sm';

type FieldShellProps = {
  label: string;
  hint?: ReactNode;
  error?: string;
  unit?: string;
  children: (ids: { id: string; describedBy?: string }) => ReactNode;
  className?: string;
  /** For screen readers only, where the placeholder and the place say enough to the eye. */
  hideLabel?: boolean;
};

/** Label, control, unit, hint and error, wired together for screen readers. */
export function FieldShell({
  label,
  hint,
  error,
  unit,
  children,
  className,
  hideLabel = false,
}: FieldShellProps) {
  const id = useId();
  const hintId = hint ? `${id}-hint` : undefined;
  const errorId = error ? `${id}-error` : undefined;
  const describedBy = [hintId, errorId].filter(Boolean).join(' ') || undefined;
  return (
    <div className={cn(!hideLabel && 'space-y-1.5', className)}>
      <label htmlFor={id} className={hideLabel ? 'sr-only' : 'block text-sm font-medium text-ink-800'}>
        {label}
        {unit ? <span className="ml-1 font-normal text-ink-600">({unit})</span> : null}
      </label>
      {children({ id, describedBy })}
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

type InputFieldProps = InputHTMLAttributes<HTMLInputElement> & {
  label: string;
  hint?: ReactNode;
  error?: string;
  unit?: string;
  hideLabel?: boolean;
};

export const InputField = forwardRef<HTMLInputElement, InputFieldProps>(function InputField(
  { label, hint, error, unit, className, hideLabel, ...rest },
  ref,
) {
  return (
    <FieldShell
      label={label}
      hint={hint}
      error={error}
      unit={unit}
      className={className}
      hideLabel={hideLabel}
    >
      {({ id, describedBy }) => (
        <input
          ref={ref}
          id={id}
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy}
          className={cn(control, 'h-11', error ? 'border-bad-600' : 'border-ink-300')}
          {...rest}
        />
      )}
    </FieldShell>
  );
});

type SelectFieldProps = SelectHTMLAttributes<HTMLSelectElement> & {
  label: string;
  hint?: ReactNode;
  error?: string;
};

export const SelectField = forwardRef<HTMLSelectElement, SelectFieldProps>(function SelectField(
  { label, hint, error, className, children, ...rest },
  ref,
) {
  return (
    <FieldShell label={label} hint={hint} error={error} className={className}>
      {({ id, describedBy }) => (
        <select
          ref={ref}
          id={id}
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy}
          className={cn(control, 'h-11 pr-8', error ? 'border-bad-600' : 'border-ink-300')}
          {...rest}
        >
          {children}
        </select>
      )}
    </FieldShell>
  );
});

/** The <option>s of a select: one per value, worded by `labelOf`. */
export function optionsOf<V extends string | number>(values: readonly V[], labelOf: (v: V) => string) {
  return values.map((v) => (
    <option key={v} value={v}>
      {labelOf(v)}
    </option>
  ));
}
