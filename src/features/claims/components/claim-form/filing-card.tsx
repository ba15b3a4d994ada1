import { Send } from 'lucide-react';
import type { ClaimDetailDto, FilingIssue } from '../../../../../shared/schemas/claims';
import { Button } from '../../../../components/ui/button';
import { Card } from '../../../../components/ui/card';
import { ApiError } from '../../../../lib/api-client';

/** The foot of the form: what is still missing before filing, or the policy it files under, and the button. */
export function FilingCard({
  inst,
  missing,
  file,
}: {
  inst: ClaimDetailDto['installationDetail'];
  missing: FilingIssue[];
  file: { error: Error | null; isPending: boolean };
}) {
  return (
    <Card className="p-4 sm:p-5">
      {missing.length ? (
        <div className="mb-3 text-sm">
          <p className="font-medium text-ink-900">Before filing:</p>
          <ul className="mt-1 list-disc space-y-0.5 pl-5 text-ink-700">
            {missing.slice(0, 8).map((m) => (
              <li key={`${m.path}-${m.message}`}>{m.message}</li>
            ))}
          </ul>
        </div>
      ) : (
        <p className="mb-3 text-sm text-ink-700">
          Ready to file with{' '}
          {inst.policyVersion
            ? `${inst.policyVersion.policyName}, version ${inst.policyVersion.versionNumber}`
            : 'the manufacturer'}
          .
        </p>
      )}
      {file.error ? (
        <div role="alert" className="mb-3 text-sm font-medium text-bad-700">
          <p>{file.error.message}</p>
          {file.error instanceof ApiError && file.error.details.length ? (
            <ul className="list-disc pl-5">
              {file.error.details.map((d) => (
                <li key={`${d.path}-${d.message}`}>{d.message}</li>
              ))}
            </ul>
          ) : null}
        </div>
      ) : null}
      <Button
        type="submit"
        size="lg"
        className="w-full sm:w-auto"
        loading={file.isPending}
        disabled={missing.length > 0}
        icon={<Send className="size-5" aria-hidden />}
      >
        File claim
      </Button>
    </Card>
  );
}
