import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { UserPlus, Users } from 'lucide-react';
import { ROLES_BY_KIND, ROLE_LABELS } from '../../../../shared/roles';
import type { UserDto } from '../../../../shared/schemas/users';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { EmptyState } from '../../../components/ui/empty-state';
import { PageHeader } from '../../../components/ui/page-header';
import { Spinner } from '../../../components/ui/spinner';
import { Pagination, Table, Td, Th } from '../../../components/ui/table';
import { useToast } from '../../../components/ui/toast';
import { ApiError } from '../../../lib/api-client';
import { useSession } from '../../../lib/ability';
import { updateUser } from '../api/update-user';
import { userQueries } from '../api/user-queries';
import { EditUserDialog } from './edit-user-dialog';
import { InviteUserDialog } from './invite-user-dialog';

const STATUS_TONE = { active: 'ok', invited: 'info', disabled: 'neutral' } as const;
const STATUS_TEXT = { active: 'Active', invited: 'Invited', disabled: 'Disabled' } as const;

export function UsersAdmin() {
  const { user: me } = useSession();
  const allowed = ROLES_BY_KIND[me.organization.kind];
  const [page, setPage] = useState(1);
  const [q, setQ] = useState('');
  const [inviting, setInviting] = useState(false);
  const [editing, setEditing] = useState<UserDto | null>(null);
  const qc = useQueryClient();
  const { notify } = useToast();
  const list = useQuery(userQueries.list({ page, q: q || undefined }));
  const setStatus = useMutation({
    mutationFn: (v: { user: UserDto; status: 'active' | 'disabled' }) => updateUser(v.user.id, { status: v.status }),
    onSuccess: async ({ user }) => {
      notify(user.status === 'disabled' ? `${user.name} can no longer sign in.` : `${user.name} can sign in again.`);
      await qc.invalidateQueries({ queryKey: userQueries.all });
    },
    onError: (e) => notify(e instanceof ApiError ? e.message : 'Could not change the account.', 'bad'),
  });

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
      <Card>
        <div className="border-b border-ink-100 p-3 sm:p-4">
          <label htmlFor="people-search" className="sr-only">
            Search people
          </label>
          <input
            id="people-search"
            type="search"
            placeholder="Search by name or e-mail"
            value={q}
            onChange={(e) => {
              setQ(e.target.value);
              setPage(1);
            }}
            className="h-11 w-full rounded-lg border border-ink-300 px-3 text-base sm:max-w-xs sm:text-sm"
          />
        </div>
        {list.isPending ? (
          <div className="p-8 text-center">
            <Spinner label="Loading people" />
          </div>
        ) : list.data && list.data.items.length === 0 ? (
          <EmptyState icon={<Users className="size-6" />} title="Nobody matches">
            Try another name or e-mail.
          </EmptyState>
        ) : list.data ? (
          <>
            <Table caption="People in your organisation">
              <thead>
                <tr>
                  <Th>Name</Th>
                  <Th>Roles</Th>
                  <Th>Status</Th>
                  <Th className="text-right">Actions</Th>
                </tr>
              </thead>
              <tbody className="divide-y divide-ink-100">
                {list.data.items.map((u) => (
                  <tr key={u.id}>
                    <Td>
                      <p className="font-medium text-ink-950">
                        {u.name}
                        {u.id === me.id ? <span className="ml-1 text-xs font-normal text-ink-600">(you)</span> : null}
                      </p>
                      <p className="text-xs text-ink-600">{u.email}</p>
                    </Td>
                    <Td>{u.roles.map((r) => ROLE_LABELS[r]).join(', ')}</Td>
                    <Td>
                      <Badge tone={STATUS_TONE[u.status]}>{STATUS_TEXT[u.status]}</Badge>
                    </Td>
                    <Td className="text-right whitespace-nowrap">
                      <Button variant="ghost" size="sm" onClick={() => setEditing(u)} aria-label={`Change roles of ${u.name}`}>
                        Roles
                      </Button>
                      {u.id !== me.id && u.status === 'active' ? (
                        <Button variant="ghost" size="sm" className="text-bad-700" onClick={() => setStatus.mutate({ user: u, status: 'disabled' })} aria-label={`Disable ${u.name}`}>
                          Disable
                        </Button>
                      ) : null}
                      {u.status === 'disabled' ? (
                        <Button variant="ghost" size="sm" onClick={() => setStatus.mutate({ user: u, status: 'active' })} aria-label={`Enable ${u.name}`}>
                          Enable
                        </Button>
                      ) : null}
                    </Td>
                  </tr>
                ))}
              </tbody>
            </Table>
            <Pagination page={list.data.page} pageSize={list.data.pageSize} total={list.data.total} onPage={setPage} />
          </>
        ) : (
          <p role="alert" className="p-6 text-sm text-bad-800">
            {list.error instanceof ApiError ? list.error.message : 'Could not load people.'}
          </p>
        )}
      </Card>
      <InviteUserDialog open={inviting} onClose={() => setInviting(false)} allowedRoles={allowed} />
      {editing ? <EditUserDialog user={editing} allowedRoles={allowed} onClose={() => setEditing(null)} /> : null}
    </>
  );
}
