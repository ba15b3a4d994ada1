import { useState } from 'react';
import { FileSpreadsheet } from 'lucide-react';
import { buttonClasses } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { InputField } from '../../../components/ui/field';
import { creditExportUrl } from '../api/credit-queries';

const today = () => new Date().toISOString().slice(0, 10);
const monthStart = () => `${today().slice(0, 8)}01`;

/** The CSV for the accounting system: memos and reversals (negative) in the range, then a total per currency. */
export function CreditExport() {
  const [from, setFrom] = useState(monthStart());
  const [to, setTo] = useState(today());
  const bad = !from || !to || from > to;
  return (
    <Card>
      <CardHeader
        title="Export for accounting"
        description="Memos and reversals issued in the range (UTC days), with a total per currency."
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
    </Card>
  );
}
