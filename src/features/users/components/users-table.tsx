import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { UserPlus, Users } from 'lucide-react';
import { ROLES_BY_KIND, ROLE_LABELS } from '../../../../shared/roles';
import type { UserDto } from '../../../../shared/schemas/users';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import {
  DataTable,
  SearchField,
  TableToolbar,
  useListState,
  type Column,
} from '../../../components/ui/data-table';
import { PageHeader } from '../../../components/ui/page-header';
import { useToast } from '../../../components/ui/toast';
import { ApiError } from '../../../lib/api-client';
import { useSession } from '../../../lib/ability';
import { resetSecondFactor } from '../api/reset-second-factor';
import { updateUser } from '../api/update-user';
import { userQueries } from '../api/user-queries';
import { EditUserDialog } from './edit-user-dialog';
import { InviteUserDialog } from './invite-user-dialog';

const STATUS_TONE = { active: 'ok', invited: 'info', disabled: 'neutral' } as const;
const STATUS_TEXT = { active: 'Active', invited: 'Invited', disabled: 'Disabled' } as const;

export function UsersAdmin() {
  const { user: me } = useSession();
  const allowed = ROLES_BY_KIND[me.organization.kind];
  const { values, params, set, tableProps } = useListState({ q: '', sort: 'name' });
  const [inviting, setInviting] = useState(false);
  const [editing, setEditing] = useState<UserDto | null>(null);
  const qc = useQueryClient();
  const { notify } = useToast();
  const list = useQuery(userQueries.list(params));
  const setStatus = useMutation({
    mutationFn: (v: { user: UserDto; status: 'active' | 'disabled' }) =>
      updateUser(v.user.id, { status: v.status }),
    onSuccess: async ({ user }) => {
      notify(
        user.status === 'disabled'
          ? `${user.name} can no longer sign in.`
          : `${user.name} can sign in again.`,
      );
      await qc.invalidateQueries({ queryKey: userQueries.all });
    },
    onError: (e) => notify(e instanceof ApiError ? e.message : 'Could not change the account.', 'bad'),
  });

  const resetFactor = useMutation({
    mutationFn: (u: UserDto) => resetSecondFactor(u.id),
    onSuccess: (_r, u) => notify(`${u.name} sets up a second factor again at their next sign-in.`),
    onError: (e) => notify(e instanceof ApiError ? e.message : 'Could not reset the second factor.', 'bad'),
  });

  const columns: Column<UserDto>[] = [
    {
      key: 'name',
      header: 'Name',
      sortKey: 'name',
      cell: (u) => (
        <>
          <p className="font-medium text-ink-950">
            {u.name}
            {u.id === me.id ? <span className="ml-1 text-xs font-normal text-ink-600">(you)</span> : null}
          </p>
          <p className="text-xs text-ink-600">{u.email}</p>
        </>
      ),
    },
    { key: 'roles', header: 'Roles', cell: (u) => u.roles.map((r) => ROLE_LABELS[r]).join(', ') },
    {
      key: 'status',
      header: 'Status',
      cell: (u) => <Badge tone={STATUS_TONE[u.status]}>{STATUS_TEXT[u.status]}</Badge>,
    },
    {
      key: 'actions',
      header: 'Actions',
      className: 'text-right whitespace-nowrap',
      headerClassName: 'text-right',
      cell: (u) => (
        <>
          <Button
            variant="ghost"
            size="sm"
            onClick={() => setEditing(u)}
            aria-label={`Change roles of ${u.name}`}
          >
            Roles
          </Button>
          {u.id !== me.id && u.status === 'active' ? (
            <Button
              variant="ghost"
              size="sm"
              className="text-bad-700"
              onClick={() => setStatus.mutate({ user: u, status: 'disabled' })}
              aria-label={`Disable ${u.name}`}
            >
              Disable
            </Button>
          ) : null}
          {u.id !== me.id && u.status === 'active' ? (
            <Button
              variant="ghost"
              size="sm"
              onClick={() => {
                if (
                  window.confirm(
                    `Reset the second factor of ${u.name}? Their authenticator app stops working here.`,
                  )
                )
                  resetFactor.mutate(u);
              }}
              aria-label={`Reset second factor of ${u.name}`}
            >
              Reset second factor
            </Button>
          ) : null}
          {u.status === 'disabled' ? (
            <Button
              variant="ghost"
              size="sm"
              onClick={() => setStatus.mutate({ user: u, status: 'active' })}
              aria-label={`Enable ${u.name}`}
            >
              Enable
            </Button>
          ) : null}
        </>
      ),
    },
  ];

  return (
    <>
      <PageHeader
        title="People"
        description={`Everyone at ${me.organization.name} who can sign in to Lumenproof.`}
        actions={
          <Button onClick={() => setInviting(true)} icon={<UserPlus className="size-4" aria-hidden />}>
            Invite a person
          </Button>
        }
      />
      <DataTable
        caption="People in your organisation"
        columns={columns}
        result={list}
        loadingLabel="Loading people"
        empty={{
          icon: <Users className="size-6" />,
          title: 'Nobody matches',
          children: 'Try another name or e-mail.',
        }}
        errorText="Could not load people."
        {...tableProps}
        toolbar={
          <TableToolbar>
            <SearchField
              label="Search people"
              hideLabel
              placeholder="Search by name or e-mail"
              value={values.q}
              onChange={(q) => set({ q })}
              className="sm:max-w-xs"
            />
          </TableToolbar>
        }
      />
      <InviteUserDialog open={inviting} onClose={() => setInviting(false)} allowedRoles={allowed} />
      {editing ? (
        <EditUserDialog user={editing} allowedRoles={allowed} onClose={() => setEditing(null)} />
      ) : null}
    </>
  );
}
