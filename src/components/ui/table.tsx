import type { ReactNode, ThHTMLAttributes, TdHTMLAttributes } from 'react';
import { ChevronLeft, ChevronRight } from 'lucide-react';
import { cn } from '../../lib/cn';
import { Button } from './button';

/** A table that scrolls inside its own box on a narrow screen instead of widening the page. */
export function Table({ caption, children }: { caption: string; children: ReactNode }) {
  return (
    // relative: a visually hidden note (sr-only, absolutely placed) in a far cell stays inside this scrolling box
    // instead of widening the page.
    <div className="relative overflow-x-auto">
      <table className="min-w-full divide-y divide-ink-200 text-left text-sm">
        <caption className="sr-only">{caption}</caption>
        {children}
      </table>
    </div>
  );
}

export function Th({ className, ...rest }: ThHTMLAttributes<HTMLTableCellElement>) {
  return (
    <th
      scope="col"
      className={cn(
        'bg-ink-50 px-4 py-2.5 text-xs font-semibold tracking-wide text-ink-600 uppercase',
        className,
      )}
      {...rest}
    />
  );
}

export function Td({ className, ...rest }: TdHTMLAttributes<HTMLTableCellElement>) {
  return <td className={cn('px-4 py-3 align-middle text-ink-800', className)} {...rest} />;
}

export function Pagination({
  page,
  pageSize,
  total,
  onPage,
}: {
  page: number;
  pageSize: number;
  total: number;
  onPage: (p: number) => void;
}) {
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const from = total === 0 ? 0 : (page - 1) * pageSize + 1;
  const to = Math.min(total, page * pageSize);
  return (
    <nav
      aria-label="Pages"
      className="flex items-center justify-between gap-3 border-t border-ink-100 px-4 py-3 text-sm text-ink-600"
    >
      <p>
        {from}–{to} of {total}
      </p>
      <div className="flex gap-2">
        <Button
          variant="secondary"
          size="sm"
          disabled={page <= 1}
          onClick={() => onPage(page - 1)}
          icon={<ChevronLeft className="size-4" aria-hidden />}
        >
          Previous
        </Button>
        <Button variant="secondary" size="sm" disabled={page >= pages} onClick={() => onPage(page + 1)}>
          Next
          <ChevronRight className="size-4" aria-hidden />
        </Button>
      </div>
    </nav>
  );
}
