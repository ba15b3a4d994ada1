import { Check, CloudOff, CloudUpload } from 'lucide-react';
import type { ReactNode } from 'react';
import { Button } from '../../../../components/ui/button';
import { cn } from '../../../../lib/cn';
import type { SyncStatus } from '../../hooks/use-draft-sync';

const STATUS_TEXT: Record<SyncStatus, { text: string; icon: ReactNode; className: string }> = {
  saved: { text: 'Saved', icon: <Check className="size-4" aria-hidden />, className: 'text-ok-800' },
  saving: {
    text: 'Saving…',
    icon: <CloudUpload className="size-4" aria-hidden />,
    className: 'text-ink-700',
  },
  offline: {
    text: 'Offline — changes kept on this device',
    icon: <CloudOff className="size-4" aria-hidden />,
    className: 'text-warn-900',
  },
  conflict: {
    text: 'Changed elsewhere',
    icon: <CloudOff className="size-4" aria-hidden />,
    className: 'text-bad-800',
  },
  error: { text: 'Not saved', icon: <CloudOff className="size-4" aria-hidden />, className: 'text-bad-800' },
};

/**
 * The draft's state above the form, and what to do when it cannot be saved: the sticky bar (saved, saving,
 * offline…, with the live evaluation's summary on a phone), the notice of changes made elsewhere, the error.
 */
export function DraftStatus({
  status,
  error,
  siteName,
  summary,
  conflict,
  onKeepMine,
  onUseSaved,
}: {
  status: SyncStatus;
  error?: string | null;
  siteName: string;
  summary: ReactNode;
  conflict: boolean;
  onKeepMine: () => void;
  onUseSaved: () => void;
}) {
  const shown = STATUS_TEXT[status];
  return (
    <>
      <div className="sticky top-0 z-10 -mx-1 flex items-center justify-between gap-2 rounded-lg bg-white/95 px-2 py-2 shadow-sm backdrop-blur">
        <p
          role="status"
          aria-live="polite"
          className={cn('flex items-center gap-1.5 text-sm font-medium', shown.className)}
        >
          {shown.icon}
          {shown.text}
        </p>
        <p className="hidden truncate text-xs text-ink-600 sm:block">Draft · {siteName}</p>
        <a href="#live-evaluation" className="min-w-0 lg:hidden">
          {summary}
        </a>
      </div>
      {conflict ? (
        <div
          role="alert"
          className="space-y-2 rounded-lg border border-bad-300 bg-bad-50 p-3 text-sm text-bad-900"
        >
          <p>This draft was changed on another device or tab since these changes were made here.</p>
          <div className="flex flex-wrap gap-2">
            <Button size="md" onClick={onKeepMine}>
              Keep this device&apos;s changes
            </Button>
            <Button variant="secondary" size="md" onClick={onUseSaved}>
              Use the saved draft
            </Button>
          </div>
        </div>
      ) : null}
      {status === 'error' && error ? (
        <p role="alert" className="text-sm text-bad-700">
          {error}
        </p>
      ) : null}
    </>
  );
}
