import { Camera, FileText, ImagePlus, RotateCcw, Trash2, X } from 'lucide-react';
import { useMutation } from '@tanstack/react-query';
import { useCallback, useId, useRef, useState, type DragEvent } from 'react';
import {
  ACCEPTED_ATTACHMENT_TYPES,
  ATTACHMENT_PURPOSE_LABELS,
  ATTACHMENT_PURPOSES,
  MAX_ATTACHMENT_MB,
  MAX_ATTACHMENTS_PER_OWNER,
  type AttachmentDto,
  type AttachmentPurpose,
} from '../../../../shared/schemas/attachments';
import { Button } from '../../../components/ui/button';
import { cn } from '../../../lib/cn';
import { removeClaimFile, uploadClaimFile } from '../api/attachments';

type Upload = {
  key: string;
  file: File;
  purpose: AttachmentPurpose;
  progress: number;
  state: 'uploading' | 'failed';
  error?: string;
};

const sizeText = (b: number) =>
  b >= 1024 * 1024 ? `${(b / 1024 / 1024).toFixed(1)} MB` : `${Math.max(1, Math.round(b / 1024))} KB`;

/**
 * The claim's photos and documents. On a phone the camera opens straight from the form; on a desk files can be
 * dropped in. Each upload shows its own progress bar, a failed one can be retried, and before filing a file can
 * be removed.
 */
export function AttachmentsPanel({
  claimId,
  attachments,
  editable,
  removable,
  onChange,
}: {
  claimId: string;
  attachments: AttachmentDto[];
  editable: boolean;
  removable: boolean;
  onChange: (next: AttachmentDto[]) => void;
}) {
  const [uploads, setUploads] = useState<Upload[]>([]);
  const [purpose, setPurpose] = useState<AttachmentPurpose>('failure');
  const [dragging, setDragging] = useState(false);
  const [message, setMessage] = useState<string | null>(null);
  const purposeId = useId();
  const latest = useRef(attachments);
  latest.current = attachments;

  // Each file is its own mutation call (TanStack runs them side by side); the options' callbacks run for every one.
  const upload = useMutation({
    mutationFn: (u: Upload) =>
      uploadClaimFile(claimId, u.file, u.purpose, (p) =>
        setUploads((list) => list.map((x) => (x.key === u.key ? { ...x, progress: p } : x))),
      ),
    onSuccess: (a, u) => {
      setUploads((list) => list.filter((x) => x.key !== u.key));
      latest.current = [...latest.current, a];
      onChange(latest.current);
    },
    onError: (err, u) =>
      setUploads((list) =>
        list.map((x) => (x.key === u.key ? { ...x, state: 'failed', error: err.message } : x)),
      ),
  });
  const { mutate: send } = upload;

  const start = useCallback(
    (u: Upload) => {
      setUploads((list) => [
        ...list.filter((x) => x.key !== u.key),
        { ...u, state: 'uploading', progress: 0, error: undefined },
      ]);
      send(u);
    },
    [send],
  );

  const add = (files: FileList | File[] | null) => {
    setMessage(null);
    const list = [...(files ?? [])];
    const room = MAX_ATTACHMENTS_PER_OWNER - attachments.length - uploads.length;
    if (list.length > room)
      setMessage(
        `A claim takes at most ${MAX_ATTACHMENTS_PER_OWNER} files; ${room <= 0 ? 'remove one first' : `only ${room} more can be added`}.`,
      );
    for (const file of list.slice(0, Math.max(0, room))) {
      if (file.size > MAX_ATTACHMENT_MB * 1024 * 1024) {
        setMessage(`${file.name} is ${sizeText(file.size)}; a file can be at most ${MAX_ATTACHMENT_MB} MB.`);
        continue;
      }
      const p: AttachmentPurpose =
        file.type === 'application/pdf' && purpose !== 'proof_of_purchase' ? 'proof_of_purchase' : purpose;
      start({
        key: `${file.name}-${file.size}-${crypto.randomUUID()}`,
        file,
        purpose: p,
        progress: 0,
        state: 'uploading',
      });
    }
  };

  const removal = useMutation({
    mutationFn: (a: AttachmentDto) => removeClaimFile(claimId, a.id),
    onSuccess: (_, a) => {
      latest.current = latest.current.filter((x) => x.id !== a.id);
      onChange(latest.current);
    },
    onError: (err) => setMessage(err.message),
  });
  const remove = (a: AttachmentDto) => removal.mutate(a);

  const onDrop = (e: DragEvent) => {
    e.preventDefault();
    setDragging(false);
    if (editable) add(e.dataTransfer.files);
  };

  return (
    <section aria-labelledby={`${purposeId}-h`} className="space-y-3">
      <h3 id={`${purposeId}-h`} className="text-base font-semibold text-ink-900">
        Photos and documents
      </h3>
      <p className="text-sm text-ink-600">
        The nameplate, the failure and the site, and proof of purchase. Up to {MAX_ATTACHMENTS_PER_OWNER}{' '}
        files of at most {MAX_ATTACHMENT_MB} MB each. Locations are removed from photos when stored.
      </p>
      {editable ? (
        <div
          onDragOver={(e) => {
            e.preventDefault();
            setDragging(true);
          }}
          onDragLeave={() => setDragging(false)}
          onDrop={onDrop}
          className={cn(
            'space-y-3 rounded-lg border-2 border-dashed p-3',
            dragging ? 'border-brand-600 bg-brand-50' : 'border-ink-300',
          )}
        >
          <div className="space-y-1">
            <label htmlFor={purposeId} className="block text-sm font-medium text-ink-800">
              What the next file shows
            </label>
            <select
              id={purposeId}
              value={purpose}
              onChange={(e) => setPurpose(e.target.value as AttachmentPurpose)}
              className="h-11 w-full rounded-lg border border-ink-300 bg-white px-3 text-base sm:text-sm"
            >
              {ATTACHMENT_PURPOSES.map((p) => (
                <option key={p} value={p}>
                  {ATTACHMENT_PURPOSE_LABELS[p]}
                </option>
              ))}
            </select>
          </div>
          <div className="grid grid-cols-1 gap-2 sm:grid-cols-2">
            <label className="inline-flex h-12 cursor-pointer items-center justify-center gap-2 rounded-lg bg-brand-700 px-4 font-semibold text-white hover:bg-brand-800">
              <Camera className="size-5" aria-hidden /> Take a photo
              <input
                type="file"
                accept="image/*"
                capture="environment"
                className="sr-only"
                onChange={(e) => {
                  add(e.target.files);
                  e.target.value = '';
                }}
              />
            </label>
            <label className="inline-flex h-12 cursor-pointer items-center justify-center gap-2 rounded-lg border border-ink-300 bg-white px-4 font-semibold text-ink-900 hover:bg-ink-50">
              <ImagePlus className="size-5" aria-hidden /> Choose files
              <input
                type="file"
                multiple
                accept={[...ACCEPTED_ATTACHMENT_TYPES, 'image/*'].join(',')}
                className="sr-only"
                onChange={(e) => {
                  add(e.target.files);
                  e.target.value = '';
                }}
              />
            </label>
          </div>
          <p className="hidden text-center text-xs text-ink-600 sm:block">or drop photos and PDFs here</p>
        </div>
      ) : null}
      {message ? (
        <p role="alert" className="text-sm font-medium text-bad-700">
          {message}
        </p>
      ) : null}
      <ul className="space-y-2" aria-label="Files on this claim">
        {attachments.map((a) => (
          <li key={a.id} className="flex items-center gap-3 rounded-lg border border-ink-200 p-2">
            {a.thumbnailUrl ? (
              <img src={a.thumbnailUrl} alt="" className="size-12 shrink-0 rounded object-cover" />
            ) : (
              <FileText className="size-10 shrink-0 text-ink-500" aria-hidden />
            )}
            <div className="min-w-0 flex-1">
              <a href={a.contentUrl} className="block truncate text-sm font-medium text-brand-800 underline">
                {a.name}
              </a>
              <p className="text-xs text-ink-600">
                {ATTACHMENT_PURPOSE_LABELS[a.purpose]} · {sizeText(a.byteSize)}
              </p>
            </div>
            {removable ? (
              <Button
                variant="ghost"
                size="md"
                aria-label={`Remove ${a.name}`}
                onClick={() => remove(a)}
                icon={<Trash2 className="size-4" aria-hidden />}
              />
            ) : null}
          </li>
        ))}
        {uploads.map((u) => (
          <li key={u.key} className="space-y-1 rounded-lg border border-ink-200 p-2">
            <div className="flex items-center gap-2">
              <p className="min-w-0 flex-1 truncate text-sm font-medium">{u.file.name}</p>
              {u.state === 'failed' ? (
                <>
                  <Button
                    variant="secondary"
                    size="md"
                    onClick={() => start(u)}
                    icon={<RotateCcw className="size-4" aria-hidden />}
                  >
                    Retry
                  </Button>
                  <Button
                    variant="ghost"
                    size="md"
                    aria-label={`Drop ${u.file.name}`}
                    onClick={() => setUploads((l) => l.filter((x) => x.key !== u.key))}
                    icon={<X className="size-4" aria-hidden />}
                  />
                </>
              ) : null}
            </div>
            <progress
              className="h-2 w-full accent-brand-700"
              max={100}
              value={Math.round(u.progress * 100)}
              aria-label={`Uploading ${u.file.name}`}
            />
            {u.state === 'failed' ? (
              <p className="text-sm text-bad-700">{u.error}</p>
            ) : (
              <p className="text-xs text-ink-600">{Math.round(u.progress * 100)} %</p>
            )}
          </li>
        ))}
      </ul>
      {!attachments.length && !uploads.length ? <p className="text-sm text-ink-600">No files yet.</p> : null}
    </section>
  );
}
