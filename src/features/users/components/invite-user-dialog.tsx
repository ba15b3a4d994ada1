import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { Controller, useForm } from 'react-hook-form';
import type { Role } from '../../../../shared/roles';
import { inviteUserSchema, type InviteUserInput } from '../../../../shared/schemas/users';
import { Button } from '../../../components/ui/button';
import { Dialog } from '../../../components/ui/dialog';
import { FormError, formErrorText, showFieldErrors, TextField } from '../../../components/ui/form';
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
      showFieldErrors(form, e);
      if (e instanceof ApiError && e.code === 'user.email_taken')
        form.setError('email', { message: e.message });
    },
  });
  // A taken e-mail is said beside the e-mail field.
  const formError =
    mutation.error instanceof ApiError && mutation.error.code === 'user.email_taken'
      ? undefined
      : formErrorText(mutation.error);

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
        <FormError message={formError} />
        <TextField form={form} name="name" label="Name" autoComplete="off" />
        <TextField form={form} name="email" label="E-mail" type="email" autoComplete="off" />
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
