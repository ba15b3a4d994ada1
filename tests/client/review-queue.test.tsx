import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { cleanup, render, screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { MemoryRouter, Route, Routes, useLocation, useParams } from 'react-router';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { QueueItemDto } from '../../shared/claims/workflow';
import { ReviewQueue } from '../../src/features/review/components/review-queue';

// The reviewer's queue screen in jsdom. fetch answers with canned pages and records what the screen asked for:
// the filters live in the query string, the server does the filtering (tested in tests/server).

afterEach(cleanup);

const item = (n: number, extra: Partial<QueueItemDto> = {}): QueueItemDto => ({
  id: `00000000-0000-4000-8000-00000000000${n}`,
  number: `LP-2511-AB${n}-CDEF`,
  stage: 'in_review',
  waitingOn: 'manufacturer',
  contractor: { id: 'c1', name: 'Tidewater Electric' },
  product: { id: 'p1', modelNumber: 'TW-HB150', name: 'High-bay 150 W' },
  siteName: `Depot ${n}`,
  units: 1,
  filedAt: '2026-11-01T09:00:00.000Z',
  stageChangedAt: '2026-11-02T09:00:00.000Z',
  daysInStage: n,
  daysSinceFiling: n + 1,
  verdict: 'review',
  expectedCredit: '96.00',
  currency: 'USD',
  assignee: null,
  version: 3,
  ...extra,
});

const PRODUCT_ID = '00000000-0000-4000-8000-0000000000a1';
const CONTRACTOR_ID = '00000000-0000-4000-8000-0000000000c1';
const MANUFACTURER_ID = '00000000-0000-4000-8000-0000000000f1';

let answer: (url: URL) => Response;
/** The queue's requests; the pickers' lists are answered from `lists` and recorded in `looked`. */
const asked: URL[] = [];
const looked: URL[] = [];
const json = (body: unknown) =>
  new Response(JSON.stringify(body), { status: 200, headers: { 'Content-Type': 'application/json' } });
let lists: Record<string, (init?: RequestInit) => Response>;
const page = (items: QueueItemDto[]) =>
  new Response(JSON.stringify({ items, total: items.length, page: 1, pageSize: 25 }), {
    status: 200,
    headers: { 'Content-Type': 'application/json' },
  });

beforeEach(() => {
  asked.length = 0;
  looked.length = 0;
  answer = () => page([item(1), item(2), item(3)]);
  lists = {
    '/api/products': () =>
      json({
        items: [
          { id: PRODUCT_ID, modelNumber: 'TW-HB150', name: 'High-bay 150 W' },
          { id: '00000000-0000-4000-8000-0000000000a2', modelNumber: 'TW-WP40', name: 'Wall pack 40 W' },
        ],
        total: 2,
        page: 1,
        pageSize: 200,
      }),
    '/api/review/contractors': () =>
      json({
        items: [
          { id: CONTRACTOR_ID, name: 'Tidewater Electric' },
          { id: '00000000-0000-4000-8000-0000000000c2', name: 'Harbourline Wiring' },
        ],
        more: false,
      }),
    '/api/saved-views': () => json({ items: [] }),
  };
  vi.stubGlobal(
    'fetch',
    vi.fn(async (input: string, init?: RequestInit) => {
      const url = new URL(input, 'http://lumenproof.test');
      const list = lists[url.pathname];
      if (list) {
        looked.push(url);
        return list(init);
      }
      asked.push(url);
      return answer(url);
    }),
  );
});
afterEach(() => vi.unstubAllGlobals());

function Opened() {
  return <p>Opened claim {useParams().id}</p>;
}

/** Where the router is: the queue keeps its filters in the address. */
let address = '';
function Address() {
  const l = useLocation();
  address = l.search;
  return null;
}

function renderQueue(at = '/review') {
  const client = new QueryClient({ defaultOptions: { queries: { retry: false } } });
  return render(
    <QueryClientProvider client={client}>
      <MemoryRouter initialEntries={[at]}>
        <Address />
        <Routes>
          <Route path="/review" element={<ReviewQueue manufacturerId={MANUFACTURER_ID} />} />
          <Route path="/review/:id" element={<Opened />} />
        </Routes>
      </MemoryRouter>
    </QueryClientProvider>,
  );
}

const lastQuery = () => asked.at(-1)!.searchParams;
/** The filters fold behind one button in the desk's top row. */
const openFilters = (user: ReturnType<typeof userEvent.setup>) =>
  user.click(screen.getByRole('button', { name: /^(Filters|\d+ filters?)$/ }));

describe('the review queue', () => {
  // Many steps, one of them waiting for the search's pause: more than the default 5 s on a busy machine.
  it('asks for the open stages, oldest in its stage first; each filter changes the query', async () => {
    const user = userEvent.setup();
    renderQueue();
    await screen.findByRole('list', { name: 'Claims' });
    expect(asked[0].pathname).toBe('/api/review/queue');
    expect(Object.fromEntries(lastQuery())).toEqual({
      pageSize: '25',
      stage: 'filed,in_review,unit_received,return_requested,needs_info',
      sort: 'stageChangedAt',
    });

    await openFilters(user);
    await user.selectOptions(screen.getByLabelText('Engine verdict'), 'excluded');
    await waitFor(() => expect(lastQuery().get('verdict')).toBe('excluded'));
    await user.selectOptions(screen.getByLabelText('Stage'), 'needs_info');
    await waitFor(() => expect(lastQuery().get('stage')).toBe('needs_info'));
    await user.selectOptions(screen.getByLabelText('Assigned'), 'me');
    await waitFor(() => expect(lastQuery().get('assignee')).toBe('me'));
    await user.selectOptions(screen.getByLabelText('Sort'), '-amount');
    await waitFor(() => expect(lastQuery().get('sort')).toBe('-amount'));
    await user.type(screen.getByLabelText('Search'), 'Depot');
    await waitFor(() => expect(lastQuery().get('q')).toBe('Depot'));
    // Every filter applies together, and a change goes back to the first page (sent without a page).
    expect(Object.fromEntries(lastQuery())).toMatchObject({
      verdict: 'excluded',
      stage: 'needs_info',
      assignee: 'me',
    });
    expect(lastQuery().has('page')).toBe(false);
    // Age since filing and amount: sent once they read as numbers; until then the field says what it needs.
    await user.type(screen.getByLabelText('Filed at least (days ago)'), '30');
    await waitFor(() => expect(lastQuery().get('minAgeDays')).toBe('30'));
    await user.type(screen.getByLabelText('Amount at least'), '75.5x');
    expect(screen.getByText('An amount like 96.00.')).toBeInTheDocument();
    await waitFor(() => expect(lastQuery().get('minAmount')).toBe('75.5'));
    await user.clear(screen.getByLabelText('Amount at least'));
    await waitFor(() => expect(lastQuery().has('minAmount')).toBe(false));
    // "Every stage" and "Any" leave the filter out rather than sending an empty value.
    await user.selectOptions(screen.getByLabelText('Engine verdict'), '');
    await user.selectOptions(screen.getByLabelText('Stage'), '');
    await waitFor(() => expect(lastQuery().has('verdict')).toBe(false));
    expect(lastQuery().has('stage')).toBe(false);
  }, 15_000);

  it('filters by one of the manufacturer’s product models and by a contractor that files with it', async () => {
    const user = userEvent.setup();
    renderQueue();
    await screen.findByRole('list', { name: 'Claims' });
    // The products are the manufacturer's own, in one page the size of the picker.
    const products = looked.find((u) => u.pathname === '/api/products')!;
    expect(Object.fromEntries(products.searchParams)).toEqual({
      manufacturerId: MANUFACTURER_ID,
      pageSize: '200',
      sort: 'modelNumber',
    });
    expect(looked.some((u) => u.pathname === '/api/review/contractors')).toBe(true);

    await openFilters(user);
    const product = screen.getByLabelText('Product');
    await screen.findByRole('option', { name: 'TW-HB150 · High-bay 150 W' });
    await user.selectOptions(product, 'TW-HB150 · High-bay 150 W');
    await waitFor(() => expect(lastQuery().get('productModelId')).toBe(PRODUCT_ID));
    expect(lastQuery().has('page')).toBe(false);

    const contractor = screen.getByLabelText('Contractor');
    await screen.findByRole('option', { name: 'Tidewater Electric' });
    await user.selectOptions(contractor, 'Tidewater Electric');
    await waitFor(() => expect(lastQuery().get('contractorId')).toBe(CONTRACTOR_ID));
    // Both apply together, and "Any" leaves each out again.
    expect(lastQuery().get('productModelId')).toBe(PRODUCT_ID);
    await user.selectOptions(product, 'Any product');
    await waitFor(() => expect(lastQuery().has('productModelId')).toBe(false));
    expect(lastQuery().get('contractorId')).toBe(CONTRACTOR_ID);
    await user.selectOptions(contractor, 'Any contractor');
    await waitFor(() => expect(lastQuery().has('contractorId')).toBe(false));
  });

  it('says when a picker could not be loaded or holds only part of the list; the queue still works', async () => {
    lists['/api/products'] = () =>
      new Response(
        JSON.stringify({ error: { code: 'internal', message: 'Something went wrong on our side.' } }),
        { status: 500, headers: { 'Content-Type': 'application/json' } },
      );
    lists['/api/review/contractors'] = () =>
      json({ items: [{ id: CONTRACTOR_ID, name: 'Tidewater Electric' }], more: true });
    renderQueue();
    await screen.findByRole('list', { name: 'Claims' });
    expect(await screen.findByText('The product list could not be loaded.')).toBeInTheDocument();
    expect(
      await screen.findByText('Only the first 1 contractors by name are listed; search finds the others.'),
    ).toBeInTheDocument();
    expect(screen.getByLabelText('Product')).toHaveAccessibleDescription(
      'The product list could not be loaded.',
    );
  });

  it('moves with j / k and the arrow keys, says where it is, and opens the claim with Enter', async () => {
    const user = userEvent.setup();
    renderQueue();
    const rows = await screen.findAllByRole('link');
    expect(rows).toHaveLength(3);
    // One tab stop for the whole list (roving tabindex): the first row.
    expect(rows.map((r) => r.getAttribute('tabindex'))).toEqual(['0', '-1', '-1']);
    rows[0].focus();
    await user.keyboard('j');
    expect(rows[1]).toHaveFocus();
    expect(rows[1]).toHaveAttribute('aria-current', 'true');
    await user.keyboard('{ArrowDown}');
    expect(rows[2]).toHaveFocus();
    // At the end it stays put.
    await user.keyboard('j');
    expect(rows[2]).toHaveFocus();
    await user.keyboard('k');
    expect(rows[1]).toHaveFocus();
    await user.keyboard('{ArrowUp}{ArrowUp}');
    expect(rows[0]).toHaveFocus();
    await user.keyboard('j');
    expect(screen.getByText(/^2 of 3: claim LP-2511-AB2-CDEF, In review, 2 days$/)).toBeInTheDocument();
    await user.keyboard('{Enter}');
    expect(await screen.findByText(`Opened claim ${item(2).id}`)).toBeInTheDocument();
  });

  it('shows ageing in words: days in the stage, waiting on whom, since filing, and who has it', async () => {
    answer = () =>
      page([
        item(1, {
          waitingOn: 'contractor',
          stage: 'needs_info',
          daysInStage: 1,
          assignee: { id: 'r1', name: 'Rowan' },
        }),
      ]);
    renderQueue();
    const row = await screen.findByRole('link');
    expect(row).toHaveTextContent(
      'Waiting on installer for 1 day, waiting on the installer · filed 2 days ago · Rowan',
    );
    expect(row).toHaveTextContent('Needs a person');
  });

  it('says so when nothing matches', async () => {
    answer = () => page([]);
    renderQueue();
    expect(await screen.findByText('Nothing matches')).toBeInTheDocument();
    expect(screen.queryByRole('list', { name: 'Claims' })).not.toBeInTheDocument();
  });

  it('says so when the queue cannot be loaded', async () => {
    answer = () =>
      new Response(
        JSON.stringify({ error: { code: 'internal', message: 'Something went wrong on our side.' } }),
        {
          status: 500,
          headers: { 'Content-Type': 'application/json' },
        },
      );
    renderQueue();
    expect(
      await screen.findByText('The queue could not be loaded. Try again in a moment.'),
    ).toBeInTheDocument();
  });
});

describe('the queue in the address', () => {
  it('reads its filters and page from the address (reload, Back, a shared link)', async () => {
    renderQueue('/review?verdict=excluded&stage=&q=Depot&minAgeDays=30&page=3');
    await screen.findByRole('list', { name: 'Claims' });
    expect(Object.fromEntries(asked[0].searchParams)).toEqual({
      pageSize: '25',
      verdict: 'excluded',
      q: 'Depot',
      minAgeDays: '30',
      sort: 'stageChangedAt',
      page: '3',
    });
    expect(screen.getByLabelText('Search')).toHaveValue('Depot');
    expect(screen.getByLabelText('Engine verdict')).toHaveValue('excluded');
    expect(screen.getByLabelText('Stage')).toHaveValue(''); // "Every stage", not the default open ones
    expect(screen.getByLabelText('Filed at least (days ago)')).toHaveValue('30');
  });

  it('writes a change of filter into the address and goes back to the first page', async () => {
    const user = userEvent.setup();
    renderQueue('/review?page=2');
    await screen.findByRole('list', { name: 'Claims' });
    await openFilters(user);
    await user.selectOptions(screen.getByLabelText('Assigned'), 'me');
    await waitFor(() => expect(new URLSearchParams(address).get('assignee')).toBe('me'));
    expect(new URLSearchParams(address).has('page')).toBe(false);
    // A default value stays out of the address.
    await user.selectOptions(screen.getByLabelText('Sort'), 'stageChangedAt');
    expect(new URLSearchParams(address).has('sort')).toBe(false);
  });

  it('searches once typing pauses, not on every key', async () => {
    const user = userEvent.setup();
    renderQueue();
    await screen.findByRole('list', { name: 'Claims' });
    await user.type(screen.getByLabelText('Search'), 'Depot 7');
    await waitFor(() => expect(lastQuery().get('q')).toBe('Depot 7'));
    // One request for the whole word: none for "D", "De", … on the way.
    expect(asked.filter((u) => u.searchParams.has('q')).map((u) => u.searchParams.get('q'))).toEqual([
      'Depot 7',
    ]);
    expect(new URLSearchParams(address).get('q')).toBe('Depot 7');
  });
});

describe('the folded filters and saved views', () => {
  it('shows one row with a count of the active filters, and the list right under it', async () => {
    const user = userEvent.setup();
    renderQueue();
    await screen.findByRole('list', { name: 'Claims' });
    const toggle = screen.getByRole('button', { name: 'Filters' });
    expect(toggle).toHaveAttribute('aria-expanded', 'false');
    expect(screen.getByLabelText('Engine verdict')).not.toBeVisible(); // folded away
    await user.click(toggle);
    await user.selectOptions(screen.getByLabelText('Engine verdict'), 'excluded');
    await user.selectOptions(screen.getByLabelText('Assigned'), 'me');
    await user.type(screen.getByLabelText('Amount at least'), '50');
    expect(await screen.findByRole('button', { name: '3 filters' })).toHaveAttribute('aria-expanded', 'true');
    await user.selectOptions(screen.getByLabelText('Engine verdict'), '');
    expect(await screen.findByRole('button', { name: '2 filters' })).toBeInTheDocument();
  });

  it('saves the filters as a named view and applies a saved view with one pick', async () => {
    const views: { id: string; name: string; filters: Record<string, unknown>; createdAt: string }[] = [];
    const sent: unknown[] = [];
    lists['/api/saved-views'] = (init) => {
      if (init?.method === 'POST') {
        const body = JSON.parse(String(init.body));
        sent.push(body);
        const view = {
          id: '00000000-0000-4000-8000-0000000000e1',
          createdAt: '2026-12-01T00:00:00Z',
          ...body,
        };
        views.push(view);
        return new Response(JSON.stringify({ view }), {
          status: 201,
          headers: { 'Content-Type': 'application/json' },
        });
      }
      return json({ items: views });
    };
    const user = userEvent.setup();
    renderQueue();
    await screen.findByRole('list', { name: 'Claims' });
    await openFilters(user);
    await user.selectOptions(screen.getByLabelText('Assigned'), 'me');
    await user.type(screen.getByLabelText('Amount at least'), '40');
    await user.type(screen.getByLabelText('Save these filters as a view'), 'My open, oldest first');
    await user.click(screen.getByRole('button', { name: 'Save view' }));
    await waitFor(() => expect(sent).toHaveLength(1));
    expect(sent[0]).toEqual({
      name: 'My open, oldest first',
      filters: {
        stage: 'filed,in_review,unit_received,return_requested,needs_info',
        sort: 'stageChangedAt',
        assignee: 'me',
        minAmount: '40',
      },
    });
    // Back to every open claim, then the saved view again: its filters come back, the typed ones too.
    await user.selectOptions(await screen.findByLabelText('Saved view'), 'Every open claim');
    await waitFor(() => expect(lastQuery().has('assignee')).toBe(false));
    expect(screen.getByLabelText('Amount at least')).toHaveValue('');
    await user.selectOptions(screen.getByLabelText('Saved view'), 'My open, oldest first');
    await waitFor(() => expect(lastQuery().get('assignee')).toBe('me'));
    expect(lastQuery().get('minAmount')).toBe('40');
    expect(screen.getByLabelText('Amount at least')).toHaveValue('40');
    expect(screen.getByRole('button', { name: '2 filters' })).toBeInTheDocument();
  });
});
