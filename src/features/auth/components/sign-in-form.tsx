import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useState, type FormEvent } from 'react';
import { loginSchema } from '../../../../shared/schemas/auth';
import { Button } from '../../../components/ui/button';
import { InputField } from '../../../components/ui/field';
import { ApiError } from '../../../lib/api-client';
import { authQueries } from '../api/auth-queries';
import { login, loginSecondFactor } from '../api/login';
import { secondFactorCodeSchema } from '../../../../shared/schemas/security';

// The first screen anyone loads, so it is kept light: two fields checked with the same shared schema the
// server uses, without a form library.
export function SignInForm({ onSignedIn }: { onSignedIn: () => void }) {
  const qc = useQueryClient();
  const [email, setEmail] = useState('');
  const [password, setPassword] = useState('');
  const [errors, setErrors] = useState<{ email?: string; password?: string }>({});
  const [needsCode, setNeedsCode] = useState(false);
  const [restartNotice, setRestartNotice] = useState<string | null>(null);
  const signedIn = async () => {
    qc.clear();
    await qc.fetchQuery(authQueries.me());
    onSignedIn();
  };
  const mutation = useMutation({
    mutationFn: login,
    onSuccess: async (r) => {
      setRestartNotice(null);
      if ('secondFactor' in r) setNeedsCode(true);
      else await signedIn();
    },
  });
  const error =
    mutation.error instanceof ApiError
      ? mutation.error.message
      : mutation.error
        ? 'Sign-in failed.'
        : restartNotice;

  if (needsCode)
    return (
      <SecondFactorStep
        onSignedIn={signedIn}
        onRestart={(message) => {
          setNeedsCode(false);
          setRestartNotice(message);
        }}
      />
    );

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

/** After the password, for a person with a second factor: a code from the app, or one of the recovery codes. */
function SecondFactorStep({
  onSignedIn,
  onRestart,
}: {
  onSignedIn: () => Promise<void>;
  onRestart: (message: string) => void;
}) {
  const [code, setCode] = useState('');
  const [error, setError] = useState<string | undefined>();
  const mutation = useMutation({
    mutationFn: loginSecondFactor,
    onSuccess: onSignedIn,
    onError: (e) => {
      // Too many wrong codes, or waited too long: the password is asked for again.
      if (e instanceof ApiError && e.code === 'auth.second_factor_not_pending') onRestart(e.message);
      else setError(e instanceof ApiError ? e.message : 'Sign-in failed.');
    },
  });
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = secondFactorCodeSchema.safeParse(code);
    if (!parsed.success) return setError(parsed.error.issues[0].message);
    setError(undefined);
    mutation.mutate(parsed.data);
  };
  return (
    <form noValidate onSubmit={submit} className="space-y-4">
      <p className="text-sm text-ink-700">
        Open your authenticator app and enter the code it shows for Lumenproof.
      </p>
      <InputField
        label="Authentication code"
        name="code"
        inputMode="numeric"
        autoComplete="one-time-code"
        autoFocus
        hint="No phone? Enter one of your recovery codes instead."
        value={code}
        onChange={(e) => setCode(e.target.value)}
        error={error}
      />
      <Button type="submit" size="lg" className="w-full" loading={mutation.isPending}>
        Verify
      </Button>
    </form>
  );
}
