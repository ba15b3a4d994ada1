import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { KeyRound } from 'lucide-react';
import { useState } from 'react';
import { Controller, useForm } from 'react-hook-form';
import { ROLE_LABELS, ROLES_BY_KIND, type Role } from '../../../../shared/roles';
import {
  createApiTokenSchema,
  type ApiTokenView,
  type CreateApiTokenInput,
} from '../../../../shared/schemas/api-tokens';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { Dialog } from '../../../components/ui/dialog';
import { EmptyState } from '../../../components/ui/empty-state';
import { SelectField } from '../../../components/ui/field';
import { FormError, formErrorText, showFieldErrors, TextField } from '../../../components/ui/form';
import { Spinner } from '../../../components/ui/spinner';
import { Table, Td, Th } from '../../../components/ui/table';
import { useToast } from '../../../components/ui/toast';
import { useSession } from '../../../lib/ability';
import { ApiError } from '../../../lib/api-client';
import { createApiToken, integrationQueries, revokeApiToken } from '../api/integrations';
import { RoleChoice } from './role-choice';
import { SecretOnce } from './secret-once';

const when = (iso: string | null) =>
  iso ? new Date(iso).toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'short' }) : 'Never';
const STATE = {
  active: { tone: 'ok', text: 'Active' },
  expired: { tone: 'neutral', text: 'Expired' },
  revoked: { tone: 'bad', text: 'Revoked' },
} as const;
const EXPIRY_CHOICES = [30, 90, 180, 365];

export function ApiTokensCard() {
  const { user: me } = useSession();
  const allowed = ROLES_BY_KIND[me.organization.kind];
  const [creating, setCreating] = useState(false);
  const qc = useQueryClient();
  const { notify } = useToast();
  const list = useQuery(integrationQueries.tokenList());
  const revoke = useMutation({
    mutationFn: (t: ApiTokenView) => revokeApiToken(t.id),
    onSuccess: async ({ apiToken }) => {
      notify(`${apiToken.name} no longer works.`);
      await qc.invalidateQueries({ queryKey: integrationQueries.tokens });
    },
    onError: (e) => notify(e instanceof ApiError ? e.message : 'Could not revoke the token.', 'bad'),
  });
  const items = list.data?.items ?? [];

  return (
    <Card>
      <CardHeader
        title="API tokens"
        description="For your own systems: each token acts with the roles you give it, sent as Authorization: Bearer."
        actions={
          <Button onClick={() => setCreating(true)} icon={<KeyRound className="size-4" aria-hidden />}>
            New token
          </Button>
        }
      />
      {list.isPending ? (
        <div className="p-6">
          <Spinner label="Loading tokens" />
        </div>
      ) : items.length === 0 ? (
        <EmptyState icon={<KeyRound className="size-5" />} title="No API tokens yet">
          Make one for each system that reads or files claims on your behalf.
        </EmptyState>
      ) : (
        <Table caption="API tokens">
          <thead>
            <tr>
              <Th>Name</Th>
              <Th>Roles</Th>
              <Th>Last used</Th>
              <Th>Expires</Th>
              <Th>State</Th>
              <Th className="text-right">Actions</Th>
            </tr>
          </thead>
          <tbody className="divide-y divide-ink-100">
            {items.map((t) => (
              <tr key={t.id}>
                <Td>
                  <p className="font-medium text-ink-950">{t.name}</p>
                  <p className="font-mono text-xs text-ink-600">{t.hint}…</p>
                </Td>
                <Td>{t.roles.map((r) => ROLE_LABELS[r as Role] ?? r).join(', ')}</Td>
                <Td>{when(t.lastUsedAt)}</Td>
                <Td>{when(t.expiresAt)}</Td>
                <Td>
                  <Badge tone={STATE[t.state].tone}>{STATE[t.state].text}</Badge>
                </Td>
                <Td className="text-right">
                  {t.state === 'active' ? (
                    <Button
                      variant="ghost"
                      size="sm"
                      className="text-bad-700"
                      onClick={() => revoke.mutate(t)}
                      aria-label={`Revoke ${t.name}`}
                    >
                      Revoke
                    </Button>
                  ) : null}
                </Td>
              </tr>
            ))}
          </tbody>
        </Table>
      )}
      <NewTokenDialog open={creating} onClose={() => setCreating(false)} allowedRoles={allowed} />
    </Card>
  );
}

function NewTokenDialog({
  open,
  onClose,
  allowedRoles,
}: {
  open: boolean;
  onClose: () => void;
  allowedRoles: readonly Role[];
}) {
  const qc = useQueryClient();
  const [secret, setSecret] = useState<string | null>(null);
  const form = useForm<CreateApiTokenInput>({
    resolver: zodResolver(createApiTokenSchema),
    defaultValues: { name: '', roles: [allowedRoles[0]], expiresInDays: 90 },
  });
  const mutation = useMutation({
    mutationFn: createApiToken,
    onSuccess: async (r) => {
      setSecret(r.secret);
      form.reset();
      await qc.invalidateQueries({ queryKey: integrationQueries.tokens });
    },
    onError: (e) => showFieldErrors(form, e),
  });
  const close = () => {
    setSecret(null);
    mutation.reset();
    onClose();
  };

  return (
    <Dialog
      open={open}
      onClose={close}
      title={secret ? 'Your new API token' : 'New API token'}
      description={secret ? undefined : 'Give it the fewest roles the system needs.'}
      footer={
        secret ? (
          <Button onClick={close}>Done</Button>
        ) : (
          <>
            <Button variant="secondary" onClick={close}>
              Cancel
            </Button>
            <Button type="submit" form="new-api-token" loading={mutation.isPending}>
              Make token
            </Button>
          </>
        )
      }
    >
      {secret ? (
        <SecretOnce label="API token" secret={secret} />
      ) : (
        <form
          id="new-api-token"
          noValidate
          className="space-y-4"
          onSubmit={form.handleSubmit((v) => mutation.mutate(v))}
        >
          <FormError message={formErrorText(mutation.error)} />
          <TextField
            form={form}
            name="name"
            label="Name"
            hint="What uses it, e.g. “Accounting sync”."
            autoComplete="off"
          />
          <Controller
            control={form.control}
            name="roles"
            render={({ field, fieldState }) => (
              <RoleChoice
                legend="Acts as"
                options={allowedRoles.map((r) => ({ value: r, label: ROLE_LABELS[r] }))}
                value={field.value}
                onChange={field.onChange}
                error={fieldState.error?.message}
              />
            )}
          />
          <SelectField
            label="Expires after"
            error={form.formState.errors.expiresInDays?.message}
            {...form.register('expiresInDays', { valueAsNumber: true })}
          >
            {EXPIRY_CHOICES.map((d) => (
              <option key={d} value={d}>
                {d} days
              </option>
            ))}
          </SelectField>
        </form>
      )}
    </Dialog>
  );
}
