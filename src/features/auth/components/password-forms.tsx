import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { Link } from 'react-router';
import {
  changePasswordFormSchema,
  forgotPasswordSchema,
  PASSWORD_MIN_LENGTH,
  PASSWORD_RESET_MINUTES,
  resetPasswordFormSchema,
  type ChangePasswordForm,
  type ForgotPasswordInput,
  type ResetPasswordForm,
} from '../../../../shared/schemas/auth';
import { Button, buttonClasses } from '../../../components/ui/button';
import {
  apiErrorText,
  FormError,
  formErrorText,
  showFieldErrors,
  TextField,
} from '../../../components/ui/form';
import { ApiError } from '../../../lib/api-client';
import { changePassword, requestPasswordReset, resetPassword } from '../api/passwords';

const PASSWORD_HINT = `At least ${PASSWORD_MIN_LENGTH} characters, and not a commonly used password. A short sentence works well.`;

export function ForgotPasswordForm() {
  const form = useForm<ForgotPasswordInput>({
    resolver: zodResolver(forgotPasswordSchema),
    defaultValues: { email: '' },
  });
  const send = useMutation({ mutationFn: requestPasswordReset });

  if (send.isSuccess) {
    return (
      <div role="status" className="space-y-3 text-sm text-ink-700">
        <p>{send.data.message}</p>
        <p>
          Nothing after a few minutes? Look in your spam folder, or ask your organisation’s administrator.
        </p>
        <Link to="/sign-in" className={buttonClasses('secondary', 'lg', 'w-full')}>
          Back to sign in
        </Link>
      </div>
    );
  }
  return (
    <form noValidate className="space-y-4" onSubmit={form.handleSubmit((v) => send.mutate(v))}>
      <p className="text-sm text-ink-600">
        Enter the e-mail address you sign in with. We will send a link to choose a new password; it works
        once, for {PASSWORD_RESET_MINUTES} minutes.
      </p>
      <FormError message={apiErrorText(send.error, 'The request could not be sent. Try again.')} />
      <TextField
        form={form}
        name="email"
        label="E-mail"
        type="email"
        autoComplete="username"
        inputMode="email"
        autoCapitalize="none"
        spellCheck={false}
      />
      <Button type="submit" size="lg" className="w-full" loading={send.isPending}>
        Send the link
      </Button>
    </form>
  );
}

export function ResetPasswordForm({ token }: { token: string }) {
  const form = useForm<ResetPasswordForm>({
    resolver: zodResolver(resetPasswordFormSchema),
    defaultValues: { password: '', repeat: '' },
  });
  const reset = useMutation({
    mutationFn: (v: ResetPasswordForm) => resetPassword({ token, password: v.password }),
    onError: (err) => showFieldErrors(form, err),
  });

  if (reset.isSuccess) {
    return (
      <div role="status">
        <p className="text-sm text-ink-700">
          Your new password is set, and your account was signed out everywhere. Sign in with{' '}
          {reset.data.email}.
        </p>
        <Link to="/sign-in" className={buttonClasses('primary', 'lg', 'mt-5 w-full')}>
          Sign in
        </Link>
      </div>
    );
  }
  const linkGone = reset.error instanceof ApiError && reset.error.status === 404;
  return (
    <form noValidate className="space-y-4" onSubmit={form.handleSubmit((v) => reset.mutate(v))}>
      <FormError message={formErrorText(reset.error, 'The password could not be saved.')}>
        {linkGone ? (
          <Link to="/forgot-password" className="mt-1 inline-block font-semibold underline">
            Ask for a new link
          </Link>
        ) : null}
      </FormError>
      <TextField
        form={form}
        name="password"
        label="New password"
        type="password"
        autoComplete="new-password"
        hint={PASSWORD_HINT}
      />
      <TextField
        form={form}
        name="repeat"
        label="New password again"
        type="password"
        autoComplete="new-password"
      />
      <Button type="submit" size="lg" className="w-full" loading={reset.isPending}>
        Set the new password
      </Button>
    </form>
  );
}

export function ChangePasswordForm() {
  const form = useForm<ChangePasswordForm>({
    resolver: zodResolver(changePasswordFormSchema),
    defaultValues: { currentPassword: '', password: '', repeat: '' },
  });
  const change = useMutation({
    mutationFn: (v: ChangePasswordForm) =>
      changePassword({ currentPassword: v.currentPassword, newPassword: v.password }),
    onSuccess: () => form.reset(),
    onError: (err) => showFieldErrors(form, err, { newPassword: 'password' }),
  });
  return (
    <form
      noValidate
      className="max-w-md space-y-4"
      onSubmit={form.handleSubmit((v) => change.mutate(v))}
      aria-labelledby="change-password-heading"
    >
      <h2 id="change-password-heading" className="text-base font-semibold text-ink-950">
        Change password
      </h2>
      {change.isSuccess ? (
        <p role="status" className="rounded-lg bg-brand-50 px-3 py-2 text-sm text-brand-800">
          Your password is changed. Your account was signed out on your other devices; you stay signed in
          here.
        </p>
      ) : null}
      <FormError message={formErrorText(change.error, 'The password could not be changed.')} />
      <TextField
        form={form}
        name="currentPassword"
        label="Current password"
        type="password"
        autoComplete="current-password"
      />
      <TextField
        form={form}
        name="password"
        label="New password"
        type="password"
        autoComplete="new-password"
        hint={PASSWORD_HINT}
      />
      <TextField
        form={form}
        name="repeat"
        label="New password again"
        type="password"
        autoComplete="new-password"
      />
      <Button type="submit" loading={change.isPending}>
        Change password
      </Button>
    </form>
  );
}
