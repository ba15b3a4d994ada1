import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { cleanup, fireEvent, render, screen, waitFor } from '@testing-library/react';
import { MemoryRouter, Route, Routes } from 'react-router';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { StartClaimButton } from '../../src/features/claims/components/start-claim';

// "File a claim" tapped twice before the first answer: both requests carry the one Idempotency-Key made when
// the button appeared, so the server (tests/server/claims.api.test.ts) answers one draft. A new start is a new key.

afterEach(cleanup);

const INSTALLATION = '0b0e6f8a-2c41-4f6e-8d3a-5a1f7c9e2b44';
let keys: (string | null)[] = [];
let release: () => void = () => {};

beforeEach(() => {
  keys = [];
  vi.stubGlobal(
    'fetch',
    vi.fn(async (_url: string, init: RequestInit = {}) => {
      keys.push(new Headers(init.headers).get('Idempotency-Key'));
      // Held until the test lets it go, like a slow connection on a lift.
      await new Promise<void>((r) => (release = r));
      return new Response(JSON.stringify({ claim: { id: 'c1' } }), {
        status: 201,
        headers: { 'Content-Type': 'application/json' },
      });
    }),
  );
});
afterEach(() => vi.unstubAllGlobals());

function renderButton() {
  const qc = new QueryClient({ defaultOptions: { queries: { retry: false }, mutations: { retry: false } } });
  return render(
    <QueryClientProvider client={qc}>
      <MemoryRouter initialEntries={['/claims/new']}>
        <Routes>
          <Route path="/claims/new" element={<StartClaimButton installationId={INSTALLATION} />} />
          <Route path="/claims/:id" element={<p>Draft opened</p>} />
        </Routes>
      </MemoryRouter>
    </QueryClientProvider>,
  );
}

describe('StartClaimButton', () => {
  it('sends an Idempotency-Key made once per form start, and opens the draft', async () => {
    renderButton();
    const button = screen.getByRole('button', { name: 'File a claim' });
    fireEvent.click(button);
    fireEvent.click(button);
    await waitFor(() => expect(keys.length).toBeGreaterThanOrEqual(1));
    expect(keys[0]).toMatch(/^draft-[0-9a-f]{32}$/);
    expect(new Set(keys).size).toBe(1);
    release();
    expect(await screen.findByText('Draft opened')).toBeInTheDocument();
    cleanup();
    renderButton();
    fireEvent.click(screen.getByRole('button', { name: 'File a claim' }));
    await waitFor(() => expect(keys.length).toBeGreaterThanOrEqual(2));
    expect(keys.at(-1)).not.toBe(keys[0]);
    release();
  });
});
