import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { act, cleanup, renderHook, waitFor } from '@testing-library/react';
import type { ReactNode } from 'react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { ClaimDetailDto } from '../../shared/schemas/claims';
import {
  clearLocalDraft,
  readLocalDraft,
  useDraftSync,
} from '../../src/features/claims/hooks/use-draft-sync';

// The draft's offline keeping (src/features/claims/hooks/use-draft-sync.ts) against a small in-memory stand-in
// for the claims API behind fetch: PATCH /api/claims/:id answers the next version, or 409 claim.changed when
// the version sent is not the server's; GET answers the server's copy. The browser test
// (tests/browser/draft-offline.spec.ts) runs the same path against the real server.

afterEach(cleanup);

type Values = { narrative: string };
const CLAIM_ID = '3f6c1b8e-4d2a-4c1e-9a57-0c2f8e6b1d10';
const toFields = (v: Values) => ({ narrative: v.narrative });

let online = true;
let server: {
  version: number;
  narrative: string;
  requests: { method: string; body: Record<string, unknown> | null }[];
  down: boolean;
};

function claimDto(): ClaimDetailDto {
  return { id: CLAIM_ID, version: server.version, narrative: server.narrative } as unknown as ClaimDetailDto;
}

function json(status: number, body: unknown) {
  return new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });
}

beforeEach(() => {
  localStorage.clear();
  online = true;
  Object.defineProperty(window.navigator, 'onLine', { configurable: true, get: () => online });
  server = { version: 3, narrative: '', requests: [], down: false };
  vi.stubGlobal(
    'fetch',
    vi.fn(async (_url: string, init: RequestInit = {}) => {
      const method = init.method ?? 'GET';
      const body = init.body ? (JSON.parse(String(init.body)) as Record<string, unknown>) : null;
      // A dropped connection: fetch itself rejects, as the browser's does.
      if (server.down) throw new TypeError('Failed to fetch');
      server.requests.push({ method, body });
      if (method === 'GET') return json(200, { claim: claimDto() });
      if (body!.version !== server.version) {
        return json(409, { error: { code: 'claim.changed', message: 'This draft was changed elsewhere.' } });
      }
      server.version += 1;
      server.narrative = String(body!.narrative);
      return json(200, { claim: claimDto() });
    }),
  );
});
afterEach(() => {
  vi.unstubAllGlobals();
});

function setup() {
  const qc = new QueryClient({ defaultOptions: { queries: { retry: false } } });
  const wrapper = ({ children }: { children: ReactNode }) => (
    <QueryClientProvider client={qc}>{children}</QueryClientProvider>
  );
  const claim = claimDto();
  return renderHook(() => useDraftSync<Values>(claim, toFields, 5), { wrapper });
}

const patches = () => server.requests.filter((r) => r.method === 'PATCH');

describe('useDraftSync: drafts save as the user goes and survive a lost connection', () => {
  it('keeps each change on the device at once, sends it after a pause with the version it was made on, then forgets it', async () => {
    const { result } = setup();
    act(() => result.current.change({ narrative: 'Two strings dark' }));
    expect(readLocalDraft<Values>(CLAIM_ID)).toMatchObject({
      claimId: CLAIM_ID,
      baseVersion: 3,
      values: { narrative: 'Two strings dark' },
    });
    await waitFor(() => expect(result.current.status).toBe('saved'));
    expect(patches()).toEqual([{ method: 'PATCH', body: { version: 3, narrative: 'Two strings dark' } }]);
    expect(server).toMatchObject({ version: 4, narrative: 'Two strings dark' });
    expect(result.current.version.current).toBe(4);
    expect(readLocalDraft(CLAIM_ID)).toBeNull();
  });

  it('offline: sends nothing and says so, keeps the change on the device, and sends it when the browser is back online', async () => {
    online = false;
    const { result } = setup();
    act(() => result.current.change({ narrative: 'Typed on the lift with no signal' }));
    expect(result.current.status).toBe('offline');
    await new Promise((r) => setTimeout(r, 30));
    expect(patches()).toHaveLength(0);
    expect(result.current.status).toBe('offline');
    expect(readLocalDraft<Values>(CLAIM_ID)?.values.narrative).toBe('Typed on the lift with no signal');

    online = true;
    act(() => window.dispatchEvent(new Event('online')));
    await waitFor(() => expect(result.current.status).toBe('saved'));
    expect(patches()).toEqual([
      { method: 'PATCH', body: { version: 3, narrative: 'Typed on the lift with no signal' } },
    ]);
    expect(server.narrative).toBe('Typed on the lift with no signal');
    expect(readLocalDraft(CLAIM_ID)).toBeNull();
  });

  it('a request lost on the way (the browser still thinks it is online) is kept and sent again on the online event', async () => {
    server.down = true;
    const { result } = setup();
    act(() => result.current.change({ narrative: 'Sent into a dead zone' }));
    await waitFor(() => expect(result.current.status).toBe('offline'));
    expect(readLocalDraft<Values>(CLAIM_ID)?.values.narrative).toBe('Sent into a dead zone');
    server.down = false;
    act(() => window.dispatchEvent(new Event('online')));
    await waitFor(() => expect(result.current.status).toBe('saved'));
    expect(server).toMatchObject({ version: 4, narrative: 'Sent into a dead zone' });
  });

  it('only the latest change goes out when several are made offline, on top of the version they were made on', async () => {
    online = false;
    const { result } = setup();
    for (const n of ['D', 'Dr', 'Driver cycles']) act(() => result.current.change({ narrative: n }));
    online = true;
    act(() => window.dispatchEvent(new Event('online')));
    await waitFor(() => expect(result.current.status).toBe('saved'));
    expect(patches().map((p) => p.body)).toEqual([{ version: 3, narrative: 'Driver cycles' }]);
  });

  it('flush sends what is unsent now and tells whether the server has it all (filing waits on it)', async () => {
    const { result } = setup();
    act(() => result.current.change({ narrative: 'Ready to file' }));
    let ok = false;
    await act(async () => {
      ok = await result.current.flush();
    });
    expect(ok).toBe(true);
    expect(server.narrative).toBe('Ready to file');
    server.down = true;
    act(() => result.current.change({ narrative: 'Changed once more' }));
    await act(async () => {
      ok = await result.current.flush();
    });
    expect(ok).toBe(false);
    expect(readLocalDraft<Values>(CLAIM_ID)?.values.narrative).toBe('Changed once more');
  });

  it('a change made elsewhere meanwhile is a conflict, not an overwrite; "keep mine" sends this device’s change on the latest version', async () => {
    const { result } = setup();
    server.version = 5; // the desk saved the draft twice since this phone opened it
    server.narrative = 'Typed at the desk';
    act(() => result.current.change({ narrative: 'Typed on the phone' }));
    await waitFor(() => expect(result.current.status).toBe('conflict'));
    expect(server.narrative).toBe('Typed at the desk');
    expect(readLocalDraft<Values>(CLAIM_ID)).toMatchObject({
      baseVersion: 3,
      values: { narrative: 'Typed on the phone' },
    });
    await act(() => result.current.keepMine());
    await waitFor(() => expect(result.current.status).toBe('saved'));
    expect(patches().map((p) => p.body)).toEqual([
      { version: 3, narrative: 'Typed on the phone' },
      { version: 5, narrative: 'Typed on the phone' },
    ]);
    expect(server).toMatchObject({ version: 6, narrative: 'Typed on the phone' });
  });

  it('"use the saved draft" after a conflict drops this device’s change and sends nothing', async () => {
    const { result } = setup();
    server.version = 4;
    act(() => result.current.change({ narrative: 'Typed on the phone' }));
    await waitFor(() => expect(result.current.status).toBe('conflict'));
    await act(() => result.current.discardMine());
    expect(result.current.status).toBe('saved');
    expect(readLocalDraft(CLAIM_ID)).toBeNull();
    expect(patches()).toHaveLength(1);
    expect(server.narrative).toBe('');
  });

  it('device storage that cannot be read is treated as empty', () => {
    localStorage.setItem(`lumenproof.claim-draft.${CLAIM_ID}`, '{not json');
    expect(readLocalDraft(CLAIM_ID)).toBeNull();
    clearLocalDraft(CLAIM_ID);
    expect(localStorage.getItem(`lumenproof.claim-draft.${CLAIM_ID}`)).toBeNull();
  });
});
