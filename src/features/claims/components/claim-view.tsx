import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useState, type ReactNode } from 'react';
import {
  CLAIM_STAGE_LABELS,
  OBSERVATION_LABELS,
  OBSERVATIONS,
  SYMPTOM_LABELS,
  type ClaimDetailDto,
  type ClaimStage,
} from '../../../../shared/schemas/claims';
import { Button } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { withdrawClaim } from '../api/claim-mutations';
import { claimQueries } from '../api/claim-queries';
import { AttachmentsPanel } from './attachments-panel';
import { StageBadge, waitingText } from './stage-badge';
import { CalendarDate, DateTime } from '../../../components/ui/date-time';

const fmt = (v: number | undefined, unit: string, digits = 3) =>
  v === undefined ? '—' : `${v.toLocaleString('en-US', { maximumFractionDigits: digits })} ${unit}`;

const ACTION_TEXT: Record<string, string> = {
  'claim.created': 'Draft started',
  'claim.updated': 'Draft saved',
  'claim.filed': 'Filed',
  'claim.withdrawn': 'Withdrawn',
  'attachment.added': 'File added',
  'attachment.removed': 'File removed',
};

/** A filed (or later) claim: its stage and what it waits for, the stored evaluation, readings, files and timeline. */
export function ClaimView({
  claim: c,
  evaluation,
  canWithdraw,
}: {
  claim: ClaimDetailDto;
  evaluation: ReactNode;
  canWithdraw: boolean;
}) {
  const qc = useQueryClient();
  const [reason, setReason] = useState('');
  const withdraw = useMutation({
    mutationFn: () => withdrawClaim(c.id, c.version, reason || undefined),
    // The claim's page and the lists read the claim again (the move answers its stage and version only).
    onSuccess: () => qc.invalidateQueries({ queryKey: claimQueries.all }),
  });
  const m = c.measurements;
  const readings: [string, string][] = [
    ['Supply voltage', fmt(m.supplyVolts, 'V', 1)],
    ['Input power', fmt(m.inputWatts, 'W', 1)],
    ['Power factor', m.powerFactor === undefined ? '—' : String(m.powerFactor)],
    ['Driver output', `${fmt(m.driverOutputVolts, 'V', 1)} · ${fmt(m.driverOutputAmps, 'A')}`],
  ];
  const timeline = c.history.filter((h) => h.action !== 'claim.updated');
  const withdrawable: ClaimStage[] = ['filed', 'needs_info'];
  return (
    <div className="grid gap-5 lg:grid-cols-[minmax(0,1fr)_24rem] lg:items-start">
      <div className="min-w-0 space-y-5">
        <Card>
          <CardHeader
            title={
              <span className="flex flex-wrap items-center gap-2">
                {c.number ?? 'Draft'} <StageBadge stage={c.stage} />
              </span>
            }
            description={waitingText(c.stage, c.waitingOn)}
          />
          <dl className="grid gap-x-6 gap-y-3 p-4 text-sm sm:grid-cols-2 sm:p-5">
            <div>
              <dt className="text-xs font-medium text-ink-600 uppercase">Product</dt>
              <dd>
                {c.product.modelNumber} · {c.product.name}
              </dd>
            </div>
            <div>
              <dt className="text-xs font-medium text-ink-600 uppercase">Site</dt>
              <dd>
                {c.installationDetail.siteName}, {c.installationDetail.siteCity}
              </dd>
            </div>
            <div>
              <dt className="text-xs font-medium text-ink-600 uppercase">Manufacturer</dt>
              <dd>{c.manufacturer.name}</dd>
            </div>
            <div>
              <dt className="text-xs font-medium text-ink-600 uppercase">Contractor</dt>
              <dd>{c.contractor.name}</dd>
            </div>
            <div>
              <dt className="text-xs font-medium text-ink-600 uppercase">Units and serials</dt>
              <dd className="break-words">
                {c.units} · {c.serials.join(', ') || 'no serials'}
              </dd>
            </div>
            <div>
              <dt className="text-xs font-medium text-ink-600 uppercase">Failed on · filed</dt>
              <dd>
                {c.failedOn ? <CalendarDate value={c.failedOn} /> : '—'} ·{' '}
                {c.filedAt ? <DateTime value={c.filedAt} /> : '—'}
              </dd>
            </div>
            <div className="sm:col-span-2">
              <dt className="text-xs font-medium text-ink-600 uppercase">Symptoms</dt>
              <dd>{c.symptoms.map((s) => SYMPTOM_LABELS[s]).join(', ') || '—'}</dd>
            </div>
            <div className="sm:col-span-2">
              <dt className="text-xs font-medium text-ink-600 uppercase">Seen at the fixture</dt>
              <dd>
                {OBSERVATIONS.filter((k) => c.observations[k])
                  .map((k) => OBSERVATION_LABELS[k])
                  .join(', ') || 'Nothing noted'}
              </dd>
            </div>
            <div className="sm:col-span-2">
              <dt className="text-xs font-medium text-ink-600 uppercase">What happened</dt>
              <dd className="whitespace-pre-wrap">{c.narrative || '—'}</dd>
            </div>
          </dl>
        </Card>
        <Card>
          <CardHeader title="Readings" />
          <dl className="grid gap-x-6 gap-y-2 p-4 text-sm sm:grid-cols-2 sm:p-5">
            {readings.map(([k, v]) => (
              <div key={k} className="flex justify-between gap-2 border-b border-ink-100 py-1">
                <dt className="text-ink-600">{k}</dt>
                <dd className="tabular-nums">{v}</dd>
              </div>
            ))}
          </dl>
          {m.strings?.length ? (
            <div className="overflow-x-auto px-4 pb-4 sm:px-5">
              <table className="min-w-full text-sm">
                <caption className="sr-only">String readings</caption>
                <thead>
                  <tr className="text-left text-xs text-ink-600 uppercase">
                    <th className="py-1 pr-3">String</th>
                    <th className="pr-3">Volts</th>
                    <th className="pr-3">Amps</th>
                    <th>Dark LEDs</th>
                  </tr>
                </thead>
                <tbody>
                  {m.strings.map((s, i) => (
                    <tr key={i} className="border-t border-ink-100 tabular-nums">
                      <td className="py-1 pr-3">#{i + 1}</td>
                      <td className="pr-3">{fmt(s.volts, 'V', 2)}</td>
                      <td className="pr-3">{fmt(s.amps, 'A')}</td>
                      <td>{s.darkLeds ?? '—'}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          ) : null}
        </Card>
        <Card>
          <CardHeader title="What the manufacturer asked for" />
          {c.requests.length ? (
            <ul className="divide-y divide-ink-100">
              {c.requests.map((r) => (
                <li key={r.id} className="p-4 text-sm">
                  {r.message}
                </li>
              ))}
            </ul>
          ) : (
            <p className="p-4 text-sm text-ink-600 sm:p-5">Nothing asked yet.</p>
          )}
        </Card>
        <Card className="p-4 sm:p-5">
          <AttachmentsPanel
            claimId={c.id}
            attachments={c.attachments}
            editable={canWithdraw && c.stage === 'needs_info'}
            removable={false}
            onChange={() => void qc.invalidateQueries({ queryKey: claimQueries.detail(c.id).queryKey })}
          />
        </Card>
        <Card>
          <CardHeader title="Timeline" />
          <ol className="space-y-3 p-4 text-sm sm:p-5">
            {timeline.map((h) => (
              <li key={h.id} className="flex gap-3">
                <span aria-hidden className="mt-1.5 size-2 shrink-0 rounded-full bg-brand-600" />
                <div>
                  <p className="font-medium text-ink-900">
                    {ACTION_TEXT[h.action] ?? h.action}
                    {typeof h.after?.stage === 'string' && h.action !== 'claim.created'
                      ? ` → ${CLAIM_STAGE_LABELS[h.after.stage as ClaimStage] ?? h.after.stage}`
                      : ''}
                  </p>
                  <p className="text-xs text-ink-600">
                    <DateTime value={h.occurredAt} />
                    {h.actor ? ` · ${h.actor.name}` : ''}
                  </p>
                </div>
              </li>
            ))}
          </ol>
        </Card>
        {canWithdraw && withdrawable.includes(c.stage) ? (
          <Card className="space-y-2 p-4 sm:p-5">
            <label htmlFor="withdraw-reason" className="block text-sm font-medium">
              Withdraw this claim (optional reason)
            </label>
            <input
              id="withdraw-reason"
              value={reason}
              onChange={(e) => setReason(e.target.value)}
              className="h-11 w-full rounded-lg border border-ink-300 px-3"
            />
            {withdraw.error ? (
              <p role="alert" className="text-sm text-bad-700">
                {withdraw.error.message}
              </p>
            ) : null}
            <Button variant="danger" loading={withdraw.isPending} onClick={() => withdraw.mutate()}>
              Withdraw claim
            </Button>
          </Card>
        ) : null}
      </div>
      <aside aria-label="Evaluation at filing" className="min-w-0 lg:sticky lg:top-4">
        {evaluation}
      </aside>
    </div>
  );
}
