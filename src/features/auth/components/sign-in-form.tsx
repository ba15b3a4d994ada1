import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { loginSchema, type LoginInput } from '../../../../shared/schemas/auth';
import { Button } from '../../../components/ui/button';
import { InputField } from '../../../components/ui/field';
import { ApiError } from '../../../lib/api-client';
import { authQueries } from '../api/auth-queries';
import { login } from '../api/login';

export function SignInForm({ onSignedIn }: { onSignedIn: () => void }) {
  const qc = useQueryClient();
  const form = useForm<LoginInput>({ resolver: zodResolver(loginSchema), defaultValues: { email: '', password: '' } });
  const mutation = useMutation({
    mutationFn: login,
    onSuccess: async () => {
      qc.clear();
      await qc.fetchQuery(authQueries.me());
      onSignedIn();
    },
  });
  const error = mutation.error instanceof ApiError ? mutation.error.message : mutation.error ? 'Sign-in failed.' : null;

  return (
    <form noValidate onSubmit={form.handleSubmit((v) => mutation.mutate(v))} className="space-y-4">
      {error ? (
        <div role="alert" className="rounded-lg border border-bad-200 bg-bad-50 px-3 py-2.5 text-sm font-medium text-bad-800">
          {error}
        </div>
      ) : null}
      <InputField
        label="E-mail"
        type="email"
        autoComplete="username"
        inputMode="email"
        autoCapitalize="none"
        spellCheck={false}
        error={form.formState.errors.email?.message}
        {...form.register('email')}
      />
      <InputField
        label="Password"
        type="password"
        autoComplete="current-password"
        error={form.formState.errors.password?.message}
        {...form.register('password')}
      />
      <Button type="submit" size="lg" className="w-full" loading={mutation.isPending}>
        Sign in
      </Button>
    </form>
  );
}
