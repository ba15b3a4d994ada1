import { useId } from 'react';

/** A group of checkboxes with a legend: the roles a token acts as, the events an endpoint hears. */
export function RoleChoice<V extends string>({
  legend,
  options,
  value,
  onChange,
  error,
}: {
  legend: string;
  options: { value: V; label: string }[];
  value: V[];
  onChange: (v: V[]) => void;
  error?: string;
}) {
  const errorId = useId();
  return (
    <fieldset aria-describedby={error ? errorId : undefined}>
      <legend className="text-sm font-medium text-ink-800">{legend}</legend>
      <div className="mt-2 flex flex-wrap gap-2">
        {options.map((o) => {
          const checked = value.includes(o.value);
          return (
            <label
              key={o.value}
              className="flex h-11 cursor-pointer items-center gap-2 rounded-lg border border-ink-300 px-3 text-sm has-[:checked]:border-brand-600 has-[:checked]:bg-brand-50"
            >
              <input
                type="checkbox"
                className="size-4 accent-brand-700"
                checked={checked}
                onChange={() => onChange(checked ? value.filter((v) => v !== o.value) : [...value, o.value])}
              />
              {o.label}
            </label>
          );
        })}
      </div>
      {error ? (
        <p id={errorId} className="mt-1.5 text-sm font-medium text-bad-700">
          {error}
        </p>
      ) : null}
    </fieldset>
  );
}
