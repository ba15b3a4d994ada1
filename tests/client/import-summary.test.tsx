import { cleanup, render, screen } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import { ImportSummary } from '../../src/features/catalogue/components/import-dialog';

afterEach(cleanup);

const result = (o: { dryRun: boolean; total: number; valid: number; invalid: number; imported: number }) => ({
  ...o,
  errors: [],
  errorsTruncated: false,
});

describe('the import summary', () => {
  it('counts rows in words that agree with their numbers', () => {
    render(<ImportSummary result={result({ dryRun: true, total: 4, valid: 3, invalid: 1, imported: 0 })} />);
    expect(screen.getByRole('status').textContent).toBe(
      '4 rows read: 3 can be imported, 1 has problems and will be left out.',
    );
    cleanup();
    render(<ImportSummary result={result({ dryRun: true, total: 1, valid: 0, invalid: 1, imported: 0 })} />);
    expect(screen.getByRole('status').textContent).toBe(
      '1 row read: 0 can be imported, 1 has problems and will be left out.',
    );
    cleanup();
    render(
      <ImportSummary
        result={result({ dryRun: false, total: 2_500, valid: 2_497, invalid: 3, imported: 2_497 })}
      />,
    );
    expect(screen.getByRole('status').textContent).toBe('2,497 rows imported; 3 left out.');
    cleanup();
    render(<ImportSummary result={result({ dryRun: false, total: 1, valid: 1, invalid: 0, imported: 1 })} />);
    expect(screen.getByRole('status').textContent).toBe('1 row imported.');
  });
});
