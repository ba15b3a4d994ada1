import { ROLE_LABELS, type Role } from '../../../../shared/roles';

export function RoleCheckboxes({
  allowed,
  value,
  onChange,
  error,
}: {
  allowed: readonly Role[];
  value: Role[];
  onChange: (roles: Role[]) => void;
  error?: string;
}) {
  return (
    <fieldset aria-describedby={error ? 'roles-error' : undefined}>
      <legend className="text-sm font-medium text-ink-800">Roles</legend>
      <div className="mt-2 flex flex-wrap gap-2">
        {allowed.map((role) => {
          const checked = value.includes(role);
          return (
            <label
              key={role}
              className="flex h-11 cursor-pointer items-center gap-2 rounded-lg border border-ink-300 px-3 text-sm has-[:checked]:border-brand-600 has-[:checked]:bg-brand-50"
            >
              <input
                type="checkbox"
                className="size-4 accent-brand-700"
                checked={checked}
                onChange={() => onChange(checked ? value.filter((r) => r !== role) : [...value, role])}
              />
              {ROLE_LABELS[role]}
            </label>
          );
        })}
      </div>
      {error ? (
        <p id="roles-error" className="mt-1.5 text-sm font-medium text-bad-700">
          {error}
        </p>
      ) : null}
    </fieldset>
  );
}
