import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Download, Receipt } from 'lucide-react';
import type { CreditMemoDto } from '../../../../shared/schemas/credits';
import { Badge } from '../../../components/ui/badge';
import { Button, buttonClasses } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { EmptyState } from '../../../components/ui/empty-state';
import { InputField, SelectField } from '../../../components/ui/field';
import { Spinner } from '../../../components/ui/spinner';
import { Pagination, Table, Td, Th } from '../../../components/ui/table';
import { creditPdfUrl, creditQueries, type CreditFilters } from '../api/credit-queries';
import { Money, shortDate } from './money';
import { VoidCreditDialog } from './void-credit-dialog';

/** Memos and reversals, newest first, with the PDF of each; the accountant may void a standing credit. */
export function CreditsTable({
  canVoid,
  partyLabel,
}: {
  canVoid: boolean;
  partyLabel: 'Contractor' | 'Manufacturer';
}) {
  const [filters, setFilters] = useState<CreditFilters>({ page: 1 });
  const list = useQuery(creditQueries.list(filters));
  const [voiding, setVoiding] = useState<CreditMemoDto | null>(null);
  const set = (patch: Partial<CreditFilters>) => setFilters({ ...filters, page: 1, ...patch });
  const items = list.data?.items ?? [];
  return (
    <Card>
      <form
        role="search"
        className="grid gap-3 border-b border-ink-100 px-4 py-3 sm:grid-cols-4 sm:px-5"
        onSubmit={(e) => e.preventDefault()}
      >
        <InputField
          label="Search memos"
          placeholder="Memo or claim number"
          value={filters.q ?? ''}
          onChange={(e) => set({ q: e.target.value })}
        />
        <SelectField
          label="Kind"
          value={filters.kind ?? ''}
          onChange={(e) => set({ kind: e.target.value || undefined })}
        >
          <option value="">Memos and reversals</option>
          <option value="credit">Credit memos</option>
          <option value="reversal">Reversals</option>
        </SelectField>
        <InputField
          label="Issued from"
          type="date"
          value={filters.from ?? ''}
          onChange={(e) => set({ from: e.target.value || undefined })}
        />
        <InputField
          label="Issued to"
          type="date"
          value={filters.to ?? ''}
          onChange={(e) => set({ to: e.target.value || undefined })}
        />
      </form>
      {list.isPending ? (
        <div className="grid place-items-center py-10">
          <Spinner label="Loading credit memos" />
        </div>
      ) : list.isError ? (
        <p role="alert" className="px-5 py-6 text-sm text-bad-700">
          {list.error.message}
        </p>
      ) : items.length === 0 ? (
        <EmptyState icon={<Receipt className="size-6" />} title="No credit memos">
          Memos appear here once they are issued.
        </EmptyState>
      ) : (
        <>
          <Table caption="Credit memos and reversals">
            <thead>
              <tr>
                <Th>Memo</Th>
                <Th>Claim</Th>
                <Th>{partyLabel}</Th>
                <Th className="text-right">Amount</Th>
                <Th>Issued</Th>
                {/* relative: an absolutely placed sr-only label would otherwise widen the page past the table's scroll box */}
                <Th className="relative">
                  <span className="sr-only">Actions</span>
                </Th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {items.map((m) => (
                <tr key={m.id}>
                  <Td className="whitespace-nowrap">
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
                  </Td>
                  <Td className="font-mono text-xs whitespace-nowrap">{m.claim.number}</Td>
                  <Td>{partyLabel === 'Contractor' ? m.contractor.name : m.manufacturer.name}</Td>
                  <Td className="text-right whitespace-nowrap">
                    <Money amount={m.kind === 'reversal' ? `-${m.amount}` : m.amount} currency={m.currency} />
                  </Td>
                  <Td className="whitespace-nowrap">{shortDate(m.issuedAt)}</Td>
                  <Td className="whitespace-nowrap text-right">
                    <a
                      className={buttonClasses('secondary', 'sm')}
                      href={creditPdfUrl(m.id)}
                      download
                      aria-label={`Download PDF of ${m.number}`}
                    >
                      <Download className="size-4" aria-hidden /> PDF
                    </a>{' '}
                    {canVoid && m.kind === 'credit' && !m.reversedBy ? (
                      <Button
                        variant="ghost"
                        size="sm"
                        onClick={() => setVoiding(m)}
                        aria-label={`Void ${m.number}`}
                      >
                        Void
                      </Button>
                    ) : null}
                  </Td>
                </tr>
              ))}
            </tbody>
          </Table>
          <Pagination
            page={filters.page}
            pageSize={25}
            total={list.data?.total ?? 0}
            onPage={(page) => setFilters({ ...filters, page })}
          />
        </>
      )}
      {canVoid ? <VoidCreditDialog memo={voiding} onClose={() => setVoiding(null)} /> : null}
    </Card>
  );
}
