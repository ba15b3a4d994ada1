import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Controller, useForm } from 'react-hook-form';
import { z } from 'zod';
import { str } from '../../../../shared/schemas/text';
import {
  EXCLUSION_LABELS,
  EXCLUSIONS,
  policyTermsSchema,
  type DenialReason,
  type PolicyDetailDto,
  type PolicyTermsInput,
} from '../../../../shared/schemas/catalogue';
import { Button } from '../../../components/ui/button';
import { Dialog } from '../../../components/ui/dialog';
import { FieldShell, InputField } from '../../../components/ui/field';
import { FormError, formErrorText, TextField } from '../../../components/ui/form';
import { useToast } from '../../../components/ui/toast';
import { ApiError } from '../../../lib/api-client';
import { useSession } from '../../../lib/ability';
import { policyQueries } from '../api/policy-queries';
import { productQueries } from '../api/product-queries';
import { addPolicyVersion, createPolicy } from '../api/save-policy';

const numberOrUndefined = (v: unknown) => (v === '' || v === null || v === undefined ? undefined : Number(v));

// One form for a new policy (name, models, terms) and for a new version of one (terms only).
const newPolicySchema = z.strictObject({
  name: str().trim().min(1, 'Enter a policy name.').max(160),
  productModelIds: z.array(str()).min(1, 'Attach the policy to at least one product model.'),
  terms: policyTermsSchema,
});
type FormValues = { name: string; productModelIds: string[]; terms: PolicyTermsInput };

const reasonsText = (r: DenialReason[]) => r.map((x) => `${x.code}: ${x.label}`).join('\n');
const parseReasons = (s: string): DenialReason[] =>
  s
    .split('\n')
    .map((l) => l.trim())
    .filter(Boolean)
    .map((l) => {
      const i = l.indexOf(':');
      return i === -1 ? { code: l, label: '' } : { code: l.slice(0, i).trim(), label: l.slice(i + 1).trim() };
    });

export function PolicyTermsDialog({
  open,
  onClose,
  policy,
}: {
  open: boolean;
  onClose: () => void;
  policy?: PolicyDetailDto;
}) {
  const qc = useQueryClient();
  const { notify } = useToast();
  const { user } = useSession();
  const latest = policy?.versions.at(-1);
  const models = useQuery({
    ...productQueries.list({ page: 1, pageSize: 200, manufacturerId: user.organization.id }),
    enabled: open && !policy,
  });
  const form = useForm<FormValues>({
    resolver: zodResolver(
      policy
        ? z.object({ name: str(), productModelIds: z.array(str()), terms: policyTermsSchema })
        : newPolicySchema,
    ) as never,
    defaultValues: {
      name: policy?.name ?? '',
      productModelIds: [],
      terms: latest
        ? {
            effectiveFrom: '',
            termMonths: latest.termMonths,
            fullCoverageMonths: latest.fullCoverageMonths,
            filingWindowDays: latest.filingWindowDays,
            darkLedFailurePercent: latest.darkLedFailurePercent,
            unitCredit: latest.unitCredit,
            currency: latest.currency,
            labourAllowance: latest.labourAllowance,
            requiredPhotos: latest.requiredPhotos,
            proofOfPurchaseRequired: latest.proofOfPurchaseRequired,
            exclusions: latest.exclusions,
            denialReasons: latest.denialReasons,
            changeNote: '',
          }
        : ({
            effectiveFrom: '',
            currency: 'USD',
            exclusions: [],
            denialReasons: [],
            proofOfPurchaseRequired: true,
            unitCredit: '',
            labourAllowance: '0.00',
          } as unknown as PolicyTermsInput),
    },
  });
  const save = useMutation({
    mutationFn: (v: FormValues) => (policy ? addPolicyVersion(policy.id, v.terms) : createPolicy(v)),
    onSuccess: async () => {
      notify(policy ? 'The new version is saved. Earlier versions stay as they were.' : 'Policy created.');
      onClose();
      await qc.invalidateQueries({ queryKey: policyQueries.all });
    },
    onError: (e) => {
      if (e instanceof ApiError)
        for (const d of e.details)
          form.setError((policy ? `terms.${d.path}` : d.path) as never, { message: d.message });
    },
  });
  const te = form.formState.errors.terms;
  const num = (k: keyof PolicyTermsInput, label: string, unit?: string) => (
    <TextField
      form={form}
      name={`terms.${k}`}
      options={{ setValueAs: numberOrUndefined }}
      label={label}
      unit={unit}
      type="number"
      inputMode="decimal"
      step="any"
    />
  );

  return (
    <Dialog
      open={open}
      onClose={onClose}
      title={policy ? `New version of ${policy.name}` : 'New warranty policy'}
      description={
        policy
          ? 'Versions are never edited: the new terms apply to units bought (or installed) from the effective date on.'
          : undefined
      }
      footer={
        <>
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" form="policy-terms" loading={save.isPending}>
            {policy ? 'Save the new version' : 'Create the policy'}
          </Button>
        </>
      }
    >
      <form
        id="policy-terms"
        noValidate
        className="space-y-4"
        onSubmit={form.handleSubmit((v) => save.mutate(v))}
      >
        <FormError message={formErrorText(save.error)} />
        {!policy ? (
          <>
            <TextField form={form} name="name" label="Policy name" />
            <fieldset>
              <legend className="text-sm font-medium text-ink-800">Product models covered</legend>
              <div className="mt-1 max-h-40 space-y-1 overflow-y-auto rounded-lg border border-ink-200 p-2">
                {(models.data?.items ?? []).map((p) => (
                  <label key={p.id} className="flex min-h-11 items-center gap-3 text-sm">
                    <input
                      type="checkbox"
                      value={p.id}
                      className="size-5"
                      {...form.register('productModelIds')}
                    />
                    {p.modelNumber} · {p.name}
                  </label>
                ))}
              </div>
              {form.formState.errors.productModelIds ? (
                <p className="mt-1 text-sm font-medium text-bad-700">
                  {form.formState.errors.productModelIds.message}
                </p>
              ) : null}
            </fieldset>
          </>
        ) : null}
        <InputField
          label="In force from"
          type="date"
          error={te?.effectiveFrom?.message}
          {...form.register('terms.effectiveFrom')}
        />
        <div className="grid gap-4 sm:grid-cols-2">
          {num('termMonths', 'Term', 'months')}
          {num('fullCoverageMonths', 'Full coverage', 'months')}
          {num('filingWindowDays', 'Filing window', 'days')}
          {num('darkLedFailurePercent', 'Failure threshold', '% of LEDs dark')}
          <InputField
            label="Unit credit"
            unit="amount"
            inputMode="decimal"
            error={te?.unitCredit?.message}
            {...form.register('terms.unitCredit')}
          />
          <InputField
            label="Currency"
            unit="ISO 4217"
            maxLength={3}
            error={te?.currency?.message}
            {...form.register('terms.currency')}
          />
          <InputField
            label="Labour allowance"
            unit="amount per unit"
            inputMode="decimal"
            error={te?.labourAllowance?.message}
            {...form.register('terms.labourAllowance')}
          />
          {num('requiredPhotos', 'Required photos', 'count')}
        </div>
        <label className="flex min-h-11 items-center gap-3 text-sm font-medium text-ink-800">
          <input type="checkbox" className="size-5" {...form.register('terms.proofOfPurchaseRequired')} />{' '}
          Proof of purchase required
        </label>
        <fieldset>
          <legend className="text-sm font-medium text-ink-800">Exclusions in force</legend>
          <div className="mt-1 space-y-1">
            {EXCLUSIONS.map((x) => (
              <label key={x} className="flex min-h-11 items-center gap-3 text-sm">
                <input type="checkbox" value={x} className="size-5" {...form.register('terms.exclusions')} />
                {EXCLUSION_LABELS[x]}
              </label>
            ))}
          </div>
        </fieldset>
        <Controller
          control={form.control}
          name="terms.denialReasons"
          render={({ field, fieldState }) => (
            <FieldShell
              label="Denial reason codes"
              hint='One a line, as "CODE: reason in words".'
              error={
                fieldState.error?.message ?? (te?.denialReasons as { message?: string } | undefined)?.message
              }
            >
              {({ id, describedBy }) => (
                <textarea
                  id={id}
                  aria-describedby={describedBy}
                  rows={4}
                  defaultValue={reasonsText(field.value as DenialReason[])}
                  onBlur={(e) => field.onChange(parseReasons(e.target.value))}
                  className="block w-full rounded-lg border border-ink-300 px-3 py-2 text-base sm:text-sm"
                />
              )}
            </FieldShell>
          )}
        />
        <TextField form={form} name="terms.changeNote" label="What changed (optional)" />
      </form>
    </Dialog>
  );
}
