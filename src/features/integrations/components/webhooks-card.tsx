import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Webhook } from 'lucide-react';
import { useState } from 'react';
import { Controller, useForm } from 'react-hook-form';
import {
  createWebhookSchema,
  WEBHOOK_EVENT_LABELS,
  WEBHOOK_EVENTS,
  type CreateWebhookInput,
  type WebhookEndpointView,
  type WebhookEvent,
} from '../../../../shared/schemas/webhooks';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { Dialog } from '../../../components/ui/dialog';
import { EmptyState } from '../../../components/ui/empty-state';
import { FormError, formErrorText, showFieldErrors, TextField } from '../../../components/ui/form';
import { Spinner } from '../../../components/ui/spinner';
import { Table, Td, Th } from '../../../components/ui/table';
import { useToast } from '../../../components/ui/toast';
import { ApiError } from '../../../lib/api-client';
import {
  integrationQueries,
  registerWebhook,
  removeWebhook,
  resendDelivery,
  sendTestEvent,
} from '../api/integrations';
import { RoleChoice } from './role-choice';
import { SecretOnce } from './secret-once';

const when = (iso: string | null) =>
  iso ? new Date(iso).toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'short' }) : '—';
const eventLabel = (e: string) => WEBHOOK_EVENT_LABELS[e as WebhookEvent] ?? 'Test event';
const DELIVERY = {
  pending: { tone: 'warn', text: 'Waiting' },
  delivered: { tone: 'ok', text: 'Delivered' },
  failed: { tone: 'bad', text: 'Gave up' },
} as const;

export function WebhooksCard() {
  const [registering, setRegistering] = useState(false);
  const [open, setOpen] = useState<string | null>(null);
  const list = useQuery(integrationQueries.webhookList());
  const items = list.data?.items ?? [];
  return (
    <Card>
      <CardHeader
        title="Webhooks"
        description="Lumenproof posts signed events to your https endpoints as claims move."
        actions={
          <Button onClick={() => setRegistering(true)} icon={<Webhook className="size-4" aria-hidden />}>
            Register endpoint
          </Button>
        }
      />
      {list.isPending ? (
        <div className="p-6">
          <Spinner label="Loading endpoints" />
        </div>
      ) : items.length === 0 ? (
        <EmptyState icon={<Webhook className="size-5" />} title="No endpoints yet">
          Register an https address and pick the events it should hear of.
        </EmptyState>
      ) : (
        <ul className="divide-y divide-ink-100">
          {items.map((w) => (
            <EndpointRow
              key={w.id}
              endpoint={w}
              expanded={open === w.id}
              onToggle={() => setOpen(open === w.id ? null : w.id)}
            />
          ))}
        </ul>
      )}
      <RegisterDialog open={registering} onClose={() => setRegistering(false)} />
    </Card>
  );
}

function EndpointRow({
  endpoint: w,
  expanded,
  onToggle,
}: {
  endpoint: WebhookEndpointView;
  expanded: boolean;
  onToggle: () => void;
}) {
  const qc = useQueryClient();
  const { notify } = useToast();
  const onError = (e: unknown) => notify(e instanceof ApiError ? e.message : 'That did not work.', 'bad');
  const refresh = () => qc.invalidateQueries({ queryKey: integrationQueries.webhooks });
  const remove = useMutation({
    mutationFn: () => removeWebhook(w.id),
    onSuccess: async () => {
      notify('Nothing more will be sent to that endpoint.');
      await refresh();
    },
    onError,
  });
  const test = useMutation({
    mutationFn: () => sendTestEvent(w.id),
    onSuccess: async () => {
      notify('A test event is on its way.');
      await refresh();
    },
    onError,
  });
  const logId = `deliveries-${w.id}`;
  return (
    <li className="px-4 py-3 sm:px-5">
      <div className="flex flex-wrap items-start justify-between gap-2">
        <div className="min-w-0">
          <p className="font-mono text-sm break-all text-ink-950">{w.url}</p>
          <p className="mt-0.5 text-xs text-ink-600">{w.events.map(eventLabel).join(' · ')}</p>
          {w.disabledAt ? <Badge tone="neutral">Removed</Badge> : null}
        </div>
        <div className="flex flex-wrap gap-1">
          <Button variant="ghost" size="sm" aria-expanded={expanded} aria-controls={logId} onClick={onToggle}>
            {expanded ? 'Hide deliveries' : 'Deliveries'}
          </Button>
          {!w.disabledAt ? (
            <>
              <Button variant="ghost" size="sm" loading={test.isPending} onClick={() => test.mutate()}>
                Send test event
              </Button>
              <Button
                variant="ghost"
                size="sm"
                className="text-bad-700"
                onClick={() => remove.mutate()}
                aria-label={`Remove ${w.url}`}
              >
                Remove
              </Button>
            </>
          ) : null}
        </div>
      </div>
      {expanded ? (
        <div id={logId} className="mt-3">
          <DeliveryLog endpoint={w} />
        </div>
      ) : null}
    </li>
  );
}

function DeliveryLog({ endpoint }: { endpoint: WebhookEndpointView }) {
  const qc = useQueryClient();
  const { notify } = useToast();
  const log = useQuery({ ...integrationQueries.deliveries(endpoint.id), refetchInterval: 5000 });
  const again = useMutation({
    mutationFn: (deliveryId: string) => resendDelivery(endpoint.id, deliveryId),
    onSuccess: async () => {
      notify('Queued to be sent again.');
      await qc.invalidateQueries({ queryKey: integrationQueries.webhooks });
    },
    onError: (e) => notify(e instanceof ApiError ? e.message : 'Could not send it again.', 'bad'),
  });
  if (log.isPending) return <Spinner label="Loading deliveries" />;
  const items = log.data?.items ?? [];
  if (!items.length) return <p className="text-sm text-ink-600">Nothing sent to this endpoint yet.</p>;
  return (
    <Table caption={`Deliveries to ${endpoint.url}`}>
      <thead>
        <tr>
          <Th>Event</Th>
          <Th>Status</Th>
          <Th>Attempts</Th>
          <Th>Last answer</Th>
          <Th>Time</Th>
          <Th className="text-right">Actions</Th>
        </tr>
      </thead>
      <tbody className="divide-y divide-ink-100">
        {items.map((d) => (
          <tr key={d.id}>
            <Td>{eventLabel(d.event)}</Td>
            <Td>
              <Badge tone={DELIVERY[d.status].tone}>{DELIVERY[d.status].text}</Badge>
            </Td>
            <Td>{d.attempts}</Td>
            <Td title={d.lastError ?? undefined}>{d.lastStatusCode ?? (d.lastError ? 'No answer' : '—')}</Td>
            <Td>{when(d.lastAttemptAt ?? d.createdAt)}</Td>
            <Td className="text-right">
              {!endpoint.disabledAt ? (
                <Button
                  variant="ghost"
                  size="sm"
                  onClick={() => again.mutate(d.id)}
                  aria-label={`Send again: ${eventLabel(d.event)}, delivery ${d.id}`}
                >
                  Send again
                </Button>
              ) : null}
            </Td>
          </tr>
        ))}
      </tbody>
    </Table>
  );
}

function RegisterDialog({ open, onClose }: { open: boolean; onClose: () => void }) {
  const qc = useQueryClient();
  const [secret, setSecret] = useState<string | null>(null);
  const form = useForm<CreateWebhookInput>({
    resolver: zodResolver(createWebhookSchema),
    defaultValues: { url: '', events: ['claim.filed'] },
  });
  const mutation = useMutation({
    mutationFn: registerWebhook,
    onSuccess: async (r) => {
      setSecret(r.signingSecret);
      form.reset();
      await qc.invalidateQueries({ queryKey: integrationQueries.webhooks });
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
      title={secret ? 'Endpoint registered' : 'Register an endpoint'}
      description={
        secret
          ? undefined
          : 'Each delivery carries a Lumenproof-Signature header: t=<time>,v1=<HMAC-SHA256 of "<time>.<body>">.'
      }
      footer={
        secret ? (
          <Button onClick={close}>Done</Button>
        ) : (
          <>
            <Button variant="secondary" onClick={close}>
              Cancel
            </Button>
            <Button type="submit" form="register-webhook" loading={mutation.isPending}>
              Register
            </Button>
          </>
        )
      }
    >
      {secret ? (
        <SecretOnce label="Signing secret" secret={secret} />
      ) : (
        <form
          id="register-webhook"
          noValidate
          className="space-y-4"
          onSubmit={form.handleSubmit((v) => mutation.mutate(v))}
        >
          <FormError message={formErrorText(mutation.error)} />
          <TextField
            form={form}
            name="url"
            label="Endpoint address"
            type="url"
            inputMode="url"
            placeholder="https://erp.example.com/lumenproof"
            autoComplete="off"
          />
          <Controller
            control={form.control}
            name="events"
            render={({ field, fieldState }) => (
              <RoleChoice
                legend="Events"
                options={WEBHOOK_EVENTS.map((e) => ({ value: e, label: WEBHOOK_EVENT_LABELS[e] }))}
                value={field.value}
                onChange={field.onChange}
                error={fieldState.error?.message}
              />
            )}
          />
        </form>
      )}
    </Dialog>
  );
}
