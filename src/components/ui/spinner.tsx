import { cn } from '../../lib/cn';

export function Spinner({ size = 'md', label }: { size?: 'sm' | 'md' | 'lg'; label?: string }) {
  const s = { sm: 'size-4 border-2', md: 'size-6 border-2', lg: 'size-10 border-[3px]' }[size];
  return (
    <span role={label ? 'status' : undefined} className="inline-flex items-center gap-2">
      <span aria-hidden className={cn('animate-spin rounded-full border-current border-r-transparent', s)} />
      {label ? <span className="text-sm text-ink-600">{label}</span> : null}
    </span>
  );
}
