import { type ReactNode } from 'react';
import { useSearchParams } from 'react-router';
import { ArrowDown, ArrowUp, ArrowUpDown } from 'lucide-react';
import type { Paginated } from '../../../shared/schemas/users';
import { ApiError } from '../../lib/api-client';
import { cn } from '../../lib/cn';
import { useDebouncedText } from '../../lib/use-debounced-text';
import { Card } from './card';
import { EmptyState } from './empty-state';
import { InputField, optionsOf, SelectField } from './field';
import { Spinner } from './spinner';
import { Pagination, Table, Td, Th } from './table';

// The lists of the catalogue, the sites, the people and the credits share one shape: a toolbar of filters over
// a server-paged table, with the same loading, empty and error states. Sorting runs on the server: the sort
// is the API's `sort` parameter ("name" ascending, "-name" descending).

export type Column<T> = {
  key: string;
  header: ReactNode;
  cell: (row: T) => ReactNode;
  /** The API's sort key for this column; the header becomes a button that sorts by it. */
  sortKey?: string;
  /** Which way the first press sorts (newest or largest first reads better for dates and amounts). */
  firstSort?: 'ascending' | 'descending';
  /** Classes of the body cells, and of the header cell when `headerClassName` is not given. */
  className?: string;
  headerClassName?: string;
};

/** The part of a TanStack query result the table reads. */
export type PagedResult<T> = { isPending: boolean; data?: Paginated<T>; error: unknown };

export type SortDirection = 'ascending' | 'descending';

/** "-issuedAt" → { key: "issuedAt", direction: "descending" } */
export function readSort(sort: string): { key: string; direction: SortDirection } {
  return sort.startsWith('-')
    ? { key: sort.slice(1), direction: 'descending' }
    : { key: sort, direction: 'ascending' };
}

/** The sort after pressing a column's header: the other way round if it is the current one, else its first way. */
export function nextSort(current: string, key: string, first: SortDirection = 'ascending'): string {
  const now = readSort(current);
  const direction = now.key === key ? (now.direction === 'ascending' ? 'descending' : 'ascending') : first;
  return direction === 'descending' ? `-${key}` : key;
}

type DataTableProps<T> = {
  caption: string;
  columns: Column<T>[];
  result: PagedResult<T>;
  loadingLabel: string;
  empty: { icon?: ReactNode; title: string; children?: ReactNode };
  /** Said when the list could not be loaded and the server gave no reason. */
  errorText: string;
  onPage: (page: number) => void;
  sort?: string;
  onSort?: (sort: string) => void;
  toolbar?: ReactNode;
  /** Rendered inside the card after the table (dialogs that act on a row). */
  children?: ReactNode;
};

export function DataTable<T extends { id: string }>({
  caption,
  columns,
  result,
  loadingLabel,
  empty,
  errorText,
  onPage,
  sort,
  onSort,
  toolbar,
  children,
}: DataTableProps<T>) {
  const { data } = result;
  const current = sort === undefined ? null : readSort(sort);
  let body: ReactNode;
  if (result.isPending) {
    body = (
      <div className="p-8 text-center">
        <Spinner label={loadingLabel} />
      </div>
    );
  } else if (!data) {
    body = (
      <p role="alert" className="p-6 text-sm text-bad-800">
        {result.error instanceof ApiError ? result.error.message : errorText}
      </p>
    );
  } else if (data.items.length === 0) {
    body = (
      <EmptyState icon={empty.icon} title={empty.title}>
        {empty.children}
      </EmptyState>
    );
  } else {
    body = (
      <>
        <Table caption={caption}>
          <thead>
            <tr>
              {columns.map((c) => {
                const headerClass = c.headerClassName ?? c.className;
                if (!c.sortKey || !onSort || !current) {
                  return (
                    <Th key={c.key} className={headerClass}>
                      {c.header}
                    </Th>
                  );
                }
                const active = current.key === c.sortKey;
                const Icon = !active ? ArrowUpDown : current.direction === 'ascending' ? ArrowUp : ArrowDown;
                return (
                  <Th key={c.key} aria-sort={active ? current.direction : undefined} className={headerClass}>
                    <button
                      type="button"
                      onClick={() => onSort(nextSort(sort!, c.sortKey!, c.firstSort))}
                      className={cn(
                        // A 44 px target in a header row of the usual height: the negative margins take back the cell's padding.
                        '-mx-1 -my-2.5 inline-flex min-h-11 items-center gap-1 rounded px-1 font-semibold tracking-wide uppercase hover:text-ink-900 focus-visible:ring-2 focus-visible:ring-brand-600 focus-visible:outline-none',
                        active ? 'text-ink-900' : 'text-ink-600',
                      )}
                    >
                      {c.header}
                      <Icon
                        className={cn('size-3.5', active ? 'text-brand-700' : 'text-ink-400')}
                        aria-hidden
                      />
                    </button>
                  </Th>
                );
              })}
            </tr>
          </thead>
          <tbody className="divide-y divide-ink-100">
            {data.items.map((row) => (
              <tr key={row.id}>
                {columns.map((c) => (
                  <Td key={c.key} className={c.className}>
                    {c.cell(row)}
                  </Td>
                ))}
              </tr>
            ))}
          </tbody>
        </Table>
        <Pagination page={data.page} pageSize={data.pageSize} total={data.total} onPage={onPage} />
      </>
    );
  }
  return (
    <Card>
      {toolbar}
      {body}
      {children}
    </Card>
  );
}

/** The filter bar above a table. */
export function TableToolbar({ className, children }: { className?: string; children: ReactNode }) {
  return <div className={cn('border-b border-ink-100 p-3 sm:p-4', className)}>{children}</div>;
}

/**
 * The search box of a list; the label may be for screen readers only where the placeholder says enough. `value`
 * is the applied search: `onChange` is called once typing pauses (or on Enter), not on every key.
 */
export function SearchField({
  label,
  placeholder,
  value,
  onChange,
  hideLabel = false,
  className,
  type = 'search',
}: {
  label: string;
  placeholder: string;
  value: string;
  onChange: (value: string) => void;
  hideLabel?: boolean;
  className?: string;
  /** A plain text box where the screen has always had one. */
  type?: 'search' | 'text';
}) {
  const { text, setText, commit } = useDebouncedText(value, onChange);
  return (
    <InputField
      label={label}
      type={type}
      placeholder={placeholder}
      value={text}
      onChange={(e) => setText(e.target.value)}
      onKeyDown={(e) => {
        if (e.key === 'Enter') commit();
      }}
      hideLabel={hideLabel}
      className={className}
    />
  );
}

/** A select of the list's sorts, for phones, where the table's headers may be scrolled out of view. */
export function SortSelect({
  options,
  value,
  onChange,
}: {
  options: readonly (readonly [string, string])[];
  value: string;
  onChange: (sort: string) => void;
}) {
  return (
    <SelectField label="Sort by" value={value} onChange={(e) => onChange(e.target.value)}>
      {options.map(([v, l]) => (
        <option key={v} value={v}>
          {l}
        </option>
      ))}
    </SelectField>
  );
}

/** A filter select with an "any" choice first. */
export function FilterSelect<V extends string | number>({
  label,
  anyLabel,
  values,
  labelOf,
  value,
  onChange,
}: {
  label: string;
  anyLabel: string;
  values: readonly V[];
  labelOf: (v: V) => string;
  value: string;
  onChange: (value: string) => void;
}) {
  return (
    <SelectField label={label} value={value} onChange={(e) => onChange(e.target.value)}>
      <option value="">{anyLabel}</option>
      {optionsOf(values, labelOf)}
    </SelectField>
  );
}

/**
 * The state of a server-paged list: its page and its filters (sort included), kept in the address so that Back,
 * reload and a shared link show the same list. A value equal to its default stays out of the address; a filter
 * whose default is not empty but is set to "" is written as `key=` (for example "every stage").
 *
 * Changing a filter goes back to the first page and replaces the history entry (typing does not fill the Back
 * button); turning a page adds one, so Back returns to the page before. `params` gives the filters with empty
 * ones left out, ready for the query, and `tableProps` connects the table's sort
 * headers (when there is a `sort` filter) and its pages. `reset` puts every filter at once (a saved view).
 */
export function useListState<F extends Record<string, string>>(defaults: F) {
  const [search, setSearch] = useSearchParams();
  const values = { ...defaults } as F & { page: number };
  for (const key of Object.keys(defaults) as (keyof F & string)[]) {
    const v = search.get(key);
    if (v !== null) (values as Record<string, string>)[key] = v;
  }
  values.page = Math.max(1, Math.trunc(Number(search.get('page'))) || 1);

  const write = (next: URLSearchParams, patch: Partial<F>) => {
    for (const [key, v] of Object.entries(patch)) {
      if (v === undefined || v === defaults[key]) next.delete(key);
      else next.set(key, v);
    }
  };
  const set = (patch: Partial<F>) =>
    setSearch(
      (prev) => {
        const next = new URLSearchParams(prev);
        write(next, patch);
        next.delete('page');
        return next;
      },
      { replace: true },
    );
  const reset = (all: Partial<F>) =>
    setSearch(
      (prev) => {
        const next = new URLSearchParams(prev);
        for (const key of Object.keys(defaults)) next.delete(key);
        next.delete('page');
        write(next, all);
        return next;
      },
      { replace: true },
    );
  const setPage = (page: number) =>
    setSearch((prev) => {
      const next = new URLSearchParams(prev);
      if (page <= 1) next.delete('page');
      else next.set('page', String(page));
      return next;
    });
  const params = Object.fromEntries(Object.entries(values).filter(([, v]) => v !== '')) as Partial<F> & {
    page: number;
  };
  /** Spread on the DataTable: its sort headers and its pages drive this state. */
  const tableProps = {
    sort: (values as { sort?: string }).sort,
    onSort: (sort: string) => set({ sort } as unknown as Partial<F>),
    onPage: setPage,
  };
  return { values, params, set, reset, setPage, tableProps };
}
