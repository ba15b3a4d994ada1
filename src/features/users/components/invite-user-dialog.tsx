import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { Controller, useForm } from 'react-hook-form';
import type { Role } from '../../../../shared/roles';
import { inviteUserSchema, type InviteUserInput } from '../../../../shared/schemas/users';
import { Button } from '../../../components/ui/button';
import { Dialog } from '../../../components/ui/dialog';
import { InputField } from '../../../components/ui/field';
import { useToast } from '../../../components/ui/toast';
import { ApiError } from '../../../lib/api-client';
import { inviteUser } from '../api/invite-user';
import { userQueries } from '../api/user-queries';
import { RoleCheckboxes } from './role-checkboxes';

export function InviteUserDialog({
  open,
  onClose,
  allowedRoles,
}: {
  open: boolean;
  onClose: () => void;
  allowedRoles: readonly Role[];
}) {
  const qc = useQueryClient();
  const { notify } = useToast();
  const form = useForm<InviteUserInput>({
    resolver: zodResolver(inviteUserSchema),
    defaultValues: { email: '', name: '', roles: [allowedRoles[0]] },
  });
  const mutation = useMutation({
    mutationFn: inviteUser,
    onSuccess: async ({ invitation }) => {
      notify(`Invitation sent to ${invitation.email}.`);
      form.reset();
      onClose();
      await qc.invalidateQueries({ queryKey: userQueries.all });
    },
    onError: (e) => {
      if (e instanceof ApiError) {
        for (const d of e.details) form.setError(d.path as keyof InviteUserInput, { message: d.message });
        if (e.code === 'user.email_taken') form.setError('email', { message: e.message });
      }
    },
  });
  const formError =
    mutation.error instanceof ApiError &&
    !mutation.error.details.length &&
    mutation.error.code !== 'user.email_taken'
      ? mutation.error.message
      : null;

  return (
    <Dialog
      open={open}
      onClose={onClose}
      title="Invite a person"
      description="They get an e-mail with a one-time link to choose a password."
      footer={
        <>
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" form="invite-user" loading={mutation.isPending}>
            Send invitation
          </Button>
        </>
      }
    >
      <form
        id="invite-user"
        noValidate
        className="space-y-4"
        onSubmit={form.handleSubmit((v) => mutation.mutate(v))}
      >
        {formError ? (
          <p role="alert" className="rounded-lg bg-bad-50 px-3 py-2 text-sm text-bad-800">
            {formError}
          </p>
        ) : null}
        <InputField
          label="Name"
          autoComplete="off"
          error={form.formState.errors.name?.message}
          {...form.register('name')}
        />
        <InputField
          label="E-mail"
          type="email"
          autoComplete="off"
          error={form.formState.errors.email?.message}
          {...form.register('email')}
        />
        <Controller
          control={form.control}
          name="roles"
          render={({ field, fieldState }) => (
            <RoleCheckboxes
              allowed={allowedRoles}
              value={field.value}
              onChange={field.onChange}
              error={fieldState.error?.message}
            />
          )}
        />
      </form>
    </Dialog>
  );
}
