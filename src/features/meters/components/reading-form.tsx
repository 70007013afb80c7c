import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { readingInputSchema, type MeterRow } from '../../../../shared/schemas/machines';
import { TextField } from '../../../components/ui/field';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { applyServerErrors } from '../../../lib/form-errors';
import { useAddReading } from '../api/add-reading';
import { formatValue } from './format';
import { useShopFormat } from '../../../lib/format';

type In = z.input<typeof readingInputSchema>;
type Out = z.output<typeof readingInputSchema>;

/** Type in a reading. Counts and hours must not go backwards unless marked as a reset. */
export function ReadingForm({ meter }: { meter: MeterRow }) {
  const f = useShopFormat();
  const add = useAddReading();
  const [formError, setFormError] = useState<string | null>(null);
  const [saved, setSaved] = useState<string | null>(null);
  const { register, handleSubmit, setError, reset, formState } = useForm<In, unknown, Out>({
    resolver: zodResolver(readingInputSchema),
    defaultValues: { isReset: false },
  });
  const cumulative = meter.kind !== 'condition';
  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    setSaved(null);
    try {
      await add.mutateAsync({ meterId: meter.id, ...values });
      setSaved(`Recorded ${formatValue(f, values.value, meter.unit)}.`);
      reset({ isReset: false, value: undefined, readAt: undefined, note: '' });
    } catch (err) {
      setFormError(applyServerErrors(err, setError, ['value', 'readAt', 'isReset', 'note']));
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label={`New reading for ${meter.name}`} className="grid gap-4 md:grid-cols-2">
      <div className="space-y-2 md:col-span-2">
        {formError ? (
          <Notice tone="danger" role="alert">
            {formError}
          </Notice>
        ) : null}
        {saved ? (
          <Notice tone="safe" role="status">
            {saved}
          </Notice>
        ) : null}
      </div>
      <TextField
        label={`Reading (${meter.unit})`}
        inputMode="decimal"
        autoComplete="off"
        hint={meter.latest ? `Last: ${formatValue(f, meter.latest.value, meter.unit)}` : 'First reading of this meter'}
        error={formState.errors.value?.message}
        {...register('value')}
      />
      <TextField
        label="Read at"
        type="datetime-local"
        hint="Leave empty for now"
        error={formState.errors.readAt?.message}
        {...register('readAt', { setValueAs: (v: string) => f.fromLocalInput(v) ?? undefined })}
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
