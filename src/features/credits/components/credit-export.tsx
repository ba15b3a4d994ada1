import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { BookOpenCheck, FileSpreadsheet } from 'lucide-react';
import { todayIn } from '../../../../shared/dates';
import { formatAmount } from '../../../../shared/money';
import { buttonClasses } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { InputField, SelectField } from '../../../components/ui/field';
import { ApiError } from '../../../lib/api-client';
import { creditExportUrl, creditQueries, journalUrl } from '../api/credit-queries';

// The export's range is in UTC days, so its defaults are too.
const monthStart = () => `${todayIn().slice(0, 8)}01`;

/**
 * The files for the accounting system: the memo CSV (memos and reversals, negative, with a total per currency),
 * and the journal on the mapped accounts as CSV lines or an SIE 4 file, with its totals shown before download.
 */
export function CreditExport() {
  const [from, setFrom] = useState(monthStart());
  const [to, setTo] = useState(todayIn());
  const [currency, setCurrency] = useState('');
  const bad = !from || !to || from > to;
  const journal = useQuery({ ...creditQueries.journal(from, to), enabled: !bad });
  const unmapped = journal.error instanceof ApiError && journal.error.code === 'accounting.map_missing';
  const totals = journal.data?.totals ?? [];
  const sieCurrency = currency || (totals.length === 1 ? totals[0].currency : '');
  const link = (href: string | undefined, off: boolean) => ({
    className: buttonClasses('secondary', 'md', off ? 'pointer-events-none opacity-50' : undefined),
    'aria-disabled': off,
    href: off ? undefined : href,
    download: true,
  });

  return (
    <Card role="region" aria-label="Export for accounting">
      <CardHeader
        title="Export for accounting"
        description="Memos and reversals issued in the range (UTC days): a list with a total per currency, or journal entries on your mapped accounts."
      />
      <div className="flex flex-wrap items-end gap-3 px-4 py-4 sm:px-5">
        <InputField label="From" type="date" value={from} onChange={(e) => setFrom(e.target.value)} />
        <InputField
          label="To"
          type="date"
          value={to}
          onChange={(e) => setTo(e.target.value)}
          error={from > to ? 'The end date is before the start date.' : undefined}
        />
        <a
          className={buttonClasses('primary', 'md', bad ? 'pointer-events-none opacity-50' : undefined)}
          aria-disabled={bad}
          href={bad ? undefined : creditExportUrl(from, to)}
          download
        >
          <FileSpreadsheet className="size-4" aria-hidden /> Download CSV
        </a>
      </div>
      <section aria-labelledby="journal-heading" className="border-t border-ink-100 px-4 py-4 sm:px-5">
        <h3 id="journal-heading" className="text-sm font-semibold text-ink-900">
          Journal entries
        </h3>
        {unmapped ? (
          <p className="mt-1 text-sm text-ink-700">
            Map the accounts credit memos are booked to (below) to export journal entries.
          </p>
        ) : (
          <>
            <p className="mt-1 text-sm text-ink-700" aria-live="polite">
              {journal.error instanceof ApiError
                ? journal.error.message
                : journal.isPending && !bad
                  ? 'Adding up the entries…'
                  : totals.length === 0
                    ? 'No memos in the range.'
                    : totals
                        .map(
                          (t) =>
                            `${t.entries} ${t.entries === 1 ? 'entry' : 'entries'} in ${t.currency}: debits ${formatAmount(t.debit)}, credits ${formatAmount(t.credit)}`,
                        )
                        .join('; ')}
            </p>
            <div className="mt-3 flex flex-wrap items-end gap-3">
              {totals.length > 1 ? (
                <SelectField
                  label="Currency of the SIE file"
                  value={currency}
                  onChange={(e) => setCurrency(e.target.value)}
                >
                  <option value="">Choose…</option>
                  {totals.map((t) => (
                    <option key={t.currency} value={t.currency}>
                      {t.currency}
                    </option>
                  ))}
                </SelectField>
              ) : null}
              <a {...link(journalUrl(from, to, 'csv'), bad || !journal.data)}>
                <FileSpreadsheet className="size-4" aria-hidden /> Journal CSV
              </a>
              <a
                {...link(
                  journalUrl(from, to, 'sie', sieCurrency || undefined),
                  bad || !journal.data || (totals.length > 1 && !sieCurrency),
                )}
              >
                <BookOpenCheck className="size-4" aria-hidden /> SIE 4 file
              </a>
            </div>
          </>
        )}
      </section>
    </Card>
  );
}
