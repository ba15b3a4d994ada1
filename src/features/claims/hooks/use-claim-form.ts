import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useEffect, useMemo, useRef, useState } from 'react';
import { useForm, useWatch, type FieldErrors, type Resolver } from 'react-hook-form';
import { engineInputFor } from '../../../../shared/claims/engine-input';
import {
  filingIssues,
  type ClaimDetailDto,
  type ClaimFields,
  type FilingIssue,
} from '../../../../shared/schemas/claims';
import type { AttachmentDto } from '../../../../shared/schemas/attachments';
import { ApiError, newIdempotencyKey } from '../../../lib/api-client';
import { fileClaim } from '../api/claim-mutations';
import { todayIn } from '../../../../shared/dates';
import { claimQueries } from '../api/claim-queries';
import {
  checkValues,
  DEFAULT_UNITS,
  fieldsFromValues,
  valuesFromClaim,
  type ClaimFormValues,
  type ReadingUnits,
} from '../components/claim-form-values';
import { readLocalDraft, useDraftSync } from './use-draft-sync';

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

/** A field's message by its dotted path ("measurements.strings.0.amps"), or undefined. */
export type FieldError = (path: string) => string | undefined;

/**
 * The state of the claim form: the react-hook-form form over the draft (checked by the shared filing rules),
 * the reading units (kept on this device), the draft's sync with the server and this device, the engine's
 * live input, what is still missing before filing, and the filing itself (one Idempotency-Key per form).
 */
export function useClaimForm(claim: ClaimDetailDto) {
  const qc = useQueryClient();
  const [units, setUnitsState] = useState<ReadingUnits>(loadUnits);
  const unitsRef = useRef(units);
  unitsRef.current = units;
  const [attachments, setAttachments] = useState<AttachmentDto[]>(claim.attachments);
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

  const err = (path: string) => {
    let o: unknown = errors;
    for (const p of path.split('.')) o = (o as Record<string, unknown> | undefined)?.[p];
    return (o as { message?: string } | undefined)?.message;
  };

  // The conflict notice's two ways out.
  const keepMine = () => {
    if (staleLocal) reset(staleLocal.values);
    setStaleLocal(null);
    void sync.keepMine();
  };
  const takeSaved = () => {
    setStaleLocal(null);
    void sync.discardMine().then(() => {
      const fresh = qc.getQueryData(claimQueries.detail(claim.id).queryKey);
      if (fresh) reset(valuesFromClaim(fresh.claim, unitsRef.current));
    });
  };
  const submit = () => void trigger().then(() => file.mutate());

  return {
    register,
    setValue,
    err: err as FieldError,
    values,
    units,
    setUnits,
    attachments,
    setAttachments,
    liveInput,
    missing,
    file,
    submit,
    sync,
    conflict: sync.status === 'conflict' || staleLocal !== null,
    keepMine,
    takeSaved,
  };
}
