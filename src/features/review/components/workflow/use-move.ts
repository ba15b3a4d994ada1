import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { type ClaimActionName } from '../../../../../shared/claims/stages';
import { ApiError } from '../../../../lib/api-client';
import { performClaimAction } from '../../api/perform-claim-action';

export function useMove(claimId: string, version: number) {
  const qc = useQueryClient();
  const [error, setError] = useState<ApiError | null>(null);
  const m = useMutation({
    mutationFn: ({ action, payload }: { action: ClaimActionName; payload: unknown }) =>
      performClaimAction(claimId, action, payload, version),
    onSuccess: () => {
      setError(null);
      return qc.invalidateQueries({ queryKey: ['claims'] });
    },
    onError: (e) => setError(e instanceof ApiError ? e : new ApiError(0, 'unknown', 'Something went wrong.')),
  });
  return {
    run: (action: ClaimActionName, payload: unknown, onDone?: () => void) =>
      m.mutate({ action, payload }, { onSuccess: () => onDone?.() }),
    pending: m.isPending,
    error,
  };
}
