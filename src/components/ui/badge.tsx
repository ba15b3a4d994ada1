import type { ReactNode } from 'react';
import { cn } from '../../lib/cn';

export type Tone = 'neutral' | 'brand' | 'ok' | 'warn' | 'bad' | 'info';

const tones: Record<Tone, string> = {
  neutral: 'bg-ink-100 text-ink-800 ring-ink-200',
  brand: 'bg-brand-50 text-brand-800 ring-brand-200',
  ok: 'bg-ok-50 text-ok-800 ring-ok-200',
  warn: 'bg-warn-50 text-warn-800 ring-warn-200',
  bad: 'bg-bad-50 text-bad-800 ring-bad-200',
  info: 'bg-info-50 text-info-800 ring-info-200',
};

export function Badge({
  tone = 'neutral',
  children,
  className,
}: {
  tone?: Tone;
  children: ReactNode;
  className?: string;
}) {
  return (
    <span
      className={cn(
        'inline-flex items-center gap-1 rounded-md px-2 py-0.5 text-xs font-semibold ring-1 ring-inset',
        tones[tone],
        className,
      )}
    >
      {children}
    </span>
  );
}
