import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { METER_KINDS, METER_UNITS, meterInputSchema, unitForKind, type MachineRow, type MeterKind } from '../../../../shared/schemas/machines';
import { SelectField, TextField } from '../../../components/ui/field';
import { Button } from '../../../components/ui/button';
import { FormMessages } from '../../../components/ui/notice';
import { applyServerErrors } from '../../../lib/form-errors';
import { useCreateMeter } from '../api/create-meter';

type In = z.input<typeof meterInputSchema>;
type Out = z.output<typeof meterInputSchema>;
const KIND_LABEL = { count: 'Count (starts, hits …)', 'running-time': 'Running time (hours)', condition: 'Condition (pressure, temperature …)' } as const;
const num = (v: unknown) => (v === '' || v === null || v === undefined ? null : Number(v));

/** Adds a meter to one of the given machines (a machine and its components). */
export function MeterForm({ machines }: { machines: Pick<MachineRow, 'id' | 'code' | 'name'>[] }) {
  const create = useCreateMeter();
  const [formError, setFormError] = useState<string | null>(null);
  const [saved, setSaved] = useState<string | null>(null);
  const { register, handleSubmit, setError, reset, watch, setValue, getValues, formState } = useForm<In, unknown, Out>({
    resolver: zodResolver(meterInputSchema),
    defaultValues: { machineId: machines[0]?.id, kind: 'count', unit: 'starts' },
  });
  const kind = watch('kind');
  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    setSaved(null);
    try {
      await create.mutateAsync(values);
      setSaved(`Added meter ${values.name}.`);
      reset({ machineId: values.machineId, kind: values.kind, unit: values.unit, code: '', name: '' });
    } catch (err) {
      setFormError(applyServerErrors(err, setError, ['machineId', 'code', 'name', 'kind', 'unit', 'lowerLimit', 'upperLimit']));
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Add a meter" className="grid gap-4 md:grid-cols-3">
      <div className="space-y-2 md:col-span-3">
        <FormMessages error={formError} saved={saved} />
      </div>
      <SelectField
        label="On machine"
        error={formState.errors.machineId?.message}
        options={machines.map((m) => ({ value: m.id, label: `${m.code} ${m.name}` }))}
        {...register('machineId')}
      />
      <TextField label="Meter code" hint="e.g. arc-starts, pump-hours" autoComplete="off" error={formState.errors.code?.message} {...register('code')} />
      <TextField label="Meter name" autoComplete="off" error={formState.errors.name?.message} {...register('name')} />
      <SelectField
        label="Kind"
        error={formState.errors.kind?.message}
        options={METER_KINDS.map((k) => ({ value: k, label: KIND_LABEL[k] }))}
        {...register('kind', {
          // The unit list follows the kind: a unit the new kind has no use for ("starts" on running time) would be refused on save.
          onChange: (e) => setValue('unit', unitForKind(e.target.value as MeterKind, getValues('unit')), { shouldValidate: formState.isSubmitted }),
        })}
      />
      <SelectField
        label="Unit"
        error={formState.errors.unit?.message}
        options={(METER_UNITS[kind] ?? []).map((u) => ({ value: u, label: u }))}
        {...register('unit')}
      />
      {kind === 'condition' ? (
        <div className="grid grid-cols-2 gap-3">
          <TextField label="Lower limit" inputMode="decimal" error={formState.errors.lowerLimit?.message} {...register('lowerLimit', { setValueAs: num })} />
          <TextField label="Upper limit" inputMode="decimal" error={formState.errors.upperLimit?.message} {...register('upperLimit', { setValueAs: num })} />
        </div>
      ) : (
        <div />
      )}
      <div className="md:col-span-3">
        <Button type="submit" busy={formState.isSubmitting}>
          Add meter
        </Button>
      </div>
    </form>
  );
}
