import { useQuery } from '@tanstack/react-query';
import { FilePlus2, Files, Search } from 'lucide-react';
import { Link, useSearchParams } from 'react-router';
import { CLAIM_STAGE_LABELS, CLAIM_STAGES } from '../../../../shared/schemas/claims';
import { buttonClasses } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { EmptyState } from '../../../components/ui/empty-state';
import { InputField, SelectField } from '../../../components/ui/field';
import { PageHeader } from '../../../components/ui/page-header';
import { Spinner } from '../../../components/ui/spinner';
import { Pagination } from '../../../components/ui/table';
import { claimQueries, type ClaimFilters } from '../api/claim-queries';
import { StageBadge, waitingText } from './stage-badge';
import { DayOf } from '../../../components/ui/date-time';
import { useDebouncedText } from '../../../lib/use-debounced-text';

const VERDICT_TEXT = {
  covered: 'Likely covered',
  review: 'Needs a reviewer',
  excluded: 'Likely excluded',
} as const;
const FILTER_KEYS = ['q', 'stage', 'site', 'product', 'filedFrom', 'filedTo'] as const;

/** The claims this user may see, with filters kept in the address (so a filtered list can be shared). */
export function ClaimsList({ canCreate }: { canCreate: boolean }) {
  const [params, setParams] = useSearchParams();
  const filters: ClaimFilters = { page: Number(params.get('page') ?? 1) || 1, sort: '-updatedAt' };
  for (const k of FILTER_KEYS) {
    const v = params.get(k);
    if (v) filters[k] = v;
  }
  const list = useQuery(claimQueries.list(filters));
  const set = (k: string, v: string) =>
    setParams(
      (prev) => {
        const next = new URLSearchParams(prev);
        if (v) next.set(k, v);
        else next.delete(k);
        next.delete('page');
        return next;
      },
      { replace: true },
    );
  // The search applies itself once typing pauses; Enter or the button applies it at once.
  const search = useDebouncedText(filters.q ?? '', (q) => set('q', q.trim()));
  // Site and product apply themselves the same way; all the boxes follow the address (Back, a shared link).
  const site = useDebouncedText(filters.site ?? '', (v) => set('site', v.trim()));
  const product = useDebouncedText(filters.product ?? '', (v) => set('product', v.trim()));

  return (
    <>
      <PageHeader
        title="Claims"
        description="Every claim of your organisation, newest change first."
        actions={
          canCreate ? (
            <>
              <Link to="/claims/batch" className={buttonClasses('secondary', 'md')}>
                <Files className="size-4" aria-hidden /> File from a spreadsheet
              </Link>
              <Link to="/claims/new" className={buttonClasses('primary', 'md')}>
                <FilePlus2 className="size-4" aria-hidden /> New claim
              </Link>
            </>
          ) : null
        }
      />
      <Card>
        <form
          role="search"
          className="grid gap-3 border-b border-ink-100 p-4 sm:grid-cols-2 lg:grid-cols-6"
          onSubmit={(e) => {
            e.preventDefault();
            search.commit();
            site.commit();
            product.commit();
          }}
        >
          <div className="flex items-end gap-2 sm:col-span-2">
            <InputField
              className="flex-1"
              label="Claim number or serial"
              value={search.text}
              onChange={(e) => search.setText(e.target.value)}
              placeholder="LP-2612-7K4-QXM"
            />
            <button type="submit" className={buttonClasses('secondary', 'md')} aria-label="Search">
              <Search className="size-4" aria-hidden />
            </button>
          </div>
          <SelectField
            label="Stage"
            value={filters.stage ?? ''}
            onChange={(e) => set('stage', e.target.value)}
          >
            <option value="">Any stage</option>
            {CLAIM_STAGES.map((s) => (
              <option key={s} value={s}>
                {CLAIM_STAGE_LABELS[s]}
              </option>
            ))}
          </SelectField>
          <InputField
            label="Site"
            value={site.text}
            onChange={(e) => site.setText(e.target.value)}
            onBlur={site.commit}
          />
          <InputField
            label="Product"
            value={product.text}
            onChange={(e) => product.setText(e.target.value)}
            onBlur={product.commit}
          />
          <div className="grid grid-cols-2 gap-2">
            <InputField
              label="Filed from"
              type="date"
              value={filters.filedFrom ?? ''}
              onChange={(e) => set('filedFrom', e.target.value)}
            />
            <InputField
              label="to"
              type="date"
              value={filters.filedTo ?? ''}
              onChange={(e) => set('filedTo', e.target.value)}
            />
          </div>
        </form>
        {list.isPending ? (
          <div className="p-6">
            <Spinner label="Loading claims" />
          </div>
        ) : list.error ? (
          <p role="alert" className="p-4 text-bad-700">
            {list.error.message}
          </p>
        ) : list.data.items.length === 0 ? (
          <EmptyState icon={<Files className="size-6" />} title="No claims match">
            Change the filters, or start a claim from an installation.
          </EmptyState>
        ) : (
          <>
            <ul className="divide-y divide-ink-100" aria-label="Claims">
              {list.data.items.map((c) => (
                <li key={c.id}>
                  <Link
                    to={`/claims/${c.id}`}
                    className="grid min-w-0 grid-cols-1 gap-1 px-4 py-3 hover:bg-ink-50 sm:grid-cols-[12rem_minmax(0,1fr)_12rem] sm:items-center sm:gap-4"
                  >
                    <span className="flex flex-wrap items-center gap-2">
                      <span className="font-mono text-sm font-semibold text-ink-900">
                        {c.number ?? 'Draft'}
                      </span>
                      <StageBadge stage={c.stage} />
                    </span>
                    <span className="min-w-0 text-sm">
                      <span className="block truncate font-medium text-ink-900">
                        {c.product.modelNumber} · {c.installation.siteName}
                      </span>
                      <span className="block truncate text-ink-600">
                        {c.manufacturer.name} · {c.units} unit{c.units === 1 ? '' : 's'}
                        {c.serials.length
                          ? ` · ${c.serials.slice(0, 3).join(', ')}${c.serials.length > 3 ? '…' : ''}`
                          : ''}
                      </span>
                    </span>
                    <span className="text-sm text-ink-700">
                      {c.evaluation ? VERDICT_TEXT[c.evaluation.verdict] : waitingText(c.stage, c.waitingOn)}
                      <span className="block text-xs text-ink-500">
                        {c.filedAt ? (
                          <>
                            Filed <DayOf value={c.filedAt} />
                          </>
                        ) : (
                          <>
                            Changed <DayOf value={c.updatedAt} />
                          </>
                        )}
                      </span>
                    </span>
                  </Link>
                </li>
              ))}
            </ul>
            <Pagination
              page={list.data.page}
              pageSize={list.data.pageSize}
              total={list.data.total}
              onPage={(p) => {
                const n = new URLSearchParams(params);
                n.set('page', String(p));
                setParams(n);
              }}
            />
          </>
        )}
      </Card>
    </>
  );
}
