import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { partTypeUpdateSchema, type PartTypeRow } from '../../../../shared/schemas/stock';
import { TextField } from '../../../components/ui/field';
import { Button } from '../../../components/ui/button';
import { Notice, FormMessages } from '../../../components/ui/notice';
import { applyServerErrors } from '../../../lib/form-errors';
import { useUpdatePartType } from '../api/update-part-type';
import { useSupplierOptions } from '../api/get-suppliers';

type In = z.input<typeof partTypeUpdateSchema>;
type Out = z.output<typeof partTypeUpdateSchema>;
const num = (v: unknown) => (v === '' || v === null || v === undefined ? undefined : Number(v));
const numOrNull = (v: unknown) => (v === '' || v === null || v === undefined ? null : Number(v));

/** Catalogue data of one part; stock itself only changes through moves. */
export function PartEditForm({ part }: { part: PartTypeRow }) {
  const update = useUpdatePartType();
  const suppliers = useSupplierOptions(true);
  const [formError, setFormError] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const { register, handleSubmit, setError, formState } = useForm<In, unknown, Out>({
    resolver: zodResolver(partTypeUpdateSchema),
    defaultValues: {
      name: part.name,
      expectedLife: part.expectedLife,
      unitCost: part.unitCost,
      plannedChangeCost: part.plannedChangeCost,
      failureCost: part.failureCost,
      leadTimeDays: part.leadTimeDays,
      leadTimeSdDays: part.leadTimeSdDays,
      serviceLevel: part.serviceLevel,
      supplierId: part.supplierId,
      packSize: part.packSize,
      minOrderQty: part.minOrderQty,
    },
  });
  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    setSaved(false);
    try {
      await update.mutateAsync({ id: part.id, ...values });
      setSaved(true);
    } catch (err) {
      setFormError(
        applyServerErrors(err, setError, [
          'name',
          'expectedLife',
          'unitCost',
          'plannedChangeCost',
          'failureCost',
          'leadTimeDays',
          'leadTimeSdDays',
          'serviceLevel',
          'supplierId',
          'packSize',
          'minOrderQty',
        ]),
      );
    }
  });
  const e = formState.errors;
  return (
    <form onSubmit={onSubmit} noValidate aria-label={`Edit ${part.partNumber}`} className="grid gap-4 md:grid-cols-4">
      <div className="space-y-2 md:col-span-4">
        <FormMessages error={formError} />
        {saved ? (
          <Notice tone="safe" role="status">
            Saved. The reorder point follows the new lead time and service level.
          </Notice>
        ) : null}
      </div>
      <TextField label="Name" error={e.name?.message} {...register('name')} />
      <TextField label="Expected life" inputMode="decimal" error={e.expectedLife?.message} {...register('expectedLife', { setValueAs: numOrNull })} />
      <TextField
        label={part.currency ? `Unit cost (${part.currency})` : 'Unit cost'}
        inputMode="decimal"
        error={e.unitCost?.message}
        {...register('unitCost', { setValueAs: num })}
      />
      <TextField
        label="Planned change cost"
        inputMode="decimal"
        hint="Part and fitting time; empty = unit cost"
        error={e.plannedChangeCost?.message}
        {...register('plannedChangeCost', { setValueAs: numOrNull })}
      />
      <TextField
        label="Failure in service cost"
        inputMode="decimal"
        hint="Part, scrapped sheet, damaged torch parts, downtime"
        error={e.failureCost?.message}
        {...register('failureCost', { setValueAs: numOrNull })}
      />
      <TextField label="Lead time (days)" inputMode="numeric" error={e.leadTimeDays?.message} {...register('leadTimeDays', { setValueAs: num })} />
      <TextField
        label="Lead time spread (days)"
        inputMode="decimal"
        hint="Standard deviation; 0 = always on time"
        error={e.leadTimeSdDays?.message}
        {...register('leadTimeSdDays', { setValueAs: num })}
      />
      <label className="flex flex-col gap-1 text-sm font-semibold text-steel-800">
        Supplier
        <select className="min-h-touch rounded border border-steel-400 bg-white px-2 font-normal" {...register('supplierId', { setValueAs: (v) => v || null })}>
          <option value="">None</option>
          {(suppliers.data ?? []).map((s) => (
            <option key={s.id} value={s.id}>
              {s.name}
            </option>
          ))}
        </select>
        {e.supplierId ? <span className="text-danger">{e.supplierId.message}</span> : null}
      </label>
      <TextField label="Pack size" inputMode="numeric" error={e.packSize?.message} {...register('packSize', { setValueAs: num })} />
      <TextField label="Minimum order" inputMode="decimal" error={e.minOrderQty?.message} {...register('minOrderQty', { setValueAs: num })} />
      <TextField label="Service level" inputMode="decimal" error={e.serviceLevel?.message} {...register('serviceLevel', { setValueAs: num })} />
      <div className="md:col-span-4">
        <Button type="submit" variant="secondary" busy={formState.isSubmitting}>
          Save part
        </Button>
      </div>
    </form>
  );
}
