import type { ClaimDocumentDto } from '../../../../../shared/claims/workflow';

export function DocLink({ doc, label }: { doc: ClaimDocumentDto; label: string }) {
  return (
    <a className="font-medium text-brand-700 underline" href={doc.url} download>
      {label}{' '}
      <span className="text-xs text-ink-600">
        (PDF, {Math.ceil(doc.byteSize / 1024)} KB, SHA-256 {doc.sha256.slice(0, 12)}…)
      </span>
    </a>
  );
}
