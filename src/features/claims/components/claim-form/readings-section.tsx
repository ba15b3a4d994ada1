import type { UseFormRegister } from 'react-hook-form';
import type { ClaimDetailDto } from '../../../../../shared/schemas/claims';
import { cn } from '../../../../lib/cn';
import type { FieldError } from '../../hooks/use-claim-form';
import type { ClaimFormValues, ReadingUnits } from '../claim-form-values';
import { MeterField } from '../meter-field';
import { Section } from './section';

/** Section 2: the meter readings at the fixture, the driver's and each LED string's, in the units chosen. */
export function ReadingsSection({
  product,
  strings,
  units,
  setUnits,
  register,
  err,
}: {
  product: ClaimDetailDto['engineContext']['product'];
  strings: unknown[];
  units: ReadingUnits;
  setUnits: (next: ReadingUnits) => void;
  register: UseFormRegister<ClaimFormValues>;
  err: FieldError;
}) {
  return (
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
          Each LED string ({product.ledStrings} strings of {product.ledsPerString} LEDs; expected{' '}
          {(product.ledsPerString * product.ledForwardVolts).toFixed(1)} V each)
        </legend>
        <div role="group" aria-label="Unit for string current" className="flex items-center gap-2 text-sm">
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
  );
}
