import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { cleanup, render, screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { CreditMemoDto } from '../../shared/schemas/credits';
import { ToastProvider } from '../../src/components/ui/toast';
import { VoidCreditDialog } from '../../src/features/credits/components/void-credit-dialog';

// Issue 16 item 5: a void moves the claim back to approved, so the claim's own queries (its detail, its
// workflow, the lists it is a row of) go stale with the credit lists, not only the credits.

afterEach(cleanup);

const memo = {
  id: '00000000-0000-4000-8000-0000000000d1',
  number: 'CM-2612-0001',
  claim: { id: '00000000-0000-4000-8000-0000000000c1', number: 'LP-2612-7K4-QXM' },
} as CreditMemoDto;
const sent: { url: string; body: unknown }[] = [];

beforeEach(() => {
  sent.length = 0;
  // jsdom has <dialog> but not its modal methods.
  HTMLDialogElement.prototype.showModal ??= function (this: HTMLDialogElement) {
    this.open = true;
  };
  HTMLDialogElement.prototype.close ??= function (this: HTMLDialogElement) {
    this.open = false;
  };
  vi.stubGlobal(
    'fetch',
    vi.fn(async (url: string, init?: RequestInit) => {
      sent.push({ url, body: init?.body ? JSON.parse(String(init.body)) : undefined });
      return new Response(JSON.stringify({ creditMemo: { id: 'r1', number: 'CM-2612-0002' } }), {
        status: 201,
        headers: { 'Content-Type': 'application/json' },
      });
    }),
  );
});
afterEach(() => vi.unstubAllGlobals());

describe('voiding a credit memo', () => {
  it('sends the reason once and marks the credits and the claim’s own queries stale', async () => {
    const qc = new QueryClient({ defaultOptions: { queries: { retry: false, staleTime: Infinity } } });
    const keys = [
      ['claims', 'detail', memo.claim.id],
      ['claims', 'workflow', memo.claim.id],
      ['claims', 'list', { page: 1 }],
      ['credits', 'list', { page: 1 }],
      ['credits', 'balances'],
      ['products', 'list', { page: 1 }], // unrelated: left alone
    ];
    for (const k of keys) qc.setQueryData(k, { cached: true });
    const onClose = vi.fn();
    const user = userEvent.setup();
    render(
      <QueryClientProvider client={qc}>
        <ToastProvider>
          <VoidCreditDialog memo={memo} onClose={onClose} />
        </ToastProvider>
      </QueryClientProvider>,
    );
    // A reason too short is refused before anything is sent.
    await user.type(screen.getByLabelText('Reason for the reversal'), 'no');
    await user.click(screen.getByRole('button', { name: 'Void with reversal' }));
    expect(await screen.findByText(/at least 5 characters/)).toBeInTheDocument();
    expect(sent).toHaveLength(0);

    await user.type(screen.getByLabelText('Reason for the reversal'), 't the unit we approved');
    await user.click(screen.getByRole('button', { name: 'Void with reversal' }));
    await waitFor(() => expect(onClose).toHaveBeenCalled());
    expect(sent).toEqual([
      { url: `/api/credits/${memo.id}/void`, body: { reason: 'not the unit we approved' } },
    ]);
    const stale = (k: unknown[]) => qc.getQueryState(k)?.isInvalidated;
    for (const k of keys.slice(0, 5)) expect(stale(k), JSON.stringify(k)).toBe(true);
    expect(stale(keys[5])).toBe(false);
  });
});
