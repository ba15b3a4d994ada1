import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { forwardRef, useState, type FormEvent, type ReactNode, type TextareaHTMLAttributes } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import {
  BENCH_DENIAL_CODE,
  BENCH_RESULT_LABELS,
  BENCH_RESULTS,
  DENIAL_CODE_LABELS,
  DENIAL_CODES,
  RECEIPT_CONDITION_LABELS,
  RECEIPT_CONDITIONS,
  receiveUnitSchema,
  recordBenchTestSchema,
  RESOLUTION_LABELS,
  RESOLUTIONS,
  type BenchResult,
  type DenialCode,
  type Resolution,
} from '../../../../shared/claims/actions.schema';
import { overrideReasonsFor, STAGE_LABELS, type ClaimActionName } from '../../../../shared/claims/stages';
import type { ClaimDocumentDto, ClaimWorkflowDto } from '../../../../shared/claims/workflow';
import type { Evaluation } from '../../../../shared/engine/schema';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { InputField, SelectField } from '../../../components/ui/field';
import { ApiError } from '../../../lib/api-client';
import { useToday } from '../../../lib/dates';
import { assignClaim, performClaimAction } from '../api/perform-claim-action';
import { reviewQueries } from '../api/review-queries';
import { uploadConversationFile } from '../api/upload-conversation-file';
import { CalendarDate, DateTime, useDateText } from '../../../components/ui/date-time';

// The workflow around one claim, for both sides: the thread, returns, the decision and its letter, and the
// moves this user can make now. The server decides; these forms only offer what the stage machine allows.

const REPAIR_CAUTION =
  'Field modifications (bypassing dead LEDs, swapping drivers) can void the fixture’s listing and its warranty. Follow local codes and the authority having jurisdiction, and leave the work to licensed, qualified electricians.';

function DocLink({ doc, label }: { doc: ClaimDocumentDto; label: string }) {
  return (
    <a className="font-medium text-brand-700 underline" href={doc.url} download>
      {label}{' '}
      <span className="text-xs text-ink-600">
        (PDF, {Math.ceil(doc.byteSize / 1024)} KB, SHA-256 {doc.sha256.slice(0, 12)}…)
      </span>
    </a>
  );
}

function TextArea({
  label,
  value,
  onChange,
  hint,
}: {
  label: string;
  value: string;
  onChange: (v: string) => void;
  hint?: ReactNode;
}) {
  const id = `ta-${label.replace(/\W+/g, '-').toLowerCase()}`;
  return (
    <div className="space-y-1.5">
      <label htmlFor={id} className="block text-sm font-medium text-ink-800">
        {label}
      </label>
      <textarea
        id={id}
        rows={3}
        value={value}
        onChange={(e) => onChange(e.target.value)}
        className="block w-full rounded-lg border border-ink-300 px-3 py-2 text-base focus:border-brand-600 focus:outline-none focus:ring-2 focus:ring-brand-600/30 sm:text-sm"
      />
      {hint ? <p className="text-xs text-ink-600">{hint}</p> : null}
    </div>
  );
}

function useMove(claimId: string, version: number) {
  const qc = useQueryClient();
  const [error, setError] = useState<ApiError | null>(null);
  const m = useMutation({
    mutationFn: ({ action, payload }: { action: ClaimActionName; payload: unknown }) =>
      performClaimAction(claimId, action, payload, version),
    onSuccess: () => {
      setError(null);
      return qc.invalidateQueries({ queryKey: ['claims'] });
    },
    onError: (e) => setError(e instanceof ApiError ? e : new ApiError(0, 'unknown', 'Something went wrong.')),
  });
  return {
    run: (action: ClaimActionName, payload: unknown, onDone?: () => void) =>
      m.mutate({ action, payload }, { onSuccess: () => onDone?.() }),
    pending: m.isPending,
    error,
  };
}

function ErrorText({ error }: { error: ApiError | null }) {
  if (!error) return null;
  return (
    <div role="alert" className="rounded-lg border border-bad-300 bg-bad-50 p-3 text-sm text-bad-900">
      <p className="font-medium">{error.message}</p>
      {error.details.map((d) => (
        <p key={d.path}>{d.message}</p>
      ))}
    </div>
  );
}

export function Thread({ wf }: { wf: ClaimWorkflowDto }) {
  if (!wf.messages.length) return null;
  return (
    <Card>
      <CardHeader title="Questions and answers" />
      <ol className="space-y-3 px-4 py-4 sm:px-5">
        {wf.messages.map((m) => (
          <li
            key={m.id}
            className={
              m.author.side === 'manufacturer' ? 'rounded-lg bg-ink-50 p-3' : 'rounded-lg bg-brand-50 p-3'
            }
          >
            <p className="text-xs text-ink-600">
              {m.kind === 'info_request' ? 'Asked' : 'Answered'} by {m.author.name} ({m.author.organization})
              on <DateTime value={m.createdAt} />
              {m.dueOn ? (
                <>
                  {' '}
                  · answer due <CalendarDate value={m.dueOn} />
                </>
              ) : null}
            </p>
            <p className="whitespace-pre-wrap text-sm text-ink-900">{m.body}</p>
            {m.attachments.length ? (
              <ul className="mt-2 flex flex-wrap gap-2">
                {m.attachments.map((a) => (
                  <li key={a.id}>
                    {a.kind === 'photo' ? (
                      <a href={a.url} download={a.name}>
                        <img
                          src={a.thumbnailUrl ?? a.url}
                          alt={`Photo sent with the answer: ${a.name}`}
                          className="h-24 rounded border border-ink-200 object-cover"
                        />
                      </a>
                    ) : (
                      <a className="text-brand-700 underline" href={a.url}>
                        {a.name}
                      </a>
                    )}
                  </li>
                ))}
              </ul>
            ) : null}
          </li>
        ))}
      </ol>
    </Card>
  );
}

export function DecisionCard({ wf }: { wf: ClaimWorkflowDto }) {
  const d = wf.decision;
  const dates = useDateText();
  if (!d) return null;
  return (
    <Card>
      <CardHeader title="Decision" description={`${d.decidedBy}, ${dates.dateTime(d.decidedAt)}`} />
      <div className="space-y-2 px-4 py-4 text-sm sm:px-5">
        <p className="text-base font-semibold">
          {d.outcome === 'denied'
            ? 'Denied'
            : d.outcome === 'partly_approved'
              ? 'Partly approved'
              : 'Approved'}
          {d.resolution ? ` · ${RESOLUTION_LABELS[d.resolution]} · ${d.amount} ${d.currency}` : ''}
        </p>
        {d.reasonCodes.length ? (
          <ul className="list-disc pl-5">
            {d.reasonCodes.map((c) => (
              <li key={c}>{DENIAL_CODE_LABELS[c]}</li>
            ))}
          </ul>
        ) : null}
        {d.note ? <p className="whitespace-pre-wrap">{d.note}</p> : null}
        {d.overrideReason ? (
          <p className="text-ink-700">Why it departs from the screening: {d.overrideReason}</p>
        ) : null}
        {d.resolution === 'repair_allowance' ? (
          <p role="note" className="rounded-lg border border-warn-300 bg-warn-50 p-3 text-warn-900">
            {REPAIR_CAUTION}
          </p>
        ) : null}
        {d.letter ? <DocLink doc={d.letter} label="Download the determination letter" /> : null}
      </div>
    </Card>
  );
}

export function Returns({ wf }: { wf: ClaimWorkflowDto }) {
  if (!wf.returns.length) return null;
  return (
    <Card>
      <CardHeader title="Return authorisation" />
      <ul className="space-y-3 px-4 py-4 text-sm sm:px-5">
        {wf.returns.map((r) => (
          <li key={r.id} className="space-y-1">
            <p className="font-mono font-semibold">{r.number}</p>
            <p>
              Ship to {r.shipTo.name}, {r.shipTo.line1}, {r.shipTo.city} {r.shipTo.postalCode}{' '}
              {r.shipTo.country} by <CalendarDate value={r.shipBy} />
            </p>
            {r.shippedOn ? (
              <p>
                Shipped <CalendarDate value={r.shippedOn} /> with {r.carrier}, tracking {r.trackingNumber}
              </p>
            ) : (
              <p className="text-ink-600">Not shipped yet.</p>
            )}
            {r.receivedOn ? (
              <p>
                Received <CalendarDate value={r.receivedOn} /> ({r.receivedCondition?.replace(/_/g, ' ')})
              </p>
            ) : null}
            {r.packingSlip ? <DocLink doc={r.packingSlip} label="Download the packing slip" /> : null}
          </li>
        ))}
      </ul>
    </Card>
  );
}

/** The installer's side: what is asked and by when, answering with files, recording the shipment. */
export function InstallerWorkflow({ wf }: { wf: ClaimWorkflowDto }) {
  const move = useMove(wf.claim.id, wf.claim.version);
  const [message, setMessage] = useState('');
  const [files, setFiles] = useState<File[]>([]);
  const [uploading, setUploading] = useState(false);
  const [ship, setShip] = useState({
    carrier: '',
    trackingNumber: '',
    shippedOn: useToday(),
  });
  const [uploadError, setUploadError] = useState<ApiError | null>(null);
  async function answer(e: FormEvent) {
    e.preventDefault();
    setUploading(true);
    setUploadError(null);
    try {
      const ids = [];
      for (const f of files) ids.push((await uploadConversationFile(wf.claim.id, f)).attachment.id);
      move.run('answer_info', { message, ...(ids.length ? { attachmentIds: ids } : {}) });
    } catch (err) {
      // A refused file (not a photo or PDF, too large, …) stops the answer: nothing is sent without it.
      setUploadError(
        err instanceof ApiError ? err : new ApiError(0, 'unknown', 'The file could not be uploaded.'),
      );
    } finally {
      setUploading(false);
    }
  }
  return (
    <div className="space-y-4">
      <Card>
        <CardHeader
          title="Where the claim stands"
          description={`${STAGE_LABELS[wf.claim.stage]}${wf.claim.waitingOn === 'contractor' ? ' — waiting on you' : ''}`}
        />
        <div className="space-y-4 px-4 py-4 sm:px-5">
          <ErrorText error={move.error} />
          <ErrorText error={uploadError} />
          {wf.actions.includes('answer_info') && wf.openRequest ? (
            <form className="space-y-3" onSubmit={answer}>
              <p className="text-sm">
                <strong>The manufacturer asks</strong>
                {wf.openRequest.dueOn ? (
                  <>
                    {' '}
                    (answer by <CalendarDate value={wf.openRequest.dueOn} />)
                  </>
                ) : null}
                :
              </p>
              <blockquote className="rounded-lg bg-ink-50 p-3 text-sm whitespace-pre-wrap">
                {wf.openRequest.body}
              </blockquote>
              <TextArea label="Your answer" value={message} onChange={setMessage} />
              <InputField
                label="Photos or documents"
                type="file"
                multiple
                accept="image/jpeg,image/png,image/webp,application/pdf"
                onChange={(e) => setFiles([...(e.target.files ?? [])])}
              />
              <Button type="submit" loading={move.pending || uploading}>
                Send answer
              </Button>
            </form>
          ) : null}
          {wf.actions.includes('record_shipment') ? (
            <form
              className="grid gap-3 sm:grid-cols-3"
              onSubmit={(e) => {
                e.preventDefault();
                move.run('record_shipment', ship);
              }}
            >
              <InputField
                label="Carrier"
                value={ship.carrier}
                onChange={(e) => setShip({ ...ship, carrier: e.target.value })}
              />
              <InputField
                label="Tracking number"
                value={ship.trackingNumber}
                onChange={(e) => setShip({ ...ship, trackingNumber: e.target.value })}
              />
              <InputField
                label="Shipped on"
                type="date"
                value={ship.shippedOn}
                onChange={(e) => setShip({ ...ship, shippedOn: e.target.value })}
              />
              <Button type="submit" loading={move.pending} className="sm:col-span-3 sm:w-fit">
                Record shipment
              </Button>
            </form>
          ) : null}
        </div>
      </Card>
      <DecisionCard wf={wf} />
      <Returns wf={wf} />
      <Thread wf={wf} />
    </div>
  );
}

/**
 * Who on the manufacturer's team has the claim: take it, give it back to the queue, or hand it to a colleague
 * (not a stage move). Every change carries the version on screen; a 409 says someone changed the claim first.
 */
export function Assignment({ wf, meId }: { wf: ClaimWorkflowDto; meId: string }) {
  const qc = useQueryClient();
  const [error, setError] = useState<ApiError | null>(null);
  const [handing, setHanding] = useState(false);
  const [colleague, setColleague] = useState('');
  const [pickError, setPickError] = useState<string | undefined>();
  const reviewers = useQuery({ ...reviewQueries.reviewers(), enabled: handing });
  const reload = () => {
    setError(null);
    return qc.invalidateQueries({ queryKey: ['claims'] });
  };
  const m = useMutation({
    mutationFn: (assigneeId: string | null) => assignClaim(wf.claim.id, assigneeId, wf.claim.version),
    onSuccess: () => {
      setHanding(false);
      setColleague('');
      return reload();
    },
    onError: (e) => setError(e instanceof ApiError ? e : new ApiError(0, 'unknown', 'Something went wrong.')),
  });
  if (['draft', 'closed', 'withdrawn'].includes(wf.claim.stage)) return null;
  const who = wf.claim.assignee;
  const others = (reviewers.data?.items ?? []).filter((r) => r.id !== meId && r.id !== who?.id);

  function hand(e: FormEvent) {
    e.preventDefault();
    if (!colleague) return setPickError('Choose a colleague to hand the claim to.');
    setPickError(undefined);
    m.mutate(colleague);
  }

  return (
    <div className="space-y-2" role="group" aria-label="Assignment">
      <p className="text-sm text-ink-700">
        {who
          ? who.id === meId
            ? 'Assigned to you'
            : `Assigned to ${who.name}`
          : 'Not assigned to anyone yet'}
      </p>
      <div className="flex flex-wrap gap-2">
        {who?.id !== meId ? (
          <Button variant="secondary" loading={m.isPending} onClick={() => m.mutate(meId)}>
            Assign to me
          </Button>
        ) : null}
        {who ? (
          <Button variant="secondary" loading={m.isPending} onClick={() => m.mutate(null)}>
            Give back to the queue
          </Button>
        ) : null}
        {!handing ? (
          <Button variant="secondary" onClick={() => setHanding(true)}>
            Hand to a colleague
          </Button>
        ) : null}
      </div>
      {handing ? (
        <form className="space-y-2" aria-label="Hand to a colleague" onSubmit={hand}>
          <SelectField
            label="Colleague"
            value={colleague}
            error={pickError}
            hint={
              reviewers.isPending
                ? 'Loading your team’s reviewers…'
                : reviewers.isError
                  ? 'The list of reviewers could not be loaded. Try again in a moment.'
                  : others.length === 0
                    ? 'No other active reviewer on your team.'
                    : 'Active reviewers of your team. They get an e-mail saying the claim is theirs.'
            }
            onChange={(e) => setColleague(e.target.value)}
          >
            <option value="">Choose a reviewer</option>
            {others.map((r) => (
              <option key={r.id} value={r.id}>
                {r.name}
              </option>
            ))}
          </SelectField>
          <div className="flex flex-wrap gap-2">
            <Button type="submit" loading={m.isPending} disabled={others.length === 0}>
              Hand over
            </Button>
            <Button
              variant="ghost"
              onClick={() => {
                setHanding(false);
                setColleague('');
                setPickError(undefined);
              }}
            >
              Cancel
            </Button>
          </div>
        </form>
      ) : null}
      <ErrorText error={error} />
      {error?.status === 409 ? (
        <Button variant="secondary" onClick={reload}>
          Reload the claim
        </Button>
      ) : null}
    </div>
  );
}

/** The reviewer's moves, each a small form; approve and deny say when a written reason is needed and why. */
export function ReviewActions({
  wf,
  evaluation,
  units,
}: {
  wf: ClaimWorkflowDto;
  evaluation: Evaluation | null;
  units: number;
}) {
  const move = useMove(wf.claim.id, wf.claim.version);
  const [open, setOpen] = useState<ClaimActionName | null>(null);
  const [text, setText] = useState('');
  const [resolution, setResolution] = useState<Resolution>('replace');
  const [amount, setAmount] = useState(evaluation?.computed.credit ?? '');
  const [reason, setReason] = useState('');
  const [codes, setCodes] = useState<DenialCode[]>([]);
  const [addr, setAddr] = useState({ name: '', line1: '', city: '', postalCode: '', country: 'US' });
  const latestBench = wf.benchTests.length ? wf.benchTests[wf.benchTests.length - 1] : null;
  const benchResult = (latestBench?.result as BenchResult | undefined) ?? null;
  const view = {
    stage: wf.claim.stage,
    contractorId: '',
    manufacturerId: '',
    benchResult,
    evaluation: evaluation ? { verdict: evaluation.verdict, computed: evaluation.computed } : null,
  };
  const choose = (a: ClaimActionName) => {
    setOpen(a);
    // The bench's finding points to a denial reason; offer it ticked (the reviewer may untick it).
    const suggested = benchResult ? BENCH_DENIAL_CODE[benchResult] : null;
    if (a === 'deny' && suggested && codes.length === 0) setCodes([suggested]);
  };
  const why =
    open === 'approve'
      ? overrideReasonsFor(view, { action: 'approve', amount })
      : open === 'deny'
        ? overrideReasonsFor(view, { action: 'deny' })
        : [];
  const offered = wf.actions;

  function submit(e: FormEvent) {
    e.preventDefault();
    if (!open) return;
    const r = reason.trim() ? { overrideReason: reason.trim() } : {};
    const payloads: Partial<Record<ClaimActionName, unknown>> = {
      start_review: {},
      request_info: { message: text },
      request_return: { shipTo: addr, ...(text.trim() ? { instructions: text } : {}) },
      approve: { resolution, amount, ...(text.trim() ? { note: text } : {}), ...r },
      deny: { reasonCodes: codes, note: text, ...r },
      reopen: { reason: text },
      close: {},
    };
    move.run(open, payloads[open] ?? {});
  }

  return (
    <Card>
      <CardHeader
        title="Decide or ask"
        description={`${STAGE_LABELS[wf.claim.stage]} · ${units} ${units === 1 ? 'unit' : 'units'}`}
      />
      <div className="space-y-4 px-4 py-4 sm:px-5">
        <div className="flex flex-wrap gap-2" role="group" aria-label="Moves">
          {offered.map((a) => (
            <Button
              key={a}
              variant={open === a ? 'primary' : 'secondary'}
              onClick={() => choose(a)}
              aria-pressed={open === a}
            >
              {ACTION_LABEL[a] ?? a}
            </Button>
          ))}
          {offered.length === 0 ? (
            <p className="text-sm text-ink-600">Nothing for you to do at this stage.</p>
          ) : null}
        </div>
        {latestBench ? (
          <p className="text-sm text-ink-700" data-testid="latest-bench-result">
            Bench test {latestBench.testedOn}:{' '}
            {BENCH_RESULT_LABELS[benchResult as BenchResult] ?? latestBench.result}
          </p>
        ) : null}
        <ErrorText error={move.error} />
        {open === 'record_bench_test' ? (
          <BenchTestForm
            pending={move.pending}
            onSubmit={(p) => move.run('record_bench_test', p, () => setOpen(null))}
          />
        ) : open === 'receive_unit' ? (
          <ReceiveUnitForm
            pending={move.pending}
            onSubmit={(p) => move.run('receive_unit', p, () => setOpen(null))}
          />
        ) : open ? (
          <form className="space-y-3" onSubmit={submit} aria-label={ACTION_LABEL[open]}>
            {open === 'approve' ? (
              <>
                <SelectField
                  label="Resolution"
                  value={resolution}
                  onChange={(e) => setResolution(e.target.value as Resolution)}
                >
                  {RESOLUTIONS.map((r) => (
                    <option key={r} value={r}>
                      {RESOLUTION_LABELS[r]}
                    </option>
                  ))}
                </SelectField>
                {resolution === 'repair_allowance' ? (
                  <p
                    role="note"
                    className="rounded-lg border border-warn-300 bg-warn-50 p-3 text-sm text-warn-900"
                  >
                    {REPAIR_CAUTION}
                  </p>
                ) : null}
                <InputField
                  label="Amount"
                  unit={evaluation?.computed.currency}
                  value={amount}
                  onChange={(e) => setAmount(e.target.value)}
                  hint={`The engine's credit: ${evaluation?.computed.credit ?? 'none'}`}
                />
              </>
            ) : null}
            {open === 'deny' ? (
              <fieldset className="space-y-1">
                <legend className="text-sm font-medium">Reasons from the policy</legend>
                {DENIAL_CODES.map((c) => (
                  <label key={c} className="flex min-h-11 items-center gap-2 text-sm">
                    <input
                      type="checkbox"
                      checked={codes.includes(c)}
                      onChange={(e) =>
                        setCodes(e.target.checked ? [...codes, c] : codes.filter((x) => x !== c))
                      }
                    />
                    {DENIAL_CODE_LABELS[c]}
                  </label>
                ))}
              </fieldset>
            ) : null}
            {open === 'request_return' ? (
              <div className="grid gap-3 sm:grid-cols-2">
                <InputField
                  label="Ship to (name)"
                  value={addr.name}
                  onChange={(e) => setAddr({ ...addr, name: e.target.value })}
                />
                <InputField
                  label="Street"
                  value={addr.line1}
                  onChange={(e) => setAddr({ ...addr, line1: e.target.value })}
                />
                <InputField
                  label="City"
                  value={addr.city}
                  onChange={(e) => setAddr({ ...addr, city: e.target.value })}
                />
                <InputField
                  label="Postal code"
                  value={addr.postalCode}
                  onChange={(e) => setAddr({ ...addr, postalCode: e.target.value })}
                />
                <InputField
                  label="Country"
                  value={addr.country}
                  onChange={(e) => setAddr({ ...addr, country: e.target.value.toUpperCase() })}
                />
              </div>
            ) : null}
            {open !== 'start_review' && open !== 'close' ? (
              <TextArea label={TEXT_LABEL[open] ?? 'Note'} value={text} onChange={setText} />
            ) : null}
            {why.length ? (
              <div
                role="alert"
                className="space-y-2 rounded-lg border border-warn-300 bg-warn-50 p-3 text-sm text-warn-900"
              >
                <p className="font-medium">This decision needs a written reason: {why.join(' ')}</p>
                <TextArea label="Reason for departing from the engine" value={reason} onChange={setReason} />
              </div>
            ) : null}
            <Button type="submit" loading={move.pending}>
              {ACTION_LABEL[open]}
            </Button>
          </form>
        ) : null}
        <Badge tone="neutral">Version {wf.claim.version}</Badge>
      </div>
    </Card>
  );
}

const ACTION_LABEL: Partial<Record<ClaimActionName, string>> = {
  start_review: 'Take into review',
  request_info: 'Ask the installer',
  request_return: 'Request the unit back',
  receive_unit: 'Mark unit received',
  record_bench_test: 'Record bench test',
  approve: 'Approve',
  deny: 'Deny',
  reopen: 'Reopen decision',
  close: 'Close claim',
};

const TEXT_LABEL: Partial<Record<ClaimActionName, string>> = {
  request_info: 'What you need from the installer',
  request_return: 'Instructions for the return (optional)',
  approve: 'Note for the installer (optional)',
  deny: 'Note the installer will read',
  reopen: 'Why the decision is reopened',
};

// The bench and receipt forms: react-hook-form with the move's own schema (the one the server checks), so a
// reviewer can record every result and condition the schema allows, and sees each field's problem beside it.

const blankToUndefined = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? undefined : v);
const numberOrUndefined = (v: unknown) =>
  v === '' || v === null || v === undefined
    ? undefined
    : typeof v === 'number'
      ? v
      : Number(String(v).trim());

const BENCH_READINGS = [
  { key: 'supplyVolts', label: 'Supply', unit: 'V' },
  { key: 'inputWatts', label: 'Input power', unit: 'W' },
  { key: 'powerFactor', label: 'Power factor', unit: undefined },
  { key: 'driverOutputVolts', label: 'Driver output voltage', unit: 'V' },
  { key: 'driverOutputAmps', label: 'Driver output current', unit: 'A' },
  { key: 'lightOutputPercent', label: 'Light output', unit: '% of initial' },
] as const;

type BenchFormInput = z.input<typeof recordBenchTestSchema>;
type BenchPayload = z.output<typeof recordBenchTestSchema>;

export function BenchTestForm({
  pending,
  onSubmit,
}: {
  pending: boolean;
  onSubmit: (payload: BenchPayload) => void;
}) {
  const form = useForm<BenchFormInput, unknown, BenchPayload>({
    resolver: zodResolver(recordBenchTestSchema),
    defaultValues: {
      testedOn: useToday(),
      result: 'failure_confirmed',
      readings: {},
      next: 'decide',
    },
  });
  const errors = form.formState.errors;
  const readingErrors = (errors.readings ?? {}) as Record<string, { message?: string } | undefined>;
  return (
    <form
      noValidate
      className="space-y-3"
      aria-label="Record bench test"
      onSubmit={form.handleSubmit(onSubmit)}
    >
      <InputField
        label="Tested on"
        type="date"
        error={errors.testedOn?.message}
        {...form.register('testedOn')}
      />
      <fieldset className="space-y-1">
        <legend className="text-sm font-medium">What the bench found</legend>
        {BENCH_RESULTS.map((r) => (
          <label key={r} className="flex min-h-11 items-center gap-2 text-sm">
            <input type="radio" value={r} {...form.register('result')} />
            {BENCH_RESULT_LABELS[r]}
          </label>
        ))}
        {errors.result?.message ? <p className="text-sm text-bad-700">{errors.result.message}</p> : null}
      </fieldset>
      <div className="grid gap-3 sm:grid-cols-2">
        {BENCH_READINGS.map((r) => (
          <InputField
            key={r.key}
            label={r.label}
            unit={r.unit}
            inputMode="decimal"
            error={readingErrors[r.key]?.message}
            {...form.register(`readings.${r.key}`, { setValueAs: numberOrUndefined })}
          />
        ))}
      </div>
      {errors.readings?.message ? (
        <p role="alert" className="text-sm text-bad-700">
          {errors.readings.message}
        </p>
      ) : null}
      <SelectField label="Then" error={errors.next?.message} {...form.register('next')}>
        <option value="decide">Keep the claim here, ready for a decision</option>
        <option value="review">Send the claim back to review</option>
      </SelectField>
      <NoteField
        label="Bench notes (optional)"
        error={errors.note?.message}
        {...form.register('note', { setValueAs: blankToUndefined })}
      />
      <p className="text-xs text-ink-600">
        The engine judges the claim again on these readings; the decision options follow what the bench found.
      </p>
      <Button type="submit" loading={pending}>
        Record bench test
      </Button>
    </form>
  );
}

type ReceiptFormInput = z.input<typeof receiveUnitSchema>;
type ReceiptPayload = z.output<typeof receiveUnitSchema>;

export function ReceiveUnitForm({
  pending,
  onSubmit,
}: {
  pending: boolean;
  onSubmit: (payload: ReceiptPayload) => void;
}) {
  const form = useForm<ReceiptFormInput, unknown, ReceiptPayload>({
    resolver: zodResolver(receiveUnitSchema),
    defaultValues: { receivedOn: useToday(), condition: 'as_described' },
  });
  const errors = form.formState.errors;
  return (
    <form
      noValidate
      className="space-y-3"
      aria-label="Mark unit received"
      onSubmit={form.handleSubmit(onSubmit)}
    >
      <InputField
        label="Received on"
        type="date"
        error={errors.receivedOn?.message}
        {...form.register('receivedOn')}
      />
      <fieldset className="space-y-1">
        <legend className="text-sm font-medium">Condition on arrival</legend>
        {RECEIPT_CONDITIONS.map((c) => (
          <label key={c} className="flex min-h-11 items-center gap-2 text-sm">
            <input type="radio" value={c} {...form.register('condition')} />
            {RECEIPT_CONDITION_LABELS[c]}
          </label>
        ))}
      </fieldset>
      <NoteField
        label="Notes on arrival (optional)"
        error={errors.note?.message}
        {...form.register('note', { setValueAs: blankToUndefined })}
      />
      <Button type="submit" loading={pending}>
        Mark unit received
      </Button>
    </form>
  );
}

const NoteField = forwardRef<
  HTMLTextAreaElement,
  { label: string; error?: string } & TextareaHTMLAttributes<HTMLTextAreaElement>
>(function NoteField({ label, error, ...rest }, ref) {
  const id = `note-${label.replace(/\W+/g, '-').toLowerCase()}`;
  return (
    <div className="space-y-1.5">
      <label htmlFor={id} className="block text-sm font-medium text-ink-800">
        {label}
      </label>
      <textarea
        id={id}
        ref={ref}
        rows={3}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : undefined}
        className="block w-full rounded-lg border border-ink-300 px-3 py-2 text-base focus:border-brand-600 focus:outline-none focus:ring-2 focus:ring-brand-600/30 sm:text-sm"
        {...rest}
      />
      {error ? (
        <p id={`${id}-error`} className="text-sm text-bad-700">
          {error}
        </p>
      ) : null}
    </div>
  );
});
