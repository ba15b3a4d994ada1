import { AlertTriangle, CheckCircle2 } from 'lucide-react';
import type { FitWarning } from '../../../../shared/schemas/catalogue';

/** The install conditions against the ratings, in plain words. Advisory: saving stays allowed. */
export function FitWarnings({ warnings, live }: { warnings: FitWarning[]; live?: boolean }) {
  if (!warnings.length) {
    return (
      <p
        role={live ? 'status' : undefined}
        className="flex items-start gap-2 rounded-lg bg-ok-50 px-3 py-2 text-sm text-ok-800"
      >
        <CheckCircle2 className="mt-0.5 size-4 shrink-0" aria-hidden /> These conditions fit the product's
        ratings.
      </p>
    );
  }
  return (
    <div
      role={live ? 'status' : undefined}
      className="rounded-lg border border-warn-200 bg-warn-50 px-3 py-2 text-sm text-warn-800"
    >
      <p className="flex items-center gap-2 font-semibold">
        <AlertTriangle className="size-4 shrink-0" aria-hidden />{' '}
        {warnings.length === 1 ? 'One condition does not fit' : `${warnings.length} conditions do not fit`}{' '}
        the product's ratings
      </p>
      <ul className="mt-1 list-disc space-y-1 pl-5">
        {warnings.map((w) => (
          <li key={w.code}>
            {w.message}
            {w.reference ? <span className="block text-xs text-warn-700">Source: {w.reference}</span> : null}
          </li>
        ))}
      </ul>
      {live ? (
        <p className="mt-1 text-xs">
          You can still save: the record is what was installed. A claim on these units may be refused for
          misapplication.
        </p>
      ) : null}
    </div>
  );
}
