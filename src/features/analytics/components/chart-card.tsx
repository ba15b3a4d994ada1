import { useId, useState, type ReactNode } from 'react';
import { Download, Table2 } from 'lucide-react';
import { buttonClasses, Button } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';

/**
 * A chart with what it says in words, the numbers behind it one click away (the same numbers as the CSV),
 * and the CSV itself. The chart is decoration for sighted users: the summary and the table carry the data.
 */
export function ChartCard({
  title,
  description,
  summary,
  csvHref,
  table,
  decorative = true,
  children,
}: {
  title: string;
  description?: ReactNode;
  summary: ReactNode;
  csvHref?: string;
  table: ReactNode;
  /** false when the "chart" is itself readable (a table): then it is not hidden from screen readers. */
  decorative?: boolean;
  children: ReactNode;
}) {
  const [showNumbers, setShowNumbers] = useState(false);
  const tableId = useId();
  return (
    <Card>
      <CardHeader
        title={title}
        description={description}
        actions={
          <>
            <Button
              variant="secondary"
              size="sm"
              aria-expanded={showNumbers}
              aria-controls={tableId}
              icon={<Table2 className="size-4" aria-hidden />}
              onClick={() => setShowNumbers((v) => !v)}
            >
              {showNumbers ? 'Hide numbers' : 'Numbers'}
            </Button>
            {csvHref ? (
              <a
                href={csvHref}
                download
                className={buttonClasses('secondary', 'sm')}
                aria-label={`Download CSV: ${title}`}
              >
                <Download className="size-4" aria-hidden /> Download CSV
              </a>
            ) : null}
          </>
        }
      />
      <div className="space-y-3 px-4 py-4 sm:px-5">
        <p className="text-sm text-ink-700">{summary}</p>
        <div aria-hidden={decorative ? 'true' : undefined}>{children}</div>
        <div
          id={tableId}
          hidden={!showNumbers}
          tabIndex={0}
          role="region"
          aria-label={`Numbers: ${title}`}
          className="max-h-96 overflow-auto rounded-lg border border-ink-100"
        >
          {showNumbers ? table : null}
        </div>
      </div>
    </Card>
  );
}

/** A plain table of numbers for the Numbers toggle. */
export function NumbersTable({
  caption,
  head,
  rows,
}: {
  caption: string;
  head: string[];
  rows: (string | number)[][];
}) {
  return (
    <table className="min-w-full divide-y divide-ink-200 text-left text-sm">
      <caption className="sr-only">{caption}</caption>
      <thead className="sticky top-0 bg-ink-50">
        <tr>
          {head.map((h) => (
            <th key={h} scope="col" className="px-3 py-2 text-xs font-semibold text-ink-700">
              {h}
            </th>
          ))}
        </tr>
      </thead>
      <tbody className="divide-y divide-ink-100">
        {rows.map((r, i) => (
          <tr key={i}>
            {r.map((c, j) => (
              <td key={j} className="px-3 py-1.5 text-ink-800 tabular-nums">
                {c}
              </td>
            ))}
          </tr>
        ))}
      </tbody>
    </table>
  );
}
