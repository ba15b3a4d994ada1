import type { ReactNode } from 'react';
import { get, type FieldValues, type Path, type RegisterOptions, type UseFormReturn } from 'react-hook-form';
import { ApiError } from '../../lib/api-client';
import { cn } from '../../lib/cn';
import { InputField } from './field';

// The scaffolding every react-hook-form form shares: the form-wide error box, an input bound to a field by
// name (label, control and its message wired together), and the server's field errors put on the fields.

/** What the server said, or `fallback` when the request failed without an answer (offline, a crash). */
export function apiErrorText(error: unknown, fallback?: string): string | undefined {
  if (!error) return undefined;
  return error instanceof ApiError ? error.message : fallback;
}

/**
 * The form-wide message of a failed request: none when the server named the fields at fault (their messages
 * stand beside them), else as `apiErrorText`.
 */
export function formErrorText(error: unknown, fallback?: string): string | undefined {
  if (error instanceof ApiError && error.details.length) return undefined;
  return apiErrorText(error, fallback);
}

/** The form-wide error box at the top of a form; nothing when there is no message. */
export function FormError({
  message,
  className,
  children,
}: {
  message?: string | null;
  className?: string;
  /** More than words (a link onwards); shown after the message. */
  children?: ReactNode;
}) {
  if (!message) return null;
  const box = cn('rounded-lg bg-bad-50 px-3 py-2 text-sm text-bad-800', className);
  return children ? (
    <div role="alert" className={box}>
      <p>{message}</p>
      {children}
    </div>
  ) : (
    <p role="alert" className={box}>
      {message}
    </p>
  );
}

type TextFieldProps<T extends FieldValues> = Omit<
  React.ComponentProps<typeof InputField>,
  'name' | 'error' | 'form' | 'ref'
> & {
  form: UseFormReturn<T>;
  name: Path<T>;
  options?: RegisterOptions<T, Path<T>>;
};

/** An InputField registered on `form` as `name`, showing that field's message. */
export function TextField<T extends FieldValues>({ form, name, options, ...rest }: TextFieldProps<T>) {
  const error = get(form.formState.errors, name) as { message?: string } | undefined;
  return <InputField {...rest} error={error?.message} {...form.register(name, options)} />;
}

/**
 * Puts the server's field errors (`details`) on the form's fields, renamed where the form and the payload
 * differ, and focuses the first. Says whether any was shown; paths the form has no field for are left out.
 */
export function showFieldErrors<T extends FieldValues>(
  form: UseFormReturn<T>,
  error: unknown,
  rename: Record<string, Path<T>> = {},
): boolean {
  if (!(error instanceof ApiError) || !error.details.length) return false;
  let shown = false;
  for (const d of error.details) {
    const field = rename[d.path] ?? (d.path in form.getValues() ? (d.path as Path<T>) : undefined);
    if (!field) continue;
    form.setError(field, { message: d.message }, { shouldFocus: !shown });
    shown = true;
  }
  return shown;
}
