import { useQuery } from '@tanstack/react-query';
import { useEffect, useMemo, useRef, useState, type KeyboardEvent } from 'react';
import { Link, useNavigate } from 'react-router';
import { ClipboardCheck, SlidersHorizontal } from 'lucide-react';
import { STAGE_LABELS } from '../../../../shared/claims/stages';
import { Badge, type Tone } from '../../../components/ui/badge';
import { Button, buttonClasses } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { EmptyState } from '../../../components/ui/empty-state';
import { SearchField, useListState } from '../../../components/ui/data-table';
import { InputField, SelectField } from '../../../components/ui/field';
import { Spinner } from '../../../components/ui/spinner';
import { Pagination } from '../../../components/ui/table';
import { cn } from '../../../lib/cn';
import { PRODUCT_PICKER_LIMIT, reviewQueries, type QueueFilters } from '../api/review-queries';
import { SavedViewPicker, SaveViewForm } from './saved-views';

const VERDICT: Record<string, { label: string; tone: Tone }> = {
  covered: { label: 'Likely covered', tone: 'ok' },
  excluded: { label: 'Likely excluded', tone: 'bad' },
  review: { label: 'Needs a person', tone: 'warn' },
};

export const WAITING_LABEL = { manufacturer: 'on us', contractor: 'on the installer' } as const;

const DAYS = /^(?:\d{1,3}|[0-2]\d{3}|3[0-5]\d{2}|36[0-4]\d|3650)$/;
const MONEY = /^\d{1,10}(\.\d{1,2})?$/;

/** A typed filter: applied once the text matches (undefined when cleared); until then it says what it needs. */
function TypedFilter({
  label,
  inputMode,
  pattern,
  hint,
  value,
  onValue,
}: {
  label: string;
  inputMode: 'numeric' | 'decimal';
  pattern: RegExp;
  hint: string;
  /** The applied value (from the address); the box follows it when it changes from outside (Back, a view). */
  value: string;
  onValue: (v: string | undefined) => void;
}) {
  const [text, setText] = useState(value);
  const [seen, setSeen] = useState(value);
  if (value !== seen) {
    setSeen(value);
    setText(value);
  }
  const ok = text.trim() === '' || pattern.test(text.trim());
  return (
    <InputField
      label={label}
      inputMode={inputMode}
      value={text}
      error={ok ? undefined : hint}
      onChange={(e) => {
        const v = e.target.value;
        setText(v);
        if (v.trim() === '') onValue(undefined);
        else if (pattern.test(v.trim())) onValue(v.trim());
      }}
    />
  );
}

type PickerProps = { value: string; onValue: (v: string | undefined) => void };

/** A filter chosen from a list the server gives; the first option (empty) leaves the filter out. */
function ListPicker({
  label,
  anyLabel,
  options,
  hint,
  value,
  onValue,
}: PickerProps & {
  label: string;
  anyLabel: string;
  options: { id: string; label: string }[];
  hint?: string;
}) {
  return (
    <SelectField
      label={label}
      value={value}
      hint={hint}
      onChange={(e) => onValue(e.target.value || undefined)}
    >
      <option value="">{anyLabel}</option>
      {options.map((o) => (
        <option key={o.id} value={o.id}>
          {o.label}
        </option>
      ))}
    </SelectField>
  );
}

/** The product filter: the manufacturer's own models, by model number. */
function ProductPicker({ manufacturerId, ...pick }: PickerProps & { manufacturerId: string }) {
  const { data, isError } = useQuery(reviewQueries.products(manufacturerId));
  const hint = isError
    ? 'The product list could not be loaded.'
    : data && data.total > data.items.length
      ? `The first ${PRODUCT_PICKER_LIMIT} models by model number; search finds the others.`
      : undefined;
  const options = (data?.items ?? []).map((p) => ({ id: p.id, label: `${p.modelNumber} · ${p.name}` }));
  return <ListPicker label="Product" anyLabel="Any product" options={options} hint={hint} {...pick} />;
}

/** The contractor filter: the contractors who have filed claims on this manufacturer's products. */
function ContractorPicker(pick: PickerProps) {
  const { data, isError } = useQuery(reviewQueries.contractors());
  const hint = isError
    ? 'The contractor list could not be loaded.'
    : data?.more
      ? `Only the first ${data.items.length} contractors by name are listed; search finds the others.`
      : undefined;
  const options = (data?.items ?? []).map((c) => ({ id: c.id, label: c.name }));
  return <ListPicker label="Contractor" anyLabel="Any contractor" options={options} hint={hint} {...pick} />;
}

const OPEN_STAGES = 'filed,in_review,unit_received,return_requested,needs_info';
const DEFAULT_FILTERS: QueueFilters = { stage: OPEN_STAGES, sort: 'stageChangedAt' };

/** The queue's state as the address holds it: every filter a string, the default where it is not given. */
const LIST_DEFAULTS = {
  q: '',
  stage: OPEN_STAGES,
  verdict: '',
  assignee: '',
  productModelId: '',
  contractorId: '',
  minAgeDays: '',
  minAmount: '',
  sort: 'stageChangedAt',
  /** The saved view being looked at; any change of a filter leaves it. */
  view: '',
};
type ListValues = typeof LIST_DEFAULTS;

/** The API's filters from the address: empty ones left out, the age a number, no page on the first. */
function queueFiltersOf(v: ListValues & { page: number }): QueueFilters {
  const f: QueueFilters = {};
  for (const k of [
    'q',
    'stage',
    'verdict',
    'assignee',
    'productModelId',
    'contractorId',
    'minAmount',
    'sort',
  ] as const)
    if (v[k] !== '') f[k] = v[k];
  if (v.minAgeDays !== '') f.minAgeDays = Number(v.minAgeDays);
  if (v.page > 1) f.page = v.page;
  return f;
}

/** The address's values for a saved view's filters (the ones it leaves out go back to their defaults). */
function listValuesOf(f: QueueFilters, view: string): Partial<ListValues> {
  return {
    q: f.q ?? '',
    stage: f.stage ?? '',
    verdict: f.verdict ?? '',
    assignee: f.assignee ?? '',
    productModelId: f.productModelId ?? '',
    contractorId: f.contractorId ?? '',
    minAgeDays: f.minAgeDays === undefined ? '' : String(f.minAgeDays),
    minAmount: f.minAmount ?? '',
    sort: f.sort ?? LIST_DEFAULTS.sort,
    view,
  };
}

/** How many filters narrow the queue beyond the desk's default (every open claim); search and sort aside. */
export function activeFilterCount(f: QueueFilters): number {
  return [
    (f.stage ?? '') !== OPEN_STAGES,
    !!f.verdict,
    !!f.assignee,
    !!f.productModelId,
    !!f.contractorId,
    f.minAgeDays !== undefined,
    !!f.minAmount,
  ].filter(Boolean).length;
}

/**
 * The reviewer's queue: filters, a keyboard-driven list (j/k or arrows, Enter opens), ageing in plain words.
 * The filters, the page and the saved view live in the address (Back and reload keep them).
 */
export function ReviewQueue({ manufacturerId }: { manufacturerId: string }) {
  const list = useListState(LIST_DEFAULTS);
  const filters = queueFiltersOf(list.values);
  const viewId = list.values.view;
  // The filters fold into one row (search, a count, saved views) so that the first claim shows on a phone.
  const [showFilters, setShowFilters] = useState(false);
  const count = activeFilterCount(filters);
  const { data, isPending, isError } = useQuery(reviewQueries.queue(filters));
  const [active, setActive] = useState(0);
  const [announce, setAnnounce] = useState('');
  const rows = useRef<(HTMLAnchorElement | null)[]>([]);
  const navigate = useNavigate();
  const items = useMemo(() => data?.items ?? [], [data]);
  const set = (patch: Partial<ListValues>) => {
    list.set({ ...patch, view: '' });
    setActive(0);
  };
  const apply = (id: string, next: QueueFilters) => {
    list.reset(listValuesOf(next, id));
    setActive(0);
  };

  useEffect(() => {
    const item = items[active];
    if (item)
      setAnnounce(
        `${active + 1} of ${items.length}: claim ${item.number}, ${STAGE_LABELS[item.stage]}, ${item.daysInStage} days`,
      );
  }, [active, items]);

  function onKey(e: KeyboardEvent<HTMLUListElement>) {
    if (!items.length) return;
    const next =
      e.key === 'j' || e.key === 'ArrowDown'
        ? active + 1
        : e.key === 'k' || e.key === 'ArrowUp'
          ? active - 1
          : null;
    if (next !== null) {
      e.preventDefault();
      const i = Math.max(0, Math.min(items.length - 1, next));
      setActive(i);
      rows.current[i]?.focus();
    } else if (e.key === 'Enter' && items[active]) {
      e.preventDefault();
      navigate(`/review/${items[active].id}`);
    }
  }

  return (
    <Card>
      <CardHeader
        title="Claims on your desk"
        description="j / k or the arrow keys move, Enter opens. Oldest in its stage first."
      />
      <div className="flex flex-wrap items-end gap-2 border-b border-ink-200 px-4 py-3 sm:px-5">
        <SearchField
          type="text"
          className="min-w-0 flex-1 basis-48"
          label="Search"
          placeholder="Claim number, site, contractor, model, serial"
          value={list.values.q}
          onChange={(q) => set({ q })}
        />
        <Button
          variant="secondary"
          aria-expanded={showFilters}
          aria-controls="queue-filters"
          icon={<SlidersHorizontal className="size-4" aria-hidden />}
          onClick={() => setShowFilters((v) => !v)}
        >
          {count ? `${count} ${count === 1 ? 'filter' : 'filters'}` : 'Filters'}
        </Button>
        <SavedViewPicker
          viewId={viewId}
          onApply={(v) => apply(v.id, v.filters as QueueFilters)}
          onClear={() => apply('', DEFAULT_FILTERS)}
        />
      </div>
      <div
        id="queue-filters"
        hidden={!showFilters}
        className="space-y-3 border-b border-ink-200 bg-ink-50/50 px-4 py-3 sm:px-5"
      >
        <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
          <SelectField
            label="Stage"
            value={list.values.stage}
            onChange={(e) => set({ stage: e.target.value })}
          >
            <option value="filed,in_review,unit_received,return_requested,needs_info">All open</option>
            <option value="filed">{STAGE_LABELS.filed}</option>
            <option value="in_review">{STAGE_LABELS.in_review}</option>
            <option value="needs_info">{STAGE_LABELS.needs_info}</option>
            <option value="return_requested">{STAGE_LABELS.return_requested}</option>
            <option value="unit_received">{STAGE_LABELS.unit_received}</option>
            <option value="approved,denied">Decided</option>
            <option value="">Every stage</option>
          </SelectField>
          <SelectField
            label="Engine verdict"
            value={filters.verdict ?? ''}
            onChange={(e) => set({ verdict: e.target.value })}
          >
            <option value="">Any</option>
            <option value="covered">Likely covered</option>
            <option value="review">Needs a person</option>
            <option value="excluded">Likely excluded</option>
          </SelectField>
          <SelectField
            label="Assigned"
            value={filters.assignee ?? ''}
            onChange={(e) => set({ assignee: e.target.value })}
          >
            <option value="">Anyone</option>
            <option value="me">Me</option>
            <option value="none">Nobody yet</option>
          </SelectField>
          <ProductPicker
            manufacturerId={manufacturerId}
            value={filters.productModelId ?? ''}
            onValue={(v) => set({ productModelId: v ?? '' })}
          />
          <ContractorPicker
            value={filters.contractorId ?? ''}
            onValue={(v) => set({ contractorId: v ?? '' })}
          />
          <TypedFilter
            label="Filed at least (days ago)"
            inputMode="numeric"
            pattern={DAYS}
            hint="Whole days, 0 to 3650."
            value={list.values.minAgeDays}
            onValue={(v) => set({ minAgeDays: v ?? '' })}
          />
          <TypedFilter
            label="Amount at least"
            inputMode="decimal"
            pattern={MONEY}
            hint="An amount like 96.00."
            value={list.values.minAmount}
            onValue={(v) => set({ minAmount: v ?? '' })}
          />
          <SelectField
            label="Sort"
            value={filters.sort ?? 'stageChangedAt'}
            onChange={(e) => set({ sort: e.target.value })}
          >
            <option value="stageChangedAt">Waiting longest</option>
            <option value="-filedAt">Newest filed</option>
            <option value="-amount">Largest amount</option>
            <option value="number">Claim number</option>
          </SelectField>
        </div>
        <SaveViewForm
          filters={filters}
          viewId={viewId}
          onSaved={(id) => list.set({ view: id })}
          onDeleted={() => list.set({ view: '' })}
        />
      </div>
      <p className="sr-only" aria-live="polite">
        {announce}
      </p>
      {isPending ? (
        <div className="p-6">
          <Spinner label="Loading the queue" />
        </div>
      ) : isError ? (
        <p className="p-6 text-bad-700">The queue could not be loaded. Try again in a moment.</p>
      ) : items.length === 0 ? (
        <EmptyState icon={<ClipboardCheck className="size-6" />} title="Nothing matches">
          No claims with these filters. Filed claims on your products arrive here after the automatic
          screening.
        </EmptyState>
      ) : (
        <>
          <ul aria-label="Claims" className="divide-y divide-ink-100" onKeyDown={onKey}>
            {items.map((c, i) => (
              <li key={c.id}>
                <Link
                  ref={(el) => {
                    rows.current[i] = el;
                  }}
                  to={`/review/${c.id}`}
                  tabIndex={i === active ? 0 : -1}
                  onFocus={() => setActive(i)}
                  aria-current={i === active ? 'true' : undefined}
                  className={cn(
                    'grid gap-1 px-4 py-3 outline-none sm:grid-cols-[10rem_1fr_auto] sm:items-center sm:px-5',
                    'focus-visible:bg-brand-50 focus-visible:ring-2 focus-visible:ring-inset focus-visible:ring-brand-600',
                    i === active && 'bg-ink-50',
                  )}
                >
                  <span className="font-mono text-sm font-semibold text-ink-900">{c.number}</span>
                  <span className="text-sm text-ink-700">
                    {c.contractor.name} · {c.product.modelNumber} · {c.siteName}
                    <span className="block text-xs text-ink-600">
                      {STAGE_LABELS[c.stage]} for {c.daysInStage} {c.daysInStage === 1 ? 'day' : 'days'}
                      {c.waitingOn ? `, waiting ${WAITING_LABEL[c.waitingOn]}` : ''}
                      {c.daysSinceFiling !== null ? ` · filed ${c.daysSinceFiling} days ago` : ''}
                      {c.assignee ? ` · ${c.assignee.name}` : ' · unassigned'}
                    </span>
                  </span>
                  <span className="flex flex-wrap items-center gap-2">
                    {c.verdict ? (
                      <Badge tone={VERDICT[c.verdict].tone}>{VERDICT[c.verdict].label}</Badge>
                    ) : null}
                    {c.expectedCredit ? (
                      <span className="text-sm tabular-nums text-ink-700">
                        {c.expectedCredit} {c.currency}
                      </span>
                    ) : null}
                  </span>
                </Link>
              </li>
            ))}
          </ul>
          <Pagination page={data.page} pageSize={data.pageSize} total={data.total} onPage={list.setPage} />
        </>
      )}
    </Card>
  );
}

/** The reviewer's home: the desk in numbers, and the way in. */
export function ReviewDeskSummary() {
  const { data } = useQuery(reviewQueries.summary());
  const open = (s: keyof NonNullable<typeof data>['counts']) => data?.counts[s] ?? 0;
  return (
    <Card>
      <CardHeader
        title="Claims waiting for a decision"
        description="The engine's findings sit beside the evidence on every claim."
        actions={
          <Link className={buttonClasses('primary', 'md')} to="/review">
            Open the review desk
          </Link>
        }
      />
      <dl className="grid grid-cols-2 gap-4 px-4 py-4 sm:grid-cols-4 sm:px-5">
        {[
          ['Filed, not yet taken', open('filed')],
          ['In review', open('in_review') + open('unit_received')],
          ['Waiting on installers', open('needs_info') + open('return_requested')],
          ['Assigned to you', data?.mine ?? 0],
        ].map(([label, n]) => (
          <div key={label as string}>
            <dt className="text-sm text-ink-600">{label}</dt>
            <dd className="text-2xl font-semibold tabular-nums text-ink-900">{n}</dd>
          </div>
        ))}
      </dl>
      {data?.oldestWaitingDays != null ? (
        <p className="px-4 pb-4 text-sm text-ink-600 sm:px-5">
          The oldest claim waiting on your team has waited {data.oldestWaitingDays} days.
        </p>
      ) : null}
    </Card>
  );
}
