import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { STATION_SIZES, punchToolInputSchema } from '../../../../shared/schemas/punch-tools';
import type { MeterRow } from '../../../../shared/schemas/machines';
import { SelectField, TextField } from '../../../components/ui/field';
import { Button } from '../../../components/ui/button';
import { Notice, FormMessages } from '../../../components/ui/notice';
import { applyServerErrors } from '../../../lib/form-errors';
import { useCreatePunchTool } from '../api/create-punch-tool';

type In = z.input<typeof punchToolInputSchema>;
type Out = z.output<typeof punchToolInputSchema>;

export function ToolForm({ machineId, hitMeters }: { machineId: string; hitMeters: MeterRow[] }) {
  const create = useCreatePunchTool();
  const [formError, setFormError] = useState<string | null>(null);
  const [saved, setSaved] = useState<string | null>(null);
  const { register, handleSubmit, setError, reset, formState } = useForm<In, unknown, Out>({
    resolver: zodResolver(punchToolInputSchema),
    defaultValues: { machineId, hitsMeterId: hitMeters[0]?.id, stationSize: 'B', sharpeningIntervalHits: 100_000 },
  });
  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    setSaved(null);
    try {
      await create.mutateAsync(values);
      setSaved(`Added tool ${values.code}; its hits count from now.`);
      reset({
        machineId,
        hitsMeterId: values.hitsMeterId,
        stationSize: values.stationSize,
        sharpeningIntervalHits: values.sharpeningIntervalHits,
        code: '',
        name: '',
      });
    } catch (err) {
      setFormError(applyServerErrors(err, setError, ['code', 'name', 'stationSize', 'sharpeningIntervalHits', 'hitsMeterId']));
    }
  });
  if (hitMeters.length === 0) return <Notice>Add a count meter in hits to this machine first; tools count their hits from it.</Notice>;
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Add a punch tool" className="grid gap-4 md:grid-cols-3">
      <div className="space-y-2 md:col-span-3">
        <FormMessages error={formError} saved={saved} />
      </div>
      <TextField label="Tool code" autoComplete="off" error={formState.errors.code?.message} {...register('code')} />
      <TextField label="Shape and size" autoComplete="off" hint="e.g. Round 12 mm" error={formState.errors.name?.message} {...register('name')} />
      <SelectField
        label="Station size"
        error={formState.errors.stationSize?.message}
        options={STATION_SIZES.map((s) => ({ value: s, label: s }))}
        {...register('stationSize')}
      />
      <SelectField
        label="Hits meter"
        error={formState.errors.hitsMeterId?.message}
        options={hitMeters.map((m) => ({ value: m.id, label: `${m.machineCode} ${m.name}` }))}
        {...register('hitsMeterId')}
      />
      <TextField
        label="Sharpen every (hits)"
        inputMode="numeric"
        error={formState.errors.sharpeningIntervalHits?.message}
        {...register('sharpeningIntervalHits', { setValueAs: (v) => (v === '' ? undefined : Number(v)) })}
      />
      <div className="md:mt-6">
        <Button type="submit" busy={formState.isSubmitting}>
          Add tool
        </Button>
      </div>
    </form>
  );
}
