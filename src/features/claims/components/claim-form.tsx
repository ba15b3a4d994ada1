import { useMutation, useQueryClient } from '@tanstack/react-query';
import { CloudOff, CloudUpload, Check, Send } from 'lucide-react';
import { useEffect, useMemo, useRef, useState, type ReactNode } from 'react';
import { useForm, useWatch, type FieldErrors, type Resolver } from 'react-hook-form';
import { todayIn } from '../../../../shared/dates';
import { engineInputFor } from '../../../../shared/claims/engine-input';
import {
  filingIssues,
  OBSERVATION_LABELS,
  OBSERVATIONS,
  SYMPTOM_LABELS,
  SYMPTOMS,
  type ClaimDetailDto,
  type ClaimFields,
  type FilingIssue,
} from '../../../../shared/schemas/claims';
import type { AttachmentDto } from '../../../../shared/schemas/attachments';
import { Button } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { InputField } from '../../../components/ui/field';
import { ApiError, newIdempotencyKey } from '../../../lib/api-client';
import { cn } from '../../../lib/cn';
import { fileClaim } from '../api/claim-mutations';
import { claimQueries } from '../api/claim-queries';
import { readLocalDraft, useDraftSync, type SyncStatus } from '../hooks/use-draft-sync';
import { AttachmentsPanel } from './attachments-panel';
import {
  checkValues,
  DEFAULT_UNITS,
  fieldsFromValues,
  valuesFromClaim,
  type ClaimFormValues,
  type ReadingUnits,
} from './claim-form-values';
import { MeterField } from './meter-field';
import { SafetyCallout } from './safety-callout';

const UNITS_KEY = 'lumenproof.reading-units';

function loadUnits(): ReadingUnits {
  try {
    return {
      ...DEFAULT_UNITS,
      ...(JSON.parse(localStorage.getItem(UNITS_KEY) ?? '{}') as Partial<ReadingUnits>),
    };
  } catch {
    return DEFAULT_UNITS;
  }
}

function setPath(target: Record<string, unknown>, path: string, message: string) {
  const parts = path.split('.');
  let o = target;
  for (const p of parts.slice(0, -1)) o = (o[p] ??= {}) as Record<string, unknown>;
  const last = parts[parts.length - 1] || 'root';
  o[last] ??= { type: 'validate', message };
}

const STATUS_TEXT: Record<SyncStatus, { text: string; icon: ReactNode; className: string }> = {
  saved: { text: 'Saved', icon: <Check className="size-4" aria-hidden />, className: 'text-ok-800' },
  saving: {
    text: 'Saving…',
    icon: <CloudUpload className="size-4" aria-hidden />,
    className: 'text-ink-700',
  },
  offline: {
    text: 'Offline — changes kept on this device',
    icon: <CloudOff className="size-4" aria-hidden />,
    className: 'text-warn-900',
  },
  conflict: {
    text: 'Changed elsewhere',
    icon: <CloudOff className="size-4" aria-hidden />,
    className: 'text-bad-800',
  },
  error: { text: 'Not saved', icon: <CloudOff className="size-4" aria-hidden />, className: 'text-bad-800' },
};

function Section({ n, title, children, id }: { n: number; title: string; children: ReactNode; id?: string }) {
  return (
    <Card id={id}>
      <CardHeader title={`${n}. ${title}`} />
      <div className="space-y-4 p-4 sm:p-5">{children}</div>
    </Card>
  );
}

/**
 * Filing a claim from the field: the form on the left (or above, on a phone), the engine's live evaluation
 * beside it (given by the route as `renderEvaluation`, so features stay apart). Saves the draft as the user
 * types; keeps unsent changes on the device when offline.
 */
export type RenderEvaluation = (input: unknown, variant: 'panel' | 'summary') => ReactNode;

export function ClaimForm({
  claim,
  renderEvaluation,
}: {
  claim: ClaimDetailDto;
  renderEvaluation: RenderEvaluation;
}) {
  const qc = useQueryClient();
  const [units, setUnitsState] = useState<ReadingUnits>(loadUnits);
  const unitsRef = useRef(units);
  unitsRef.current = units;
  const [attachments, setAttachments] = useState<AttachmentDto[]>(claim.attachments);
  const [serialFilter, setSerialFilter] = useState('');
  const local = useMemo(() => readLocalDraft<ClaimFormValues>(claim.id), [claim.id]);
  const [staleLocal, setStaleLocal] = useState(local && local.baseVersion !== claim.version ? local : null);

  const resolver: Resolver<ClaimFormValues> = async (values) => {
    const { fields, issues } = checkValues(values, unitsRef.current);
    if (!issues.length) return { values, errors: {} };
    const errors: Record<string, unknown> = {};
    for (const i of issues) setPath(errors, i.path, i.message);
    return { values: fields ? values : {}, errors: errors as FieldErrors<ClaimFormValues> };
  };

  const form = useForm<ClaimFormValues>({
    defaultValues:
      local && local.baseVersion === claim.version ? local.values : valuesFromClaim(claim, units),
    resolver,
    mode: 'onTouched',
  });
  const { register, control, formState, setValue, getValues, trigger, reset } = form;
  const errors = formState.errors;
  const sync = useDraftSync<ClaimFormValues>(claim, (v) => fieldsFromValues(v, unitsRef.current).fields);

  // Every change goes to the device at once and to the server after a pause.
  const { change } = sync;
  useEffect(() => {
    const sub = form.watch((v) => change(v as ClaimFormValues));
    return () => sub.unsubscribe();
  }, [form, change]);
  // Changes kept on this device from the same version: send them now.
  useEffect(() => {
    if (local && local.baseVersion === claim.version) sync.change(local.values);
    // Once, on opening the draft.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);

  const setUnits = (next: ReadingUnits) => {
    // Keep the typed value's meaning: 0.35 in A becomes 350 in mA.
    const v = getValues();
    const conv = (text: string, from: string, to: string) => {
      const f = fieldsFromValues(
        { ...v, measurements: { ...v.measurements, driverOutputAmps: text, strings: [] } },
        { ...unitsRef.current, driverOutputAmps: from as 'A' },
      ).fields.measurements?.driverOutputAmps;
      if (f === undefined) return text;
      return String(Number((to === 'mA' ? f * 1000 : f).toPrecision(12)));
    };
    if (next.driverOutputAmps !== units.driverOutputAmps)
      setValue(
        'measurements.driverOutputAmps',
        conv(v.measurements.driverOutputAmps, units.driverOutputAmps, next.driverOutputAmps),
      );
    if (next.stringAmps !== units.stringAmps) {
      v.measurements.strings.forEach((s, i) =>
        setValue(`measurements.strings.${i}.amps`, conv(s.amps, units.stringAmps, next.stringAmps)),
      );
    }
    unitsRef.current = next;
    setUnitsState(next);
    localStorage.setItem(UNITS_KEY, JSON.stringify(next));
  };

  const values = useWatch({ control }) as ClaimFormValues;
  const key = JSON.stringify(values) + JSON.stringify(units);
  const checked = useMemo(() => checkValues(values, units), [key]); // eslint-disable-line react-hooks/exhaustive-deps
  const evidence = useMemo(
    () => ({
      photos: attachments.filter((a) => a.kind === 'photo').length,
      proofOfPurchase: attachments.some((a) => a.purpose === 'proof_of_purchase'),
    }),
    [attachments],
  );
  const liveInput = useMemo(
    () =>
      engineInputFor(
        claim.engineContext,
        fieldsFromValues(values, units).fields as ClaimFields,
        evidence,
        todayIn(),
      ),
    [key, evidence, claim.engineContext], // eslint-disable-line react-hooks/exhaustive-deps
  );
  const inst = claim.installationDetail;
  const missing: FilingIssue[] = useMemo(() => {
    const own = checked.fields
      ? filingIssues(checked.fields, {
          installDate: inst.installDate,
          quantity: inst.quantity,
          serials: inst.serials,
          today: todayIn(),
          hasPolicy: inst.policyVersion !== null,
          ledStrings: claim.engineContext.product.ledStrings,
          ledsPerString: claim.engineContext.product.ledsPerString,
        })
      : [];
    return [...checked.issues, ...own];
  }, [checked, inst, claim.engineContext]);

  // One key for this form's filing: its retries replay the server's answer rather than file again.
  const [fileKey] = useState(() => newIdempotencyKey('file'));
  const file = useMutation({
    mutationFn: async () => {
      const ok = await sync.flush();
      if (!ok)
        throw new ApiError(
          0,
          'network.offline',
          'The draft could not be saved, so it was not filed. Check the connection and try again.',
        );
      return fileClaim(claim.id, fileKey, sync.version.current);
    },
    onSuccess: async (r) => {
      qc.setQueryData(claimQueries.detail(claim.id).queryKey, { claim: r.claim });
      await qc.invalidateQueries({ queryKey: claimQueries.all });
    },
  });

  const serialsShown = inst.serials
    .filter((s) => !serialFilter || s.toLowerCase().includes(serialFilter.toLowerCase()))
    .slice(0, 60);
  const selectedSerials = values.serials ?? [];
  const err = (path: string) => {
    let o: unknown = errors;
    for (const p of path.split('.')) o = (o as Record<string, unknown> | undefined)?.[p];
    return (o as { message?: string } | undefined)?.message;
  };
  const strings = values.measurements?.strings ?? [];
  const status = STATUS_TEXT[sync.status];

  return (
    <div className="grid gap-5 lg:grid-cols-[minmax(0,1fr)_24rem] lg:items-start">
      <form
        noValidate
        aria-label="Claim"
        className="min-w-0 space-y-5"
        onSubmit={(e) => {
          e.preventDefault();
          void trigger().then(() => file.mutate());
        }}
      >
        <div className="sticky top-0 z-10 -mx-1 flex items-center justify-between gap-2 rounded-lg bg-white/95 px-2 py-2 shadow-sm backdrop-blur">
          <p
            role="status"
            aria-live="polite"
            className={cn('flex items-center gap-1.5 text-sm font-medium', status.className)}
          >
            {status.icon}
            {status.text}
          </p>
          <p className="hidden truncate text-xs text-ink-600 sm:block">Draft · {inst.siteName}</p>
          <a href="#live-evaluation" className="min-w-0 lg:hidden">
            {renderEvaluation(liveInput, 'summary')}
          </a>
        </div>
        {sync.status === 'conflict' || staleLocal ? (
          <div
            role="alert"
            className="space-y-2 rounded-lg border border-bad-300 bg-bad-50 p-3 text-sm text-bad-900"
          >
            <p>This draft was changed on another device or tab since these changes were made here.</p>
            <div className="flex flex-wrap gap-2">
              <Button
                size="md"
                onClick={() => {
                  if (staleLocal) reset(staleLocal.values);
                  setStaleLocal(null);
                  void sync.keepMine();
                }}
              >
                Keep this device&apos;s changes
              </Button>
              <Button
                variant="secondary"
                size="md"
                onClick={() => {
                  setStaleLocal(null);
                  void sync.discardMine().then(() => {
                    const fresh = qc.getQueryData(claimQueries.detail(claim.id).queryKey);
                    if (fresh) reset(valuesFromClaim(fresh.claim, unitsRef.current));
                  });
                }}
              >
                Use the saved draft
              </Button>
            </div>
          </div>
        ) : null}
        {sync.status === 'error' && sync.error ? (
          <p role="alert" className="text-sm text-bad-700">
            {sync.error}
          </p>
        ) : null}

        <Section n={1} title="The failed units">
          {inst.serials.length ? (
            <fieldset className="space-y-2">
              <legend className="text-sm font-medium text-ink-800">Serial numbers of the failed units</legend>
              {inst.serials.length > 8 ? (
                <InputField
                  label="Find a serial"
                  value={serialFilter}
                  onChange={(e) => setSerialFilter(e.target.value)}
                />
              ) : null}
              <div className="grid grid-cols-1 gap-2 sm:grid-cols-2">
                {serialsShown.map((s) => (
                  <label
                    key={s}
                    className="flex min-h-11 items-center gap-3 rounded-lg border border-ink-200 px-3"
                  >
                    <input type="checkbox" value={s} className="size-5" {...register('serials')} />
                    <span className="font-mono text-sm">{s}</span>
                  </label>
                ))}
              </div>
              {err('serials') ? <p className="text-sm font-medium text-bad-700">{err('serials')}</p> : null}
            </fieldset>
          ) : (
            <InputField
              label="Serial numbers or date codes"
              hint="Separate several with commas."
              defaultValue={selectedSerials.join(', ')}
              onChange={(e) =>
                setValue('serials', e.target.value.split(/[,;\s]+/).filter(Boolean), { shouldDirty: true })
              }
              error={err('serials')}
            />
          )}
          <div className="grid gap-4 sm:grid-cols-2">
            <InputField
              label="Units failed"
              inputMode="numeric"
              placeholder={selectedSerials.length ? String(selectedSerials.length) : '1'}
              hint={`Of ${inst.quantity} installed.`}
              error={err('units')}
              {...register('units')}
            />
            <InputField
              label="Failure date"
              type="date"
              max={todayIn()}
              error={err('failedOn')}
              {...register('failedOn')}
            />
          </div>
          <fieldset>
            <legend className="mb-2 text-sm font-medium text-ink-800">What the fixture does</legend>
            <div className="grid grid-cols-1 gap-2 sm:grid-cols-2">
              {SYMPTOMS.map((s) => (
                <label
                  key={s}
                  className="flex min-h-11 items-center gap-3 rounded-lg border border-ink-200 px-3 text-sm"
                >
                  <input type="checkbox" value={s} className="size-5" {...register('symptoms')} />
                  {SYMPTOM_LABELS[s]}
                </label>
              ))}
            </div>
            {err('symptoms') ? (
              <p className="mt-1 text-sm font-medium text-bad-700">{err('symptoms')}</p>
            ) : null}
          </fieldset>
        </Section>

        <SafetyCallout />

        <Section n={2} title="Readings" id="readings">
          <p className="text-sm text-ink-600">
            Type what the meter shows; a decimal comma works too. Leave out what you did not measure.
          </p>
          <div className="grid gap-4 sm:grid-cols-2">
            <MeterField
              label="Supply voltage"
              unit="V"
              error={err('measurements.supplyVolts')}
              {...register('measurements.supplyVolts')}
            />
            <MeterField
              label="Input power"
              unit="W"
              error={err('measurements.inputWatts')}
              {...register('measurements.inputWatts')}
            />
            <MeterField
              label="Power factor"
              unit="0–1"
              hint="0.93, not 93 %."
              error={err('measurements.powerFactor')}
              {...register('measurements.powerFactor')}
            />
            <MeterField
              label="Driver output voltage"
              unit="V DC"
              error={err('measurements.driverOutputVolts')}
              {...register('measurements.driverOutputVolts')}
            />
            <MeterField
              label="Driver output current"
              unit="A"
              ampUnit={{
                value: units.driverOutputAmps,
                onChange: (u) => setUnits({ ...units, driverOutputAmps: u }),
              }}
              error={err('measurements.driverOutputAmps')}
              {...register('measurements.driverOutputAmps')}
            />
          </div>
          <fieldset className="space-y-2">
            <legend className="text-sm font-medium text-ink-800">
              Each LED string ({claim.engineContext.product.ledStrings} strings of{' '}
              {claim.engineContext.product.ledsPerString} LEDs; expected{' '}
              {(
                claim.engineContext.product.ledsPerString * claim.engineContext.product.ledForwardVolts
              ).toFixed(1)}{' '}
              V each)
            </legend>
            <div
              role="group"
              aria-label="Unit for string current"
              className="flex items-center gap-2 text-sm"
            >
              <span className="text-ink-700">String current in</span>
              {(['A', 'mA'] as const).map((u) => (
                <button
                  key={u}
                  type="button"
                  aria-pressed={units.stringAmps === u}
                  onClick={() => setUnits({ ...units, stringAmps: u })}
                  className={cn(
                    'h-11 min-w-11 rounded-lg border px-3 font-semibold',
                    units.stringAmps === u
                      ? 'border-brand-700 bg-brand-700 text-white'
                      : 'border-ink-300 bg-white',
                  )}
                >
                  {u}
                </button>
              ))}
            </div>
            <ol className="space-y-2">
              {strings.map((_, i) => (
                <li key={i} className="grid grid-cols-[2.5rem_repeat(3,minmax(0,1fr))] items-start gap-2">
                  <span className="pt-8 text-sm font-semibold text-ink-700">#{i + 1}</span>
                  <MeterField
                    label={`String ${i + 1} voltage`}
                    unit="V"
                    error={err(`measurements.strings.${i}.volts`)}
                    {...register(`measurements.strings.${i}.volts`)}
                  />
                  <MeterField
                    label={`String ${i + 1} current`}
                    unit={units.stringAmps}
                    error={err(`measurements.strings.${i}.amps`)}
                    {...register(`measurements.strings.${i}.amps`)}
                  />
                  <MeterField
                    label={`String ${i + 1} dark LEDs`}
                    unit="count"
                    inputMode="numeric"
                    error={err(`measurements.strings.${i}.darkLeds`)}
                    {...register(`measurements.strings.${i}.darkLeds`)}
                  />
                </li>
              ))}
            </ol>
          </fieldset>
        </Section>

        <Section n={3} title="What you saw">
          <fieldset>
            <legend className="mb-2 text-sm font-medium text-ink-800">
              Tick what you found at the fixture
            </legend>
            <div className="grid grid-cols-1 gap-2 sm:grid-cols-2">
              {OBSERVATIONS.map((k) => (
                <label
                  key={k}
                  className="flex min-h-11 items-center gap-3 rounded-lg border border-ink-200 px-3 text-sm"
                >
                  <input type="checkbox" className="size-5" {...register(`observations.${k}`)} />
                  {OBSERVATION_LABELS[k]}
                </label>
              ))}
            </div>
          </fieldset>
          <div className="space-y-1.5">
            <label htmlFor="claim-narrative" className="block text-sm font-medium text-ink-800">
              What happened
            </label>
            <textarea
              id="claim-narrative"
              rows={4}
              aria-invalid={err('narrative') ? true : undefined}
              className="block w-full rounded-lg border border-ink-300 px-3 py-2 text-base sm:text-sm"
              placeholder="When it started, what it does now, what you checked."
              {...register('narrative')}
            />
            {err('narrative') ? <p className="text-sm font-medium text-bad-700">{err('narrative')}</p> : null}
          </div>
        </Section>

        <Section n={4} title="Photos and proof of purchase">
          <AttachmentsPanel
            claimId={claim.id}
            attachments={attachments}
            editable
            removable
            onChange={setAttachments}
          />
        </Section>

        <Card className="p-4 sm:p-5">
          {missing.length ? (
            <div className="mb-3 text-sm">
              <p className="font-medium text-ink-900">Before filing:</p>
              <ul className="mt-1 list-disc space-y-0.5 pl-5 text-ink-700">
                {missing.slice(0, 8).map((m) => (
                  <li key={`${m.path}-${m.message}`}>{m.message}</li>
                ))}
              </ul>
            </div>
          ) : (
            <p className="mb-3 text-sm text-ink-700">
              Ready to file with{' '}
              {inst.policyVersion
                ? `${inst.policyVersion.policyName}, version ${inst.policyVersion.versionNumber}`
                : 'the manufacturer'}
              .
            </p>
          )}
          {file.error ? (
            <div role="alert" className="mb-3 text-sm font-medium text-bad-700">
              <p>{file.error.message}</p>
              {file.error instanceof ApiError && file.error.details.length ? (
                <ul className="list-disc pl-5">
                  {file.error.details.map((d) => (
                    <li key={`${d.path}-${d.message}`}>{d.message}</li>
                  ))}
                </ul>
              ) : null}
            </div>
          ) : null}
          <Button
            type="submit"
            size="lg"
            className="w-full sm:w-auto"
            loading={file.isPending}
            disabled={missing.length > 0}
            icon={<Send className="size-5" aria-hidden />}
          >
            File claim
          </Button>
        </Card>
      </form>
      <aside id="live-evaluation" aria-label="Live evaluation" className="min-w-0 lg:sticky lg:top-4">
        {renderEvaluation(liveInput, 'panel')}
      </aside>
    </div>
  );
}
