import { cleanup, render, renderHook, screen, within } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';

import { evaluateClaim } from '../../shared/engine';
import { EvaluationPanel } from '../../src/features/evaluation/components/evaluation-panel';
import { useLiveEvaluation } from '../../src/features/evaluation/hooks/use-live-evaluation';
import { baseInput, makeInput } from '../shared/engine/factory';

// Vitest runs without globals here, so Testing Library cannot register its own cleanup.
afterEach(cleanup);

describe('EvaluationPanel', () => {
  it('announces the verdict and lists findings by category with severity text and sources', () => {
    const evaluation = evaluateClaim(makeInput({ claim: { measurements: { supplyVolts: 131 } } }));
    render(<EvaluationPanel evaluation={evaluation} />);

    expect(screen.getByRole('heading', { name: 'Engine evaluation' })).toBeInTheDocument();
    const status = screen.getByRole('status');
    expect(status).toHaveAttribute('aria-live', 'polite');
    expect(status).toHaveTextContent('Likely covered');

    const application = screen.getByRole('region', { name: 'Application' });
    const items = within(application).getAllByRole('listitem');
    const outside = items.find((li) => li.textContent?.includes('131 V'))!;
    expect(outside).toHaveTextContent('Check'); // severity in words, not colour only
    expect(outside).toHaveTextContent('Source: ANSI C84.1, Table 1');
    expect(screen.getByRole('region', { name: 'Coverage' })).toBeInTheDocument();

    const values = screen.getByRole('region', { name: 'Computed values' });
    expect(within(values).getByText('Driver output').nextSibling).toHaveTextContent('19.4 W');
    expect(within(values).getByText('Driver efficiency').nextSibling).toHaveTextContent('82.8 %');
    expect(within(values).getByText('Operating hours').nextSibling).toHaveTextContent('6,144 h');
    expect(within(values).getByText('Credit').nextSibling).toHaveTextContent('192.00 USD');
  });

  it('says why an excluded claim is excluded', () => {
    const evaluation = evaluateClaim(makeInput({ installation: { location: 'wet' } }));
    render(<EvaluationPanel evaluation={evaluation} />);
    expect(screen.getByRole('status')).toHaveTextContent('Likely excluded');
    const item = screen.getByText(/Installed in a wet location/).closest('li')!;
    expect(item).toHaveTextContent('Fail');
    expect(item).toHaveTextContent('Excludes the claim.');
    expect(item).toHaveTextContent('NFPA 70 (NEC) Article 100 and 410.10(A)');
  });

  it('prompts for input when there is no evaluation yet, and shows when it is catching up', () => {
    const { rerender } = render(<EvaluationPanel evaluation={null} />);
    expect(screen.getByRole('status')).toHaveTextContent('Fill in the claim to see the evaluation.');
    expect(screen.queryByRole('listitem')).toBeNull();
    rerender(<EvaluationPanel evaluation={evaluateClaim(baseInput())} pending />);
    expect(screen.getByRole('status')).toHaveTextContent('Updating…');
  });
});

describe('useLiveEvaluation', () => {
  it('evaluates a valid input locally and answers the first issues of a partial one', () => {
    const { result, rerender } = renderHook(({ input }) => useLiveEvaluation(input), {
      initialProps: { input: baseInput() as unknown },
    });
    expect(result.current.evaluation?.verdict).toBe('covered');
    expect(result.current.issues).toEqual([]);

    rerender({ input: { product: baseInput().product } });
    expect(result.current.evaluation).toBeNull();
    expect(result.current.issues.map((i) => i.path)).toEqual(['policy', 'installation', 'claim']);
    expect(result.current.pending).toBe(false);
  });
});
