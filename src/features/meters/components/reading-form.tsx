import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { readingInputSchema, type MeterRow } from '../../../../shared/schemas/machines';
import { SelectField, TextField } from '../../../components/ui/field';
import { CONVERTIBLE_UNITS, quantityOf } from '../../../../shared/domain/units';
import { Button } from '../../../components/ui/button';
import { FormMessages } from '../../../components/ui/notice';
import { applyServerErrors } from '../../../lib/form-errors';
import { useAddReading } from '../api/add-reading';
import { formatValue } from './format';
import { useShopFormat } from '../../../lib/format';
import { useShopInput } from '../../../lib/shop-time';

type In = z.input<typeof readingInputSchema>;
type Out = z.output<typeof readingInputSchema>;

/** Type in a reading. Counts and hours must not go backwards unless marked as a reset. */
export function ReadingForm({ meter }: { meter: MeterRow }) {
  const f = useShopFormat();
  const input = useShopInput();
  const add = useAddReading();
  const [formError, setFormError] = useState<string | null>(null);
  const [saved, setSaved] = useState<string | null>(null);
  const { register, handleSubmit, setError, reset, formState } = useForm<In, unknown, Out>({
    resolver: zodResolver(readingInputSchema),
    defaultValues: { isReset: false },
  });
  const cumulative = meter.kind !== 'condition';
  // A pressure or temperature may be read in another unit; the server converts it into the meter's own.
  const quantity = quantityOf(meter.unit);
  const units = quantity ? CONVERTIBLE_UNITS.filter((u) => quantityOf(u) === quantity) : [];
  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    setSaved(null);
    try {
      await add.mutateAsync({ meterId: meter.id, ...values });
      const shown =
        values.unit && values.unit !== meter.unit
          ? `${formatValue(f, values.value, values.unit)}, stored in ${meter.unit}`
          : formatValue(f, values.value, meter.unit);
      setSaved(`Recorded ${shown}.`);
      reset({ isReset: false, value: undefined, readAt: undefined, note: '', unit: values.unit });
    } catch (err) {
      setFormError(applyServerErrors(err, setError, ['value', 'readAt', 'isReset', 'note', 'unit']));
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label={`New reading for ${meter.name}`} className="grid gap-4 md:grid-cols-2">
      <div className="space-y-2 md:col-span-2">
        <FormMessages error={formError} saved={saved} />
      </div>
      <TextField
        label={units.length > 1 ? 'Reading' : `Reading (${meter.unit})`}
        inputMode="decimal"
        autoComplete="off"
        hint={meter.latest ? `Last: ${formatValue(f, meter.latest.value, meter.unit)}` : 'First reading of this meter'}
        error={formState.errors.value?.message}
        {...register('value')}
      />
      {units.length > 1 ? (
        <SelectField
          label="Read in"
          hint={`Stored in ${meter.unit} (NIST SP 811 factors)`}
          error={formState.errors.unit?.message}
          options={units.map((u) => ({ value: u, label: u }))}
          defaultValue={meter.unit}
          {...register('unit')}
        />
      ) : null}
      <TextField
        label="Read at"
        type="datetime-local"
        hint="Leave empty for now"
        error={formState.errors.readAt?.message}
        {...register('readAt', { setValueAs: (v: string) => input.fromLocalInput(v) ?? undefined })}
      />
      {cumulative ? (
        <label className="flex min-h-touch items-center gap-3 text-base">
          <input type="checkbox" className="h-6 w-6" {...register('isReset')} />
          The counter was reset or replaced and starts again from zero
        </label>
      ) : null}
      <TextField label="Note (optional)" autoComplete="off" error={formState.errors.note?.message} {...register('note')} />
      <div className="md:col-span-2">
        <Button type="submit" busy={formState.isSubmitting}>
          Record reading
        </Button>
      </div>
    </form>
  );
}
