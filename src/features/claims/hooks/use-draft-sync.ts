import { useQueryClient } from '@tanstack/react-query';
import { useCallback, useEffect, useRef, useState } from 'react';
import type { ClaimDetailDto, ClaimFieldsInput } from '../../../../shared/schemas/claims';
import { ApiError } from '../../../lib/api-client';
import { updateClaim } from '../api/claim-mutations';
import { claimQueries } from '../api/claim-queries';

// Drafts save to the server as the user goes, so a claim started on a phone can be finished at a desk; and
// nothing typed is lost to a dropped connection: unsent changes stay in this device's storage, keyed by claim and
// the version they were made on, and go out when the browser is back online.

export type SyncStatus = 'saved' | 'saving' | 'offline' | 'conflict' | 'error';
export type LocalDraft<V> = { claimId: string; baseVersion: number; values: V; savedAt: string };

const key = (claimId: string) => `lumenproof.claim-draft.${claimId}`;

export function readLocalDraft<V>(claimId: string): LocalDraft<V> | null {
  try {
    const raw = localStorage.getItem(key(claimId));
    return raw ? (JSON.parse(raw) as LocalDraft<V>) : null;
  } catch {
    return null;
  }
}
export function writeLocalDraft<V>(d: LocalDraft<V>) {
  try {
    localStorage.setItem(key(d.claimId), JSON.stringify(d));
  } catch {
    // Storage full or disabled: the server copy still works while online.
  }
}
export function clearLocalDraft(claimId: string) {
  try {
    localStorage.removeItem(key(claimId));
  } catch {
    /* nothing to clear */
  }
}

export function useDraftSync<V>(
  claim: ClaimDetailDto,
  toFields: (values: V) => ClaimFieldsInput,
  delayMs = 700,
) {
  const qc = useQueryClient();
  const version = useRef(claim.version);
  const pending = useRef<V | null>(null);
  const inFlight = useRef<Promise<void> | null>(null);
  const timer = useRef<ReturnType<typeof setTimeout> | null>(null);
  const [status, setStatusState] = useState<SyncStatus>('saved');
  const statusRef = useRef<SyncStatus>('saved');
  const setStatus = useCallback((next: SyncStatus | ((s: SyncStatus) => SyncStatus)) => {
    statusRef.current = typeof next === 'function' ? next(statusRef.current) : next;
    setStatusState(statusRef.current);
  }, []);
  const [error, setError] = useState<string | null>(null);
  const toFieldsRef = useRef(toFields);
  toFieldsRef.current = toFields;

  const send = useCallback(async (): Promise<void> => {
    if (inFlight.current) {
      await inFlight.current;
      if (pending.current === null) return;
    }
    const values = pending.current;
    if (values === null) return;
    pending.current = null;
    setStatus('saving');
    const run = (async () => {
      try {
        const { claim: saved } = await updateClaim(claim.id, version.current, toFieldsRef.current(values));
        version.current = saved.version;
        qc.setQueryData(claimQueries.detail(claim.id).queryKey, { claim: saved });
        if (pending.current === null) {
          clearLocalDraft(claim.id);
          setStatus('saved');
          setError(null);
        } else {
          writeLocalDraft({
            claimId: claim.id,
            baseVersion: saved.version,
            values: pending.current,
            savedAt: new Date().toISOString(),
          });
        }
      } catch (err) {
        pending.current ??= values;
        if (err instanceof ApiError && err.status === 0) setStatus('offline');
        else if (err instanceof ApiError && err.code === 'claim.changed') setStatus('conflict');
        else {
          setStatus('error');
          setError(err instanceof Error ? err.message : String(err));
        }
      }
    })();
    inFlight.current = run;
    await run;
    inFlight.current = null;
    if (pending.current !== null && statusRef.current !== 'conflict' && statusRef.current !== 'offline')
      scheduleRef.current();
  }, [claim.id, qc, setStatus]);
  const scheduleRef = useRef<() => void>(() => {});

  const schedule = useCallback(() => {
    if (timer.current) clearTimeout(timer.current);
    timer.current = setTimeout(() => {
      timer.current = null;
      if (navigator.onLine === false) {
        setStatus('offline');
        return;
      }
      void send();
    }, delayMs);
  }, [delayMs, send, setStatus]);
  scheduleRef.current = schedule;

  /** Call on every change: kept on the device at once, sent after a pause in typing. */
  const change = useCallback(
    (values: V) => {
      pending.current = values;
      writeLocalDraft({
        claimId: claim.id,
        baseVersion: version.current,
        values,
        savedAt: new Date().toISOString(),
      });
      if (navigator.onLine === false) setStatus('offline');
      else setStatus((s) => (s === 'conflict' ? s : 'saving'));
      schedule();
    },
    [claim.id, schedule, setStatus],
  );

  /** Sends whatever is unsent now (before filing). Resolves true when the server has it all. */
  const flush = useCallback(async () => {
    if (timer.current) {
      clearTimeout(timer.current);
      timer.current = null;
    }
    await send();
    if (inFlight.current) await inFlight.current;
    return pending.current === null;
  }, [send]);

  /** After a conflict: take the server's latest version and send this device's changes on top of it. */
  const keepMine = useCallback(async () => {
    const fresh = await qc.fetchQuery({ ...claimQueries.detail(claim.id), staleTime: 0 });
    version.current = fresh.claim.version;
    setStatus('saving');
    await send();
  }, [claim.id, qc, send, setStatus]);

  /** After a conflict: drop this device's unsent changes. */
  const discardMine = useCallback(async () => {
    pending.current = null;
    clearLocalDraft(claim.id);
    await qc.invalidateQueries({ queryKey: claimQueries.detail(claim.id).queryKey });
    setStatus('saved');
  }, [claim.id, qc, setStatus]);

  useEffect(() => {
    const online = () => {
      if (pending.current !== null) void send();
    };
    const offline = () => setStatus('offline');
    window.addEventListener('online', online);
    window.addEventListener('offline', offline);
    return () => {
      window.removeEventListener('online', online);
      window.removeEventListener('offline', offline);
      if (timer.current) clearTimeout(timer.current);
    };
  }, [send, setStatus]);

  return { status, error, change, flush, keepMine, discardMine, version };
}
