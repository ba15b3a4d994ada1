import { act, cleanup, render, renderHook, screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { useState, type ReactNode } from 'react';
import { MemoryRouter, useLocation, useNavigate } from 'react-router';
import { afterEach, describe, expect, it, vi } from 'vitest';

import type { Paginated } from '../../shared/schemas/users';
import {
  DataTable,
  nextSort,
  readSort,
  SearchField,
  useListState,
  type Column,
  type PagedResult,
} from '../../src/components/ui/data-table';
import { ApiError } from '../../src/lib/api-client';
import { SEARCH_PAUSE_MS } from '../../src/lib/use-debounced-text';

// Vitest runs without globals here, so Testing Library cannot register its own cleanup.
afterEach(cleanup);

type Row = { id: string; name: string; amount: number };
const COLUMNS: Column<Row>[] = [
  { key: 'name', header: 'Name', sortKey: 'name', cell: (r) => r.name },
  { key: 'amount', header: 'Amount', sortKey: 'amount', firstSort: 'descending', cell: (r) => r.amount },
  { key: 'note', header: 'Note', cell: () => '—' },
];
const rows = (n: number): Row[] =>
  Array.from({ length: n }, (_, i) => ({ id: `r${i}`, name: `Row ${i + 1}`, amount: i * 10 }));
const page = (items: Row[], extra: Partial<Paginated<Row>> = {}): PagedResult<Row> => ({
  isPending: false,
  error: null,
  data: { items, total: items.length, page: 1, pageSize: 25, ...extra },
});

/** The table with its sort kept in state, as the screens keep it. */
function Harness({
  result,
  onSort = () => {},
  onPage = () => {},
  initialSort = 'name',
}: {
  result: PagedResult<Row>;
  onSort?: (s: string) => void;
  onPage?: (p: number) => void;
  initialSort?: string;
}) {
  const [sort, setSort] = useState(initialSort);
  return (
    <DataTable
      caption="Test rows"
      columns={COLUMNS}
      result={result}
      loadingLabel="Loading rows"
      empty={{ title: 'No rows match', children: 'Try another search.' }}
      errorText="Could not load rows."
      sort={sort}
      onSort={(s) => {
        setSort(s);
        onSort(s);
      }}
      onPage={onPage}
    />
  );
}

describe('DataTable', () => {
  it('is a real table: a caption, column headers with scope, one row per item', () => {
    render(<Harness result={page(rows(3))} />);
    const table = screen.getByRole('table', { name: 'Test rows' });
    const headers = within(table).getAllByRole('columnheader');
    expect(headers.map((h) => h.textContent)).toEqual(['Name', 'Amount', 'Note']);
    for (const h of headers) expect(h).toHaveAttribute('scope', 'col');
    expect(within(table).getAllByRole('row')).toHaveLength(4); // the header row and three
    expect(within(table).getByRole('cell', { name: 'Row 2' })).toBeInTheDocument();
  });

  it('marks the sorted column with aria-sort and toggles it from its header button, by mouse or keyboard', async () => {
    const user = userEvent.setup();
    const onSort = vi.fn();
    render(<Harness result={page(rows(3))} onSort={onSort} />);
    const header = (name: string) => screen.getByRole('columnheader', { name });
    expect(header('Name')).toHaveAttribute('aria-sort', 'ascending');
    expect(header('Amount')).not.toHaveAttribute('aria-sort');
    // A column that does not sort has no button.
    expect(within(header('Note')).queryByRole('button')).toBeNull();

    await user.click(screen.getByRole('button', { name: 'Name' }));
    expect(onSort).toHaveBeenLastCalledWith('-name');
    expect(header('Name')).toHaveAttribute('aria-sort', 'descending');

    // Another column sorts its own first way (amounts largest first), and the first loses its mark.
    await user.click(screen.getByRole('button', { name: 'Amount' }));
    expect(onSort).toHaveBeenLastCalledWith('-amount');
    expect(header('Amount')).toHaveAttribute('aria-sort', 'descending');
    expect(header('Name')).not.toHaveAttribute('aria-sort');

    // Keyboard: Tab to the header button, Enter and Space press it.
    screen.getByRole('button', { name: 'Amount' }).blur();
    await user.tab();
    expect(screen.getByRole('button', { name: 'Name' })).toHaveFocus();
    await user.keyboard('{Enter}');
    expect(onSort).toHaveBeenLastCalledWith('name');
    await user.keyboard(' ');
    expect(onSort).toHaveBeenLastCalledWith('-name');
    expect(header('Name')).toHaveAttribute('aria-sort', 'descending');
  });

  it('pages: says which rows of how many, and moves with Previous and Next', async () => {
    const user = userEvent.setup();
    const onPage = vi.fn();
    const { rerender } = render(<Harness result={page(rows(25), { total: 60, page: 1 })} onPage={onPage} />);
    const pages = screen.getByRole('navigation', { name: 'Pages' });
    expect(pages).toHaveTextContent('1–25 of 60');
    expect(within(pages).getByRole('button', { name: 'Previous' })).toBeDisabled();
    await user.click(within(pages).getByRole('button', { name: 'Next' }));
    expect(onPage).toHaveBeenLastCalledWith(2);

    rerender(<Harness result={page(rows(10), { total: 60, page: 3 })} onPage={onPage} />);
    expect(pages).toHaveTextContent('51–60 of 60');
    expect(within(pages).getByRole('button', { name: 'Next' })).toBeDisabled();
    await user.click(within(pages).getByRole('button', { name: 'Previous' }));
    expect(onPage).toHaveBeenLastCalledWith(2);
  });

  it('shows the empty state instead of an empty table', () => {
    render(<Harness result={page([])} />);
    expect(screen.getByRole('heading', { name: 'No rows match' })).toBeInTheDocument();
    expect(screen.getByText('Try another search.')).toBeInTheDocument();
    expect(screen.queryByRole('table')).toBeNull();
    expect(screen.queryByRole('navigation', { name: 'Pages' })).toBeNull();
  });

  it('shows loading, then the server reason or its own words when the list cannot be loaded', () => {
    const { rerender } = render(<Harness result={{ isPending: true, error: null }} />);
    expect(screen.getByRole('status')).toHaveTextContent('Loading rows');
    rerender(
      <Harness
        result={{
          isPending: false,
          error: new ApiError(403, 'auth.forbidden', 'You may not see these rows.'),
        }}
      />,
    );
    expect(screen.getByRole('alert')).toHaveTextContent('You may not see these rows.');
    rerender(<Harness result={{ isPending: false, error: new TypeError('Failed to fetch') }} />);
    expect(screen.getByRole('alert')).toHaveTextContent('Could not load rows.');
    expect(screen.queryByRole('table')).toBeNull();
  });
});

describe('sort parameters', () => {
  it('read "-key" as descending and toggle the current column, starting others their own way', () => {
    expect(readSort('-issuedAt')).toEqual({ key: 'issuedAt', direction: 'descending' });
    expect(readSort('name')).toEqual({ key: 'name', direction: 'ascending' });
    expect(nextSort('name', 'name')).toBe('-name');
    expect(nextSort('-name', 'name')).toBe('name');
    expect(nextSort('name', 'amount', 'descending')).toBe('-amount');
    expect(nextSort('-amount', 'name')).toBe('name');
  });
});

describe('useListState: the list in the address', () => {
  const DEFAULTS = { q: '', status: 'active', sort: 'name' };
  /** The hook inside a memory router, with the router's own location and Back at hand. */
  function renderList(at: string) {
    let location = '';
    let back = () => {};
    function Probe() {
      location = useLocation().search;
      const navigate = useNavigate();
      back = () => navigate(-1);
      return null;
    }
    const wrapper = ({ children }: { children: ReactNode }) => (
      <MemoryRouter initialEntries={[at]}>
        <Probe />
        {children}
      </MemoryRouter>
    );
    const hook = renderHook(() => useListState(DEFAULTS), { wrapper });
    return { hook, location: () => location, back: () => act(() => back()) };
  }

  it('reads filters, sort and page from the address, defaults where it says nothing', () => {
    const { hook } = renderList('/things?q=lamp&sort=-name&page=3&other=kept');
    expect(hook.result.current.values).toEqual({ q: 'lamp', status: 'active', sort: '-name', page: 3 });
    expect(hook.result.current.params).toEqual({ q: 'lamp', status: 'active', sort: '-name', page: 3 });
    // "" is a value of its own when the default is not empty ("any status"), and is left out of the query.
    const any = renderList('/things?status=').hook;
    expect(any.result.current.values.status).toBe('');
    expect(any.result.current.params).toEqual({ sort: 'name', page: 1 });
  });

  it('writes a filter into the address, back to page 1, leaving defaults and other parameters alone', () => {
    const { hook, location } = renderList('/things?page=4&other=kept');
    act(() => hook.result.current.set({ q: 'flood', status: '' }));
    expect(new URLSearchParams(location())).toEqual(new URLSearchParams('other=kept&q=flood&status='));
    act(() => hook.result.current.set({ status: 'active', q: '' }));
    expect(location()).toBe('?other=kept');
    expect(hook.result.current.values.page).toBe(1);
  });

  it('adds a history entry per page turned (Back returns to the page before); filters replace theirs', () => {
    const { hook, location, back } = renderList('/things?q=flood');
    act(() => hook.result.current.setPage(2));
    act(() => hook.result.current.setPage(3));
    expect(hook.result.current.values.page).toBe(3);
    back();
    expect(hook.result.current.values).toMatchObject({ q: 'flood', page: 2 });
    act(() => hook.result.current.set({ sort: '-name' }));
    expect(location()).toBe('?q=flood&sort=-name');
    back(); // the filter replaced page 2's entry, so Back goes to the first page
    expect(hook.result.current.values).toMatchObject({ q: 'flood', sort: 'name', page: 1 });
  });

  it('reset puts every filter at once', () => {
    const { hook, location } = renderList('/things?q=lamp&page=2');
    act(() => hook.result.current.reset({ status: '' }));
    expect(location()).toBe('?status=');
  });
});

describe('SearchField', () => {
  it('applies the search once typing pauses, and at once on Enter', async () => {
    const user = userEvent.setup();
    const onChange = vi.fn();
    render(<SearchField label="Search" placeholder="Name" value="" onChange={onChange} />);
    await user.type(screen.getByLabelText('Search'), 'lamp');
    expect(onChange).not.toHaveBeenCalled(); // not on every key
    await waitFor(() => expect(onChange).toHaveBeenCalledWith('lamp'), { timeout: SEARCH_PAUSE_MS * 4 });
    expect(onChange).toHaveBeenCalledTimes(1);
    onChange.mockClear();
    await user.type(screen.getByLabelText('Search'), 's{Enter}');
    expect(onChange).toHaveBeenCalledWith('lamps');
  });
});
