import { useDeferredValue, useMemo } from 'react';

import { safeEvaluateClaim, type Evaluation, type InputIssue } from '../../../../shared/engine';

export interface LiveEvaluation {
  /** The evaluation of the latest input that was valid as a whole; null while the input is incomplete. */
  evaluation: Evaluation | null;
  /** The first validation issues of an incomplete or invalid input (empty when the input is valid). */
  issues: InputIssue[];
  /** True while the shown result is for an older input than the one typed (React is still catching up). */
  pending: boolean;
}

/**
 * Runs the engine in the browser, no network, as the user types. The input goes through React's
 * `useDeferredValue`, so keystrokes render first and the evaluation follows when the device has time: no
 * jank on a phone. Pass a new object when the form changes (as react-hook-form's `useWatch` does); the
 * evaluation is recomputed only when the object changes.
 */
export function useLiveEvaluation(input: unknown, maxIssues = 5): LiveEvaluation {
  const deferred = useDeferredValue(input);
  const result = useMemo(() => safeEvaluateClaim(deferred), [deferred]);
  const issues = useMemo(() => (result.ok ? [] : result.issues.slice(0, maxIssues)), [result, maxIssues]);
  return { evaluation: result.ok ? result.evaluation : null, issues, pending: deferred !== input };
}
