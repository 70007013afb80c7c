import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { meterUpdateSchema, type MeterRow } from '../../../../shared/schemas/machines';
import { TextField } from '../../../components/ui/field';
import { Button } from '../../../components/ui/button';
import { Notice, FormMessages } from '../../../components/ui/notice';
import { applyServerErrors } from '../../../lib/form-errors';
import { useUpdateMeter } from '../api/update-meter';

type In = z.input<typeof meterUpdateSchema>;
type Out = z.output<typeof meterUpdateSchema>;
const num = (v: unknown) => (v === '' || v === null || v === undefined ? null : Number(v));

/** Rename a meter; condition meters also get their alarm limits here. Kind and unit stay fixed. */
export function MeterEditForm({ meter }: { meter: MeterRow }) {
  const update = useUpdateMeter();
  const [formError, setFormError] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const { register, handleSubmit, setError, formState } = useForm<In, unknown, Out>({
    resolver: zodResolver(meterUpdateSchema),
    defaultValues: { name: meter.name, lowerLimit: meter.lowerLimit, upperLimit: meter.upperLimit },
  });
  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    setSaved(false);
    try {
      await update.mutateAsync({ id: meter.id, ...(meter.kind === 'condition' ? values : { name: values.name }) });
      setSaved(true);
    } catch (err) {
      setFormError(applyServerErrors(err, setError, ['name', 'lowerLimit', 'upperLimit']));
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label={`Edit ${meter.name}`} className="grid gap-4 md:grid-cols-3">
      <div className="space-y-2 md:col-span-3">
        <FormMessages error={formError} />
        {saved ? (
          <Notice tone="safe" role="status">
            Saved.
          </Notice>
        ) : null}
      </div>
      <TextField label="Name" error={formState.errors.name?.message} {...register('name')} />
      {meter.kind === 'condition' ? (
        <>
          <TextField
            label={`Lower limit (${meter.unit})`}
            inputMode="decimal"
            hint="Empty for none"
            error={formState.errors.lowerLimit?.message}
            {...register('lowerLimit', { setValueAs: num })}
          />
          <TextField
            label={`Upper limit (${meter.unit})`}
            inputMode="decimal"
            hint="Empty for none"
            error={formState.errors.upperLimit?.message}
            {...register('upperLimit', { setValueAs: num })}
          />
        </>
      ) : null}
      <div className="md:col-span-3">
        <Button type="submit" busy={formState.isSubmitting}>
          Save meter
        </Button>
      </div>
    </form>
  );
}
