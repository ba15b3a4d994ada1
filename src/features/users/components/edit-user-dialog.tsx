import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import type { Role } from '../../../../shared/roles';
import type { UserDto } from '../../../../shared/schemas/users';
import { Button } from '../../../components/ui/button';
import { Dialog } from '../../../components/ui/dialog';
import { useToast } from '../../../components/ui/toast';
import { ApiError } from '../../../lib/api-client';
import { updateUser } from '../api/update-user';
import { userQueries } from '../api/user-queries';
import { RoleCheckboxes } from './role-checkboxes';

export function EditUserDialog({
  user,
  onClose,
  allowedRoles,
}: {
  user: UserDto;
  onClose: () => void;
  allowedRoles: readonly Role[];
}) {
  const qc = useQueryClient();
  const { notify } = useToast();
  const [roles, setRoles] = useState<Role[]>(user.roles);
  const mutation = useMutation({
    mutationFn: () => updateUser(user.id, { roles }),
    onSuccess: async () => {
      notify(`Roles of ${user.name} saved.`);
      onClose();
      await qc.invalidateQueries({ queryKey: userQueries.all });
    },
  });
  const err = mutation.error instanceof ApiError ? mutation.error : null;
  return (
    <Dialog
      open
      onClose={onClose}
      title={`Roles of ${user.name}`}
      description={user.email}
      footer={
        <>
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button
            onClick={() => mutation.mutate()}
            loading={mutation.isPending}
            disabled={roles.length === 0}
          >
            Save roles
          </Button>
        </>
      }
    >
      {err ? (
        <p role="alert" className="mb-3 rounded-lg bg-bad-50 px-3 py-2 text-sm text-bad-800">
          {err.details[0]?.message ?? err.message}
        </p>
      ) : null}
      <RoleCheckboxes
        allowed={allowedRoles}
        value={roles}
        onChange={setRoles}
        error={roles.length === 0 ? 'Give the user at least one role.' : undefined}
      />
    </Dialog>
  );
}
