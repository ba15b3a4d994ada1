import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Download, Receipt } from 'lucide-react';
import type { CreditMemoDto } from '../../../../shared/schemas/credits';
import { Badge } from '../../../components/ui/badge';
import { Button, buttonClasses } from '../../../components/ui/button';
import { DataTable, SearchField, useListState, type Column } from '../../../components/ui/data-table';
import { InputField, SelectField } from '../../../components/ui/field';
import { creditPdfUrl, creditQueries } from '../api/credit-queries';
import { Money } from './money';
import { VoidCreditDialog } from './void-credit-dialog';
import { DayOf } from '../../../components/ui/date-time';

/** Memos and reversals, newest first, with the PDF of each; the accountant may void a standing credit. */
export function CreditsTable({
  canVoid,
  partyLabel,
}: {
  canVoid: boolean;
  partyLabel: 'Contractor' | 'Manufacturer';
}) {
  const { values, params, set, tableProps } = useListState({
    q: '',
    kind: '',
    from: '',
    to: '',
    sort: '-issuedAt',
  });
  const list = useQuery(creditQueries.list(params));
  const [voiding, setVoiding] = useState<CreditMemoDto | null>(null);
  const columns: Column<CreditMemoDto>[] = [
    {
      key: 'memo',
      header: 'Memo',
      sortKey: 'number',
      className: 'whitespace-nowrap',
      cell: (m) => (
        <>
          <span className="font-mono text-xs">{m.number}</span>{' '}
          {m.kind === 'reversal' ? (
            <Badge tone="warn">Reversal of {m.reverses?.number}</Badge>
          ) : m.reversedBy ? (
            <Badge tone="bad">Voided by {m.reversedBy.number}</Badge>
          ) : (
            <Badge tone="ok">Standing</Badge>
          )}
          {m.reason ? (
            <p className="mt-1 max-w-xs text-xs whitespace-normal text-ink-600">{m.reason}</p>
          ) : null}
        </>
      ),
    },
    {
      key: 'claim',
      header: 'Claim',
      className: 'font-mono text-xs whitespace-nowrap',
      headerClassName: '',
      cell: (m) => m.claim.number,
    },
    {
      key: 'party',
      header: partyLabel,
      cell: (m) => (partyLabel === 'Contractor' ? m.contractor.name : m.manufacturer.name),
    },
    {
      key: 'amount',
      header: 'Amount',
      sortKey: 'amount',
      firstSort: 'descending',
      className: 'text-right whitespace-nowrap',
      headerClassName: 'text-right',
      cell: (m) => <Money amount={m.kind === 'reversal' ? `-${m.amount}` : m.amount} currency={m.currency} />,
    },
    {
      key: 'issued',
      header: 'Issued',
      sortKey: 'issuedAt',
      firstSort: 'descending',
      className: 'whitespace-nowrap',
      cell: (m) => <DayOf value={m.issuedAt} />,
    },
    {
      key: 'actions',
      // relative: an absolutely placed sr-only label would otherwise widen the page past the table's scroll box
      header: <span className="sr-only">Actions</span>,
      headerClassName: 'relative',
      className: 'whitespace-nowrap text-right',
      cell: (m) => (
        <>
          <a
            className={buttonClasses('secondary', 'sm')}
            href={creditPdfUrl(m.id)}
            download
            aria-label={`Download PDF of ${m.number}`}
          >
            <Download className="size-4" aria-hidden /> PDF
          </a>{' '}
          {canVoid && m.kind === 'credit' && !m.reversedBy ? (
            <Button variant="ghost" size="sm" onClick={() => setVoiding(m)} aria-label={`Void ${m.number}`}>
              Void
            </Button>
          ) : null}
        </>
      ),
    },
  ];
  return (
    <DataTable
      caption="Credit memos and reversals"
      columns={columns}
      result={list}
      loadingLabel="Loading credit memos"
      empty={{
        icon: <Receipt className="size-6" />,
        title: 'No credit memos',
        children: 'Memos appear here once they are issued.',
      }}
      errorText="Could not load credit memos."
      {...tableProps}
      toolbar={
        <form
          role="search"
          className="grid gap-3 border-b border-ink-100 px-4 py-3 sm:grid-cols-4 sm:px-5"
          onSubmit={(e) => e.preventDefault()}
        >
          <SearchField
            type="text"
            label="Search memos"
            placeholder="Memo or claim number"
            value={values.q}
            onChange={(q) => set({ q })}
          />
          <SelectField label="Kind" value={values.kind} onChange={(e) => set({ kind: e.target.value })}>
            <option value="">Memos and reversals</option>
            <option value="credit">Credit memos</option>
            <option value="reversal">Reversals</option>
          </SelectField>
          <InputField
            label="Issued from"
            type="date"
            value={values.from}
            onChange={(e) => set({ from: e.target.value })}
          />
          <InputField
            label="Issued to"
            type="date"
            value={values.to}
            onChange={(e) => set({ to: e.target.value })}
          />
        </form>
      }
    >
      {canVoid ? <VoidCreditDialog memo={voiding} onClose={() => setVoiding(null)} /> : null}
    </DataTable>
  );
}
