import { useState } from 'react';
import { Button } from '../../../components/ui/button';

/** A secret the server answers once: shown here, never again. */
export function SecretOnce({ label, secret }: { label: string; secret: string }) {
  const [copied, setCopied] = useState(false);
  return (
    <div className="space-y-2">
      <p className="text-sm text-ink-800">
        Copy it now: Lumenproof keeps only a fingerprint of it and cannot show it again.
      </p>
      <label className="block text-sm font-medium text-ink-800" htmlFor="secret-once">
        {label}
      </label>
      <input
        id="secret-once"
        readOnly
        value={secret}
        onFocus={(e) => e.currentTarget.select()}
        className="h-11 w-full rounded-lg border border-ink-300 bg-ink-50 px-3 font-mono text-sm"
      />
      <Button
        variant="secondary"
        onClick={() =>
          void navigator.clipboard?.writeText(secret).then(
            () => setCopied(true),
            () => setCopied(false),
          )
        }
      >
        {copied ? 'Copied' : 'Copy'}
      </Button>
    </div>
  );
}
