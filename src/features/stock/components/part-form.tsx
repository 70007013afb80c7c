import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { LIFE_UNITS, LIFE_UNIT_LABELS, PART_CATEGORIES, PART_CATEGORY_LABELS, partTypeInputSchema } from '../../../../shared/schemas/stock';
import { SelectField, TextField } from '../../../components/ui/field';
import { Button } from '../../../components/ui/button';
import { FormMessages } from '../../../components/ui/notice';
import { applyServerErrors } from '../../../lib/form-errors';
import { useCreatePartType } from '../api/create-part-type';

type In = z.input<typeof partTypeInputSchema>;
type Out = z.output<typeof partTypeInputSchema>;
const num = (v: unknown) => (v === '' || v === null || v === undefined ? undefined : Number(v));
const numOrNull = (v: unknown) => (v === '' || v === null || v === undefined ? null : Number(v));

export function PartForm() {
  const create = useCreatePartType();
  const [formError, setFormError] = useState<string | null>(null);
  const [saved, setSaved] = useState<string | null>(null);
  const { register, handleSubmit, setError, reset, formState } = useForm<In, unknown, Out>({
    resolver: zodResolver(partTypeInputSchema),
    defaultValues: { category: 'electrode', stockUnit: 'pcs', lifeUnit: 'starts', leadTimeDays: 7, serviceLevel: 0.95, unitCost: 0, openingStock: 0 },
  });
  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    setSaved(null);
    try {
      await create.mutateAsync(values);
      setSaved(`Added ${values.partNumber} with ${values.openingStock} ${values.stockUnit} in stock.`);
      reset();
    } catch (err) {
      setFormError(
        applyServerErrors(err, setError, [
          'partNumber',
          'name',
          'category',
          'stockUnit',
          'lifeUnit',
          'expectedLife',
          'unitCost',
          'leadTimeDays',
          'serviceLevel',
          'openingStock',
        ]),
      );
    }
  });
  const e = formState.errors;
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Add a part" className="grid gap-4 md:grid-cols-4">
      <div className="space-y-2 md:col-span-4">
        <FormMessages error={formError} saved={saved} />
      </div>
      <TextField label="Part number" autoComplete="off" error={e.partNumber?.message} {...register('partNumber')} />
      <TextField label="Name" autoComplete="off" error={e.name?.message} {...register('name')} />
      <SelectField
        label="Category"
        error={e.category?.message}
        options={PART_CATEGORIES.map((c) => ({ value: c, label: PART_CATEGORY_LABELS[c] }))}
        {...register('category')}
      />
      <TextField label="Stock unit" error={e.stockUnit?.message} {...register('stockUnit')} />
      <SelectField
        label="Life counted in"
        error={e.lifeUnit?.message}
        options={[{ value: '', label: '— not tracked —' }, ...LIFE_UNITS.map((u) => ({ value: u, label: LIFE_UNIT_LABELS[u] }))]}
        {...register('lifeUnit', { setValueAs: (v) => (v === '' ? null : v) })}
      />
      <TextField
        label="Expected life"
        inputMode="decimal"
        hint="From the maker's data or your own records"
        error={e.expectedLife?.message}
        {...register('expectedLife', { setValueAs: numOrNull })}
      />
      <TextField label="Unit cost" inputMode="decimal" error={e.unitCost?.message} {...register('unitCost', { setValueAs: num })} />
      <TextField label="Lead time (days)" inputMode="numeric" error={e.leadTimeDays?.message} {...register('leadTimeDays', { setValueAs: num })} />
      <TextField
        label="Service level"
        inputMode="decimal"
        hint="Chance of no stock-out while an order is on its way, e.g. 0.95"
        error={e.serviceLevel?.message}
        {...register('serviceLevel', { setValueAs: num })}
      />
      <TextField
        label="Opening stock"
        inputMode="decimal"
        hint="Counted now; recorded as an adjustment"
        error={e.openingStock?.message}
        {...register('openingStock', { setValueAs: num })}
      />
      <div className="md:col-span-4">
        <Button type="submit" busy={formState.isSubmitting}>
          Add part
        </Button>
      </div>
    </form>
  );
}
