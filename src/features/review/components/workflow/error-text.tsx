import { type ApiError } from '../../../../lib/api-client';

export function ErrorText({ error }: { error: ApiError | null }) {
  if (!error) return null;
  return (
    <div role="alert" className="rounded-lg border border-bad-300 bg-bad-50 p-3 text-sm text-bad-900">
      <p className="font-medium">{error.message}</p>
      {error.details.map((d) => (
        <p key={d.path}>{d.message}</p>
      ))}
    </div>
  );
}
