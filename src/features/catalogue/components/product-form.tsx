import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import {
  DIMMING_LABELS,
  DIMMINGS,
  FAMILY_LABELS,
  LOCATION_LABELS,
  LOCATIONS,
  PRODUCT_FAMILIES,
  productInputSchema,
  type ProductDto,
  type ProductInput,
  type ProductValues,
} from '../../../../shared/schemas/catalogue';
import { Button } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { InputField, optionsOf, SelectField } from '../../../components/ui/field';
import { ApiError } from '../../../lib/api-client';
import { productQueries } from '../api/product-queries';
import { createProduct, updateProduct } from '../api/save-product';

const numberOrUndefined = (v: unknown) => (v === '' || v === null || v === undefined ? undefined : Number(v));
const numberOrNull = (v: unknown) => (v === '' || v === null || v === undefined ? null : Number(v));

const EMPTY: Partial<ProductInput> = {
  family: 'high_bay',
  location: 'dry',
  dimming: 'none',
  enclosedRated: false,
  activeCooling: false,
};

/** Create or edit a product model. The same schema as the server checks every bound as the user types. */
export function ProductForm({
  product,
  onSaved,
  onCancel,
}: {
  product?: ProductDto;
  onSaved: (p: ProductDto) => void;
  onCancel: () => void;
}) {
  const qc = useQueryClient();
  const form = useForm<ProductInput, unknown, ProductValues>({
    resolver: zodResolver(productInputSchema),
    mode: 'onTouched',
    defaultValues: product
      ? (Object.fromEntries(
          Object.entries(product).filter(
            ([k]) => !['id', 'manufacturer', 'createdAt', 'updatedAt', 'version'].includes(k),
          ),
        ) as ProductInput)
      : (EMPTY as ProductInput),
  });
  const save = useMutation({
    mutationFn: (v: ProductValues) => (product ? updateProduct(product.id, v) : createProduct(v)),
    onSuccess: async ({ product: saved }) => {
      await qc.invalidateQueries({ queryKey: productQueries.all });
      onSaved(saved);
    },
    onError: (e) => {
      if (e instanceof ApiError) {
        for (const d of e.details) form.setError(d.path as keyof ProductInput, { message: d.message });
        if (e.code === 'product.model_number_taken') form.setError('modelNumber', { message: e.message });
      }
    },
  });
  const err = (k: keyof ProductInput) => form.formState.errors[k]?.message;
  const num = (
    k: keyof ProductInput,
    label: string,
    unit: string | undefined,
    step = 'any',
    optional = false,
  ) => (
    <InputField
      label={label}
      unit={unit}
      type="number"
      inputMode="decimal"
      step={step}
      error={err(k)}
      {...form.register(k, { setValueAs: optional ? numberOrNull : numberOrUndefined })}
    />
  );
  const formError =
    save.error instanceof ApiError &&
    !save.error.details.length &&
    save.error.code !== 'product.model_number_taken'
      ? save.error.message
      : null;

  return (
    <form noValidate onSubmit={form.handleSubmit((v) => save.mutate(v))} className="space-y-5">
      {formError ? (
        <p role="alert" className="rounded-lg bg-bad-50 px-3 py-2 text-sm text-bad-800">
          {formError}
        </p>
      ) : null}
      <Card>
        <CardHeader title="Identity" />
        <div className="grid gap-4 p-4 sm:grid-cols-2 sm:p-5">
          <InputField
            label="Model number"
            autoComplete="off"
            error={err('modelNumber')}
            {...form.register('modelNumber')}
          />
          <InputField label="Name" autoComplete="off" error={err('name')} {...form.register('name')} />
          <SelectField label="Family" error={err('family')} {...form.register('family')}>
            {optionsOf(PRODUCT_FAMILIES, (f) => FAMILY_LABELS[f])}
          </SelectField>
        </div>
      </Card>
      <Card>
        <CardHeader title="Electrical ratings" description="As on the nameplate and datasheet." />
        <div className="grid gap-4 p-4 sm:grid-cols-2 sm:p-5 lg:grid-cols-3">
          {num('ratedInputWatts', 'Rated input power', 'W')}
          {num('inputVoltsMin', 'Input voltage, lowest', 'V')}
          {num('inputVoltsMax', 'Input voltage, highest', 'V')}
          {num('ratedLumens', 'Rated light output', 'lm', '1')}
          {num('ledStrings', 'LED strings', 'count', '1')}
          {num('ledsPerString', 'LEDs per string', 'count', '1')}
          {num('ledForwardVolts', 'Nominal forward voltage per LED', 'V')}
          {num('driverOutputAmps', 'Driver output current', 'A')}
          {num('driverMaxOutputVolts', 'Driver open-circuit limit (optional)', 'V', 'any', true)}
        </div>
      </Card>
      <Card>
        <CardHeader title="Application ratings" />
        <div className="grid gap-4 p-4 sm:grid-cols-2 sm:p-5 lg:grid-cols-3">
          <SelectField label="Location rating" error={err('location')} {...form.register('location')}>
            {optionsOf(LOCATIONS, (l) => LOCATION_LABELS[l])}
          </SelectField>
          <SelectField label="Dimming" error={err('dimming')} {...form.register('dimming')}>
            {optionsOf(DIMMINGS, (d) => DIMMING_LABELS[d])}
          </SelectField>
          {num('ambientMaxC', 'Rated ambient maximum', '°C')}
          {num('ratedLifeHours', 'Rated life', 'h', '1')}
          <label className="flex min-h-11 items-center gap-3 text-sm font-medium text-ink-800">
            <input
              type="checkbox"
              className="size-5 rounded border-ink-300"
              {...form.register('enclosedRated')}
            />
            Rated for totally enclosed luminaires
          </label>
          <label className="flex min-h-11 items-center gap-3 text-sm font-medium text-ink-800">
            <input
              type="checkbox"
              className="size-5 rounded border-ink-300"
              {...form.register('activeCooling')}
            />
            Active cooling (fan)
          </label>
        </div>
      </Card>
      <div className="flex flex-wrap justify-end gap-2">
        <Button variant="secondary" onClick={onCancel}>
          Cancel
        </Button>
        <Button type="submit" loading={save.isPending}>
          {product ? 'Save changes' : 'Add the model'}
        </Button>
      </div>
    </form>
  );
}
