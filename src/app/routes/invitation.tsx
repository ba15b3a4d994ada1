import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { Link, useParams } from 'react-router';
import { acceptInvitationSchema, type AcceptInvitationInput } from '../../../shared/schemas/auth';
import { Logo } from '../../components/layout/logo';
import { Button, buttonClasses } from '../../components/ui/button';
import { Card } from '../../components/ui/card';
import { apiErrorText, FormError, TextField } from '../../components/ui/form';
import { Spinner } from '../../components/ui/spinner';
import { acceptInvitation, getInvitation } from '../../features/auth/api/invitations';
import { ApiError } from '../../lib/api-client';

export function InvitationRoute() {
  const { token = '' } = useParams();
  const invitation = useQuery({
    queryKey: ['invitations', token],
    queryFn: () => getInvitation(token),
    retry: false,
  });
  const form = useForm<AcceptInvitationInput>({
    resolver: zodResolver(acceptInvitationSchema),
    defaultValues: { password: '' },
  });
  const accept = useMutation({ mutationFn: (v: AcceptInvitationInput) => acceptInvitation(token, v) });

  return (
    <main className="flex min-h-dvh flex-col items-center justify-center bg-gradient-to-b from-brand-50 to-ink-50 px-4 py-10">
      <div className="w-full max-w-sm">
        <div className="mb-6 text-center">
          <Logo className="text-2xl text-ink-950" />
        </div>
        <Card className="p-5 sm:p-6">
          {invitation.isPending ? (
            <Spinner label="Checking your link" />
          ) : invitation.isError ? (
            <div role="alert">
              <h1 className="text-lg font-semibold text-ink-950">This link does not work</h1>
              <p className="mt-2 text-sm text-ink-600">
                {invitation.error instanceof ApiError
                  ? invitation.error.message
                  : 'The invitation could not be loaded.'}
              </p>
            </div>
          ) : accept.isSuccess ? (
            <div role="status">
              <h1 className="text-lg font-semibold text-ink-950">You are in</h1>
              <p className="mt-2 text-sm text-ink-600">
                Your password is set. Sign in with {accept.data.email}.
              </p>
              <Link to="/sign-in" className={buttonClasses('primary', 'lg', 'mt-5 w-full')}>
                Sign in
              </Link>
            </div>
          ) : (
            <>
              <h1 className="text-lg font-semibold text-ink-950">
                Join {invitation.data.invitation.organization.name}
              </h1>
              <p className="mt-1 mb-4 text-sm text-ink-600">
                Choose a password for {invitation.data.invitation.email}. Use at least 12 characters; a short
                sentence works well.
              </p>
              <form noValidate className="space-y-4" onSubmit={form.handleSubmit((v) => accept.mutate(v))}>
                <FormError message={apiErrorText(accept.error, 'Could not save the password.')} />
                <TextField
                  form={form}
                  name="password"
                  label="New password"
                  type="password"
                  autoComplete="new-password"
                />
                <Button type="submit" size="lg" className="w-full" loading={accept.isPending}>
                  Set password
                </Button>
              </form>
            </>
          )}
        </Card>
      </div>
    </main>
  );
}
