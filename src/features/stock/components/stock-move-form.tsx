import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { recordStockMoveSchema, type PartTypeRow } from '../../../../shared/schemas/stock';
import { SelectField, TextField } from '../../../components/ui/field';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { applyServerErrors } from '../../../lib/form-errors';
import { useRecordStockMove } from '../api/record-stock-move';

type In = z.input<typeof recordStockMoveSchema>;
type Out = z.output<typeof recordStockMoveSchema>;

/** Receive, use or adjust stock of one part: every change is a record with who and why. */
export function StockMoveForm({ part }: { part: PartTypeRow }) {
  const move = useRecordStockMove();
  const [formError, setFormError] = useState<string | null>(null);
  const [saved, setSaved] = useState<string | null>(null);
  const { register, handleSubmit, setError, reset, formState } = useForm<In, unknown, Out>({ resolver: zodResolver(recordStockMoveSchema), defaultValues: { partTypeId: part.id, kind: 'received' } });
  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    setSaved(null);
    try {
      const res = await move.mutateAsync(values);
      setSaved(`Recorded. ${part.partNumber} now has ${res.onHand} ${part.stockUnit} on hand.`);
      reset({ partTypeId: part.id, kind: values.kind, reason: '' });
    } catch (err) {
      setFormError(applyServerErrors(err, setError, ['kind', 'quantity', 'reason']));
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label={`Stock move for ${part.partNumber}`} className="grid gap-4 md:grid-cols-[12rem_10rem_1fr_auto] md:items-start">
      <div className="space-y-2 md:col-span-4">
        {formError ? <Notice tone="danger" role="alert">{formError}</Notice> : null}
        {saved ? <Notice tone="safe" role="status">{saved}</Notice> : null}
      </div>
      <SelectField label="Move" error={formState.errors.kind?.message} options={[{ value: 'received', label: 'Received (+)' }, { value: 'used', label: 'Used (−)' }, { value: 'adjusted', label: 'Adjusted (±)' }]} {...register('kind')} />
      <TextField label={`Quantity (${part.stockUnit})`} inputMode="decimal" hint="Negative takes out" error={formState.errors.quantity?.message} {...register('quantity', { setValueAs: (v) => (v === '' ? undefined : Number(v)) })} />
      <TextField label="Why" hint="Order number, stocktake, work order …" error={formState.errors.reason?.message} {...register('reason')} />
      <Button type="submit" busy={formState.isSubmitting} className="md:mt-6">Record move</Button>
    </form>
  );
}
