import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useDeferredValue, useMemo, useState } from 'react';
import { Controller, useForm, useWatch } from 'react-hook-form';
import { checkInstallationFit } from '../../../../shared/catalogue/installation-fit';
import {
  DIMMER_LABELS,
  DIMMERS,
  ENCLOSURE_LABELS,
  ENCLOSURES,
  installationConditionsSchema,
  installationSchemas,
  latestInstallDate,
  LOCATION_LABELS,
  LOCATIONS,
  NOMINAL_SUPPLY_VOLTS,
  type InstallationDetailDto,
  type InstallationInput,
  type InstallationValues,
} from '../../../../shared/schemas/catalogue';
import { Button } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { FieldShell, InputField, optionsOf, SelectField } from '../../../components/ui/field';
import { ApiError } from '../../../lib/api-client';
import { installationQueries } from '../api/installation-queries';
import { productQueries } from '../api/product-queries';
import { registerInstallation } from '../api/save-installation';
import { FitWarnings } from './fit-warnings';

const numberOrUndefined = (v: unknown) => (v === '' || v === null || v === undefined ? undefined : Number(v));
const orNull = (v: unknown) => (v === '' || v === undefined ? null : v);
const splitSerials = (s: string) => s.split(/[\s,;]+/).filter(Boolean);

/** Register an installation; the fit against the product's ratings is shown as the conditions are chosen. */
export function InstallationForm({
  onSaved,
  onCancel,
}: {
  onSaved: (i: InstallationDetailDto) => void;
  onCancel: () => void;
}) {
  const qc = useQueryClient();
  const [productSearch, setProductSearch] = useState('');
  const products = useQuery(productQueries.list({ page: 1, pageSize: 100, q: productSearch || undefined }));
  // The browser's clock only for early feedback: the server checks the install date against its own.
  const [latest] = useState(() => latestInstallDate(new Date()));
  const schema = useMemo(() => installationSchemas(latest).input, [latest]);
  const form = useForm<InstallationInput, unknown, InstallationValues>({
    resolver: zodResolver(schema),
    mode: 'onTouched',
    defaultValues: {
      serials: [],
      location: 'dry',
      enclosure: 'open',
      dimmer: 'none',
      nominalSupplyVolts: 277,
      purchaseDate: null,
    } as unknown as InstallationInput,
  });
  const watched = useWatch({ control: form.control });
  const deferred = useDeferredValue(watched);
  const product = products.data?.items.find((p) => p.id === deferred.productModelId);
  const warnings = useMemo(() => {
    if (!product) return null;
    const c = installationConditionsSchema.safeParse({
      location: deferred.location,
      enclosure: deferred.enclosure,
      dimmer: deferred.dimmer,
      nominalSupplyVolts: deferred.nominalSupplyVolts,
      hoursPerDay: deferred.hoursPerDay ?? 0,
      ambientC: deferred.ambientC ?? 0,
    });
    return c.success ? checkInstallationFit(product, c.data) : null;
  }, [product, deferred]);
  const save = useMutation({
    mutationFn: registerInstallation,
    onSuccess: async ({ installation }) => {
      await qc.invalidateQueries({ queryKey: installationQueries.all });
      onSaved(installation);
    },
    onError: (e) => {
      if (e instanceof ApiError)
        for (const d of e.details) form.setError(d.path as keyof InstallationInput, { message: d.message });
    },
  });
  const err = (k: keyof InstallationInput) => form.formState.errors[k]?.message as string | undefined;
  const formError = save.error instanceof ApiError ? save.error.message : null;

  return (
    <form noValidate onSubmit={form.handleSubmit((v) => save.mutate(v))} className="space-y-5">
      {formError ? (
        <p role="alert" className="rounded-lg bg-bad-50 px-3 py-2 text-sm text-bad-800">
          {formError}
        </p>
      ) : null}
      <Card>
        <CardHeader title="Product" />
        <div className="grid gap-4 p-4 sm:grid-cols-2 sm:p-5">
          <InputField
            label="Find a model"
            type="search"
            placeholder="Model number or name"
            value={productSearch}
            onChange={(e) => setProductSearch(e.target.value)}
          />
          <SelectField
            label="Product model"
            error={err('productModelId')}
            {...form.register('productModelId')}
          >
            <option value="">Choose a model</option>
            {(products.data?.items ?? []).map((p) => (
              <option key={p.id} value={p.id}>
                {p.modelNumber} · {p.name} ({p.manufacturer.name})
              </option>
            ))}
          </SelectField>
          <InputField
            label="Quantity"
            unit="units"
            type="number"
            inputMode="numeric"
            step="1"
            error={err('quantity')}
            {...form.register('quantity', { setValueAs: numberOrUndefined })}
          />
          <Controller
            control={form.control}
            name="serials"
            render={({ field, fieldState }) => (
              <FieldShell
                label="Serial numbers or date codes"
                hint="One per unit, separated by spaces, commas or new lines."
                error={fieldState.error?.message}
              >
                {({ id, describedBy }) => (
                  <textarea
                    id={id}
                    aria-describedby={describedBy}
                    rows={3}
                    onChange={(e) => field.onChange(splitSerials(e.target.value))}
                    onBlur={field.onBlur}
                    className="block w-full rounded-lg border border-ink-300 px-3 py-2 text-base sm:text-sm"
                  />
                )}
              </FieldShell>
            )}
          />
          <InputField
            label="Lot (optional)"
            hint="The manufacturing lot or date code printed on the units' labels, like AC2401."
            error={err('lot')}
            {...form.register('lot', { setValueAs: orNull })}
          />
        </div>
      </Card>
      <Card>
        <CardHeader title="Site" />
        <div className="grid gap-4 p-4 sm:grid-cols-2 sm:p-5">
          <InputField label="Site name" error={err('siteName')} {...form.register('siteName')} />
          <InputField
            label="Street address"
            autoComplete="street-address"
            error={err('siteAddress')}
            {...form.register('siteAddress')}
          />
          <InputField label="City" error={err('siteCity')} {...form.register('siteCity')} />
          <InputField label="State or province" error={err('siteRegion')} {...form.register('siteRegion')} />
          <InputField
            label="Postal code"
            error={err('sitePostalCode')}
            {...form.register('sitePostalCode')}
          />
        </div>
      </Card>
      <Card>
        <CardHeader title="Purchase" />
        <div className="grid gap-4 p-4 sm:grid-cols-2 sm:p-5">
          <InputField
            label="Install date"
            type="date"
            max={latest}
            error={err('installDate')}
            {...form.register('installDate')}
          />
          <InputField
            label="Purchase date (optional)"
            type="date"
            error={err('purchaseDate')}
            {...form.register('purchaseDate', { setValueAs: orNull })}
          />
          <InputField
            label="Distributor (optional)"
            error={err('distributor')}
            {...form.register('distributor', { setValueAs: orNull })}
          />
          <InputField
            label="Invoice number (optional)"
            error={err('invoiceNumber')}
            {...form.register('invoiceNumber', { setValueAs: orNull })}
          />
        </div>
      </Card>
      <Card>
        <CardHeader
          title="Conditions as installed"
          description="Checked against the product's ratings as you choose."
        />
        <div className="grid gap-4 p-4 sm:grid-cols-2 sm:p-5 lg:grid-cols-3">
          <SelectField label="Location" error={err('location')} {...form.register('location')}>
            {optionsOf(LOCATIONS, (l) => LOCATION_LABELS[l])}
          </SelectField>
          <SelectField label="Enclosure" error={err('enclosure')} {...form.register('enclosure')}>
            {optionsOf(ENCLOSURES, (x) => ENCLOSURE_LABELS[x])}
          </SelectField>
          <SelectField label="Dimmer" error={err('dimmer')} {...form.register('dimmer')}>
            {optionsOf(DIMMERS, (d) => DIMMER_LABELS[d])}
          </SelectField>
          <SelectField
            label="Nominal supply (V)"
            error={err('nominalSupplyVolts')}
            {...form.register('nominalSupplyVolts', { setValueAs: Number })}
          >
            {optionsOf(NOMINAL_SUPPLY_VOLTS, (v) => `${v} V`)}
          </SelectField>
          <InputField
            label="Hours of use a day"
            unit="h"
            type="number"
            inputMode="decimal"
            step="any"
            error={err('hoursPerDay')}
            {...form.register('hoursPerDay', { setValueAs: numberOrUndefined })}
          />
          <InputField
            label="Ambient temperature"
            unit="°C"
            type="number"
            inputMode="decimal"
            step="any"
            error={err('ambientC')}
            {...form.register('ambientC', { setValueAs: numberOrUndefined })}
          />
        </div>
        <div className="px-4 pb-4 sm:px-5" aria-live="polite">
          {warnings ? (
            <FitWarnings warnings={warnings} live />
          ) : (
            <p className="text-sm text-ink-600">
              Choose a model to check the conditions against its ratings.
            </p>
          )}
        </div>
      </Card>
      <div className="flex flex-wrap justify-end gap-2">
        <Button variant="secondary" onClick={onCancel}>
          Cancel
        </Button>
        <Button type="submit" loading={save.isPending}>
          Register the installation
        </Button>
      </div>
    </form>
  );
}
