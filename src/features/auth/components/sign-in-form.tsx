import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useState, type FormEvent } from 'react';
import { loginSchema } from '../../../../shared/schemas/auth';
import { Button } from '../../../components/ui/button';
import { InputField } from '../../../components/ui/field';
import { ApiError } from '../../../lib/api-client';
import { authQueries } from '../api/auth-queries';
import { login } from '../api/login';

// The first screen anyone loads, so it is kept light: two fields checked with the same shared schema the
// server uses, without a form library.
export function SignInForm({ onSignedIn }: { onSignedIn: () => void }) {
  const qc = useQueryClient();
  const [email, setEmail] = useState('');
  const [password, setPassword] = useState('');
  const [errors, setErrors] = useState<{ email?: string; password?: string }>({});
  const mutation = useMutation({
    mutationFn: login,
    onSuccess: async () => {
      qc.clear();
      await qc.fetchQuery(authQueries.me());
      onSignedIn();
    },
  });
  const error =
    mutation.error instanceof ApiError ? mutation.error.message : mutation.error ? 'Sign-in failed.' : null;

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = loginSchema.safeParse({ email, password });
    if (!parsed.success) {
      const next: typeof errors = {};
      for (const issue of parsed.error.issues) {
        const key = issue.path[0] as 'email' | 'password';
        next[key] ??= issue.message;
      }
      setErrors(next);
      return;
    }
    setErrors({});
    mutation.mutate(parsed.data);
  };

  return (
    <form noValidate onSubmit={submit} className="space-y-4">
      {error ? (
        <div
          role="alert"
          className="rounded-lg border border-bad-200 bg-bad-50 px-3 py-2.5 text-sm font-medium text-bad-800"
        >
          {error}
        </div>
      ) : null}
      <InputField
        label="E-mail"
        type="email"
        name="email"
        autoComplete="username"
        inputMode="email"
        autoCapitalize="none"
        spellCheck={false}
        value={email}
        onChange={(e) => setEmail(e.target.value)}
        error={errors.email}
      />
      <InputField
        label="Password"
        type="password"
        name="password"
        autoComplete="current-password"
        value={password}
        onChange={(e) => setPassword(e.target.value)}
        error={errors.password}
      />
      <Button type="submit" size="lg" className="w-full" loading={mutation.isPending}>
        Sign in
      </Button>
    </form>
  );
}
