import { useMemo, useRef, useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { CheckCircle2, AlertTriangle, Receipt } from 'lucide-react';
import { Button } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { EmptyState } from '../../../components/ui/empty-state';
import { SearchField, useListState } from '../../../components/ui/data-table';
import { SelectField } from '../../../components/ui/field';
import { Spinner } from '../../../components/ui/spinner';
import { Pagination, Table, Td, Th } from '../../../components/ui/table';
import { ApiError } from '../../../lib/api-client';
import { creditPdfUrl, creditQueries, invalidateAfterCredit } from '../api/credit-queries';
import { issueCredit } from '../api/issue-credit';
import { Money } from './money';

type Result = { claimId: string; label: string; ok: boolean; text: string; memoId?: string };

/**
 * The accountant's queue: approved claims not yet credited. Several can be selected and issued in one go; each
 * is its own request with its own Idempotency-Key (kept for a retry of that claim), one after another, with a
 * progress bar and a result per claim.
 */
export function CreditDesk() {
  const qc = useQueryClient();
  const { values, params: filters, set, setPage } = useListState({ q: '', currency: '', minAgeDays: '' });
  const queue = useQuery(creditQueries.queue(filters));
  const [selected, setSelected] = useState<Set<string>>(new Set());
  const [running, setRunning] = useState(false);
  const [done, setDone] = useState(0);
  const [total, setTotal] = useState(0);
  const [results, setResults] = useState<Result[]>([]);
  const keys = useRef(new Map<string, string>());
  // One request per claim, one after another; the lists are refreshed once, after the last.
  const issue = useMutation({
    mutationFn: ({ claimId, key }: { claimId: string; key: string }) => issueCredit(claimId, key),
  });

  const items = useMemo(() => queue.data?.items ?? [], [queue.data]);
  const allOnPage = items.length > 0 && items.every((i) => selected.has(i.claimId));
  const toggle = (id: string) =>
    setSelected((s) => {
      const n = new Set(s);
      if (n.has(id)) n.delete(id);
      else n.add(id);
      return n;
    });

  async function issueSelected() {
    const chosen = items.filter((i) => selected.has(i.claimId));
    setRunning(true);
    setDone(0);
    setTotal(chosen.length);
    setResults([]);
    for (const item of chosen) {
      const label = item.number ?? item.claimId;
      let key = keys.current.get(item.claimId);
      if (!key) keys.current.set(item.claimId, (key = crypto.randomUUID()));
      try {
        const r = await issue.mutateAsync({ claimId: item.claimId, key });
        keys.current.delete(item.claimId);
        setResults((rs) => [
          ...rs,
          'creditApproval' in r
            ? {
                claimId: item.claimId,
                label,
                ok: true,
                text: `Your approval of ${r.creditApproval.amount} ${r.creditApproval.currency} is recorded; the memo is issued when a second accountant approves it.`,
              }
            : {
                claimId: item.claimId,
                label,
                ok: true,
                text: `Memo ${r.creditMemo.number} issued for ${r.creditMemo.amount} ${r.creditMemo.currency}.`,
                memoId: r.creditMemo.id,
              },
        ]);
      } catch (err) {
        const text = err instanceof ApiError ? err.message : 'Something went wrong; try this claim again.';
        if (err instanceof ApiError && err.status >= 400 && err.status < 500)
          keys.current.delete(item.claimId);
        setResults((rs) => [...rs, { claimId: item.claimId, label, ok: false, text }]);
      }
      setDone((d) => d + 1);
    }
    setSelected(new Set());
    setRunning(false);
    await invalidateAfterCredit(qc);
  }

  const percent = total ? Math.round((done / total) * 100) : 0;

  return (
    <Card>
      <CardHeader
        title="Approved, not yet credited"
        description="Each credit memo is issued once and lands on the contractor's account with you."
        actions={
          <Button onClick={issueSelected} disabled={running || selected.size === 0} loading={running}>
            {selected.size === 1 ? 'Issue 1 credit' : `Issue ${selected.size} credits`}
          </Button>
        }
      />
      <form
        className="grid gap-3 border-b border-ink-100 px-4 py-3 sm:grid-cols-3 sm:px-5"
        onSubmit={(e) => e.preventDefault()}
        role="search"
      >
        <SearchField
          type="text"
          label="Search claims"
          placeholder="Claim number, contractor or model"
          value={values.q}
          onChange={(q) => set({ q })}
        />
        <SelectField
          label="Currency"
          value={values.currency}
          onChange={(e) => set({ currency: e.target.value })}
        >
          <option value="">All currencies</option>
          <option value="USD">USD</option>
          <option value="CAD">CAD</option>
          <option value="EUR">EUR</option>
        </SelectField>
        <SelectField
          label="Waiting at least"
          value={values.minAgeDays}
          onChange={(e) => set({ minAgeDays: e.target.value })}
        >
          <option value="">Any time</option>
          <option value="7">7 days</option>
          <option value="30">30 days</option>
          <option value="60">60 days</option>
        </SelectField>
      </form>

      {total > 0 ? (
        <section
          aria-label="Issuing progress"
          className="space-y-3 border-b border-ink-100 px-4 py-3 sm:px-5"
        >
          <div className="flex items-center justify-between text-sm">
            <p className="font-medium text-ink-900">
              {running ? 'Issuing credits…' : 'Finished'} {done} of {total}
            </p>
            <p className="tabular-nums text-ink-600">{percent}%</p>
          </div>
          <div
            role="progressbar"
            aria-label="Credits issued"
            aria-valuemin={0}
            aria-valuemax={total}
            aria-valuenow={done}
            className="h-2.5 overflow-hidden rounded-full bg-ink-100"
          >
            <div
              className="h-full rounded-full bg-brand-700 transition-all"
              style={{ width: `${percent}%` }}
            />
          </div>
          <ul aria-label="Results" className="space-y-1.5 text-sm">
            {results.map((r) => (
              <li key={r.claimId} className="flex items-start gap-2">
                {r.ok ? (
                  <CheckCircle2 className="mt-0.5 size-4 shrink-0 text-ok-700" aria-hidden />
                ) : (
                  <AlertTriangle className="mt-0.5 size-4 shrink-0 text-bad-700" aria-hidden />
                )}
                <span>
                  <span className="font-medium">{r.label}:</span> {r.text}{' '}
                  {r.memoId ? (
                    <a
                      className="font-medium text-brand-800 underline"
                      href={creditPdfUrl(r.memoId)}
                      download
                    >
                      Download PDF
                    </a>
                  ) : null}
                </span>
              </li>
            ))}
          </ul>
        </section>
      ) : null}

      {queue.isPending ? (
        <div className="grid place-items-center py-10">
          <Spinner label="Loading approved claims" />
        </div>
      ) : items.length === 0 ? (
        <EmptyState icon={<Receipt className="size-6" />} title="No credits to issue">
          Claims your reviewers approve appear here for a credit memo.
        </EmptyState>
      ) : (
        <>
          <Table caption="Approved claims waiting for a credit memo">
            <thead>
              <tr>
                <Th className="w-12">
                  <input
                    type="checkbox"
                    className="size-5"
                    aria-label="Select every claim on this page"
                    checked={allOnPage}
                    onChange={() => setSelected(allOnPage ? new Set() : new Set(items.map((i) => i.claimId)))}
                  />
                </Th>
                <Th>Claim</Th>
                <Th>Contractor</Th>
                <Th>Product</Th>
                <Th className="text-right">Amount</Th>
                <Th className="text-right">Waiting</Th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {items.map((i) => (
                <tr key={i.claimId}>
                  <Td>
                    <input
                      type="checkbox"
                      className="size-5"
                      aria-label={`Select claim ${i.number ?? i.claimId}`}
                      checked={selected.has(i.claimId)}
                      onChange={() => toggle(i.claimId)}
                      disabled={running || i.secondApproval?.mine === true}
                    />
                  </Td>
                  <Td className="whitespace-nowrap">
                    <span className="font-mono text-xs">{i.number}</span>
                    {i.secondApproval ? (
                      <span className="mt-1 block text-xs font-medium text-warn-800">
                        {i.secondApproval.mine
                          ? 'Awaiting second approval: you approved it'
                          : `Awaiting second approval: ${i.secondApproval.approvedBy.name} approved it; issuing approves it too`}
                      </span>
                    ) : null}
                  </Td>
                  <Td>{i.contractor.name}</Td>
                  <Td>
                    <span className="font-medium">{i.product.modelNumber}</span>{' '}
                    <span className="text-ink-600">{i.product.name}</span>
                  </Td>
                  <Td className="text-right whitespace-nowrap">
                    <Money amount={i.amount} currency={i.currency} />
                  </Td>
                  <Td className="text-right whitespace-nowrap">
                    {i.ageDays === 1 ? '1 day' : `${i.ageDays} days`}
                  </Td>
                </tr>
              ))}
            </tbody>
          </Table>
          <div className="flex flex-wrap gap-x-6 gap-y-1 border-t border-ink-100 px-4 py-2 text-sm text-ink-700 sm:px-5">
            {queue.data?.totals.map((t) => (
              <p key={t.currency}>
                Waiting: <Money amount={t.amount} currency={t.currency} /> on {t.claims} claims
              </p>
            ))}
          </div>
          <Pagination page={filters.page} pageSize={50} total={queue.data?.total ?? 0} onPage={setPage} />
        </>
      )}
    </Card>
  );
}
