import { forwardRef, type TextareaHTMLAttributes } from 'react';

export const NoteField = forwardRef<
  HTMLTextAreaElement,
  { label: string; error?: string } & TextareaHTMLAttributes<HTMLTextAreaElement>
>(function NoteField({ label, error, ...rest }, ref) {
  const id = `note-${label.replace(/\W+/g, '-').toLowerCase()}`;
  return (
    <div className="space-y-1.5">
      <label htmlFor={id} className="block text-sm font-medium text-ink-800">
        {label}
      </label>
      <textarea
        id={id}
        ref={ref}
        rows={3}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : undefined}
        className="block w-full rounded-lg border border-ink-300 px-3 py-2 text-base focus:border-brand-600 focus:outline-none focus:ring-2 focus:ring-brand-600/30 sm:text-sm"
        {...rest}
      />
      {error ? (
        <p id={`${id}-error`} className="text-sm text-bad-700">
          {error}
        </p>
      ) : null}
    </div>
  );
});
