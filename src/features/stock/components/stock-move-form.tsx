import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import type { PartTypeRow, StockMoveKind } from '../../../../shared/schemas/stock';
import { SelectField, TextField } from '../../../components/ui/field';
import { Button } from '../../../components/ui/button';
import { FormMessages } from '../../../components/ui/notice';
import { applyServerErrors } from '../../../lib/form-errors';
import { useRecordStockMove } from '../api/record-stock-move';
import { useShopFormat } from '../../../lib/format';

/** The move decides the direction, so people type how many, never a sign. */
const MOVES = {
  received: { kind: 'received', sign: 1, label: 'Received (puts in)' },
  used: { kind: 'used', sign: -1, label: 'Used (takes out)' },
  'found-more': { kind: 'adjusted', sign: 1, label: 'Count correction: more on the shelf' },
  'found-less': { kind: 'adjusted', sign: -1, label: 'Count correction: less on the shelf' },
} as const satisfies Record<string, { kind: StockMoveKind; sign: 1 | -1; label: string }>;
type Move = keyof typeof MOVES;

const formSchema = z
  .object({
    move: z.enum(Object.keys(MOVES) as [Move, ...Move[]], { message: 'Choose the move' }),
    quantity: z.number({ message: 'Enter how many' }).finite('Enter how many').positive('Enter how many, above zero'),
    reason: z.string().trim().max(300, 'At most 300 characters').optional(),
  })
  .superRefine((v, ctx) => {
    if (MOVES[v.move].kind === 'adjusted' && !v.reason)
      ctx.addIssue({ code: 'custom', path: ['reason'], message: 'Say why the count is corrected (e.g. stocktake)' });
  });
type In = z.input<typeof formSchema>;
type Out = z.output<typeof formSchema>;

/** Receive, use or correct stock of one part: every change is a record with who and why. */
export function StockMoveForm({ part }: { part: PartTypeRow }) {
  const f = useShopFormat();
  const record = useRecordStockMove();
  const [formError, setFormError] = useState<string | null>(null);
  const [saved, setSaved] = useState<string | null>(null);
  const { register, handleSubmit, setError, reset, watch, formState } = useForm<In, unknown, Out>({
    resolver: zodResolver(formSchema),
    defaultValues: { move: 'received' },
  });
  const move = MOVES[(watch('move') ?? 'received') as Move];
  const quantity = watch('quantity');
  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    setSaved(null);
    const m = MOVES[values.move];
    try {
      const res = await record.mutateAsync({ partTypeId: part.id, kind: m.kind, quantity: m.sign * values.quantity, reason: values.reason || undefined });
      setSaved(
        `Recorded: ${m.sign > 0 ? 'put in' : 'took out'} ${f.qty(values.quantity, part.stockUnit)}. ${part.partNumber} now has ${f.qty(res.onHand, part.stockUnit)} on hand.`,
      );
      reset({ move: values.move, reason: '' });
    } catch (err) {
      // The server speaks of the signed kind/quantity; both map onto this form's own fields.
      setFormError(
        applyServerErrors(err, (name, e) => setError(name === 'kind' ? 'move' : (name as 'quantity' | 'reason'), e), ['kind', 'quantity', 'reason']),
      );
    }
  });
  const n = typeof quantity === 'number' && Number.isFinite(quantity) && quantity > 0 ? quantity : null;
  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label={`Stock move for ${part.partNumber}`}
      className="grid gap-4 md:grid-cols-[16rem_10rem_1fr_auto] md:items-start"
    >
      <div className="space-y-2 md:col-span-4">
        <FormMessages error={formError} saved={saved} />
      </div>
      <SelectField
        label="Move"
        error={formState.errors.move?.message}
        options={Object.entries(MOVES).map(([value, m]) => ({ value, label: m.label }))}
        {...register('move')}
      />
      <TextField
        label={`How many (${part.stockUnit})`}
        inputMode="decimal"
        hint={
          n === null
            ? move.sign > 0
              ? 'Puts this many in'
              : 'Takes this many out'
            : move.sign > 0
              ? `Puts ${f.qty(n, part.stockUnit)} in`
              : `Takes ${f.qty(n, part.stockUnit)} out`
        }
        error={formState.errors.quantity?.message}
        {...register('quantity', { setValueAs: (v) => (v === '' || v === undefined ? undefined : Number(v)) })}
      />
      <TextField label="Why" hint="Order number, stocktake, work order …" error={formState.errors.reason?.message} {...register('reason')} />
      <Button type="submit" busy={formState.isSubmitting} className="md:mt-6">
        Record move
      </Button>
    </form>
  );
}
