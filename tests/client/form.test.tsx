import { cleanup, render, renderHook, screen, act } from '@testing-library/react';
import { useForm } from 'react-hook-form';
import { afterEach, describe, expect, it } from 'vitest';
import {
  apiErrorText,
  FormError,
  formErrorText,
  showFieldErrors,
  TextField,
} from '../../src/components/ui/form';
import { ApiError } from '../../src/lib/api-client';

afterEach(cleanup);

const refused = new ApiError(409, 'user.email_taken', 'Someone already uses that e-mail.');
const invalid = new ApiError(400, 'validation.failed', 'Some values are not valid.', [
  { path: 'name', message: 'Say who it is.' },
  { path: 'unknown', message: 'No such field.' },
]);

describe('the form-wide error', () => {
  it('says what the server said, the fallback when it gave no answer, nothing without an error', () => {
    expect(apiErrorText(refused, 'Try again.')).toBe('Someone already uses that e-mail.');
    expect(apiErrorText(new TypeError('Failed to fetch'), 'Try again.')).toBe('Try again.');
    expect(apiErrorText(null, 'Try again.')).toBeUndefined();
    // Field errors stand beside their fields, not at the top.
    expect(formErrorText(invalid, 'Try again.')).toBeUndefined();
    expect(formErrorText(refused)).toBe('Someone already uses that e-mail.');
  });

  it('is an alert box, and nothing at all without a message', () => {
    const { rerender } = render(<FormError message={undefined} />);
    expect(screen.queryByRole('alert')).toBeNull();
    rerender(
      <FormError message="The link has expired.">{<a href="/forgot-password">Ask again</a>}</FormError>,
    );
    expect(screen.getByRole('alert')).toHaveTextContent('The link has expired.Ask again');
  });
});

describe('TextField and showFieldErrors', () => {
  it('registers the field by name and shows its message, put there from the server’s details', () => {
    const { result } = renderHook(() =>
      useForm<{ name: string; email: string }>({ defaultValues: { name: '', email: '' } }),
    );
    const { rerender } = render(<TextField form={result.current} name="name" label="Name" />);
    const box = screen.getByLabelText('Name');
    expect(box).not.toHaveAttribute('aria-invalid');
    let shown = false;
    act(() => {
      shown = showFieldErrors(result.current, invalid);
    });
    expect(shown).toBe(true);
    rerender(<TextField form={result.current} name="name" label="Name" />);
    expect(box).toHaveAttribute('aria-invalid', 'true');
    expect(box).toHaveAccessibleDescription('Say who it is.');
    // A detail for a field the form does not have is left out; an error without details shows nothing.
    expect(result.current.getFieldState('email').error).toBeUndefined();
    expect(showFieldErrors(result.current, refused)).toBe(false);
  });
});
