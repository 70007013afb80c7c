import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { usePartInput, type WorkOrderDetail } from '../../../../shared/schemas/work-orders';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { SelectField, TextField } from '../../../components/ui/field';
import { applyServerErrors } from '../../../lib/form-errors';
import { useRecordPartUsed } from '../api/record-part-used';
import { useReturnPart } from '../api/return-part';
import { useLookups } from '../../../lib/lookups';
import { useShopFormat } from '../../../lib/format';

type In = z.input<typeof usePartInput>;
type Out = z.output<typeof usePartInput>;

/** Parts, oil and grease taken from stock for this work. Stock goes down as each line is recorded. */
export function PartsUsed({ wo, readOnly }: { wo: WorkOrderDetail; readOnly: boolean }) {
  const f = useShopFormat();
  const record = useRecordPartUsed();
  const giveBack = useReturnPart();
  const lookups = useLookups();
  const [message, setMessage] = useState<{ tone: 'danger' | 'safe'; text: string } | null>(null);
  const { register, handleSubmit, setError, formState, reset, setValue } = useForm<In, unknown, Out>({
    resolver: zodResolver(usePartInput),
    defaultValues: { partTypeId: '', quantity: 1 },
  });
  const parts = lookups.data?.parts ?? [];
  const onSubmit = handleSubmit(async (v) => {
    setMessage(null);
    try {
      await record.mutateAsync({ id: wo.id, ...v });
      const p = parts.find((x) => x.id === v.partTypeId);
      setMessage({ tone: 'safe', text: `Recorded ${v.quantity} ${p?.stockUnit ?? ''} ${p?.name ?? ''}; stock updated.` });
      reset({ partTypeId: '', quantity: 1 });
    } catch (err) {
      setMessage({ tone: 'danger', text: applyServerErrors(err, setError, ['partTypeId', 'quantity']) ?? 'Check the marked fields.' });
    }
  });
  return (
    <div className="space-y-4">
      {wo.plannedParts.length ? (
        <div>
          <h3 className="font-semibold">Planned for this work</h3>
          <ul className="mt-1 space-y-1">
            {wo.plannedParts.map((p) => (
              <li key={p.partTypeId} className="flex flex-wrap items-center gap-2">
                <span>
                  {p.quantity} {p.stockUnit} · {p.partNumber} {p.name}
                </span>
                {readOnly ? null : (
                  <Button
                    variant="ghost"
                    className="underline"
                    onClick={() => {
                      setValue('partTypeId', p.partTypeId);
                      setValue('quantity', p.quantity);
                    }}
                  >
                    Use these
                  </Button>
                )}
              </li>
            ))}
          </ul>
        </div>
      ) : null}
      <div>
        <h3 className="font-semibold">Taken from stock</h3>
        {wo.partsUsed.length === 0 ? (
          <p className="text-steel-600">Nothing recorded yet.</p>
        ) : (
          <table className="mt-1 w-full text-left text-sm">
            <caption className="sr-only">Parts used</caption>
            <thead>
              <tr className="border-b border-steel-300">
                <th scope="col" className="py-1">
                  Part
                </th>
                <th scope="col">Quantity</th>
                <th scope="col">By</th>
                <th scope="col">
                  <span className="sr-only">Actions</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {wo.partsUsed.map((p) => (
                <tr key={p.id} className="border-b border-steel-100">
                  <td className="py-1">
                    {p.partNumber} · {p.name}
                  </td>
                  <td>
                    {p.quantity} {p.stockUnit}
                  </td>
                  <td>
                    {p.by} <span className="text-steel-600">{f.dateTime(p.at)}</span>
                  </td>
                  <td className="text-right">
                    {readOnly ? null : (
                      <Button
                        variant="ghost"
                        busy={giveBack.isPending && giveBack.variables?.lineId === p.id}
                        onClick={() => giveBack.mutate({ id: wo.id, lineId: p.id })}
                      >
                        Return to stock
                      </Button>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </div>
      {readOnly ? null : (
        <form onSubmit={onSubmit} noValidate aria-label="Record a part used" className="grid gap-3 sm:grid-cols-[1fr_10rem_auto] sm:items-start">
          <SelectField
            label="Part, oil or grease"
            error={formState.errors.partTypeId?.message}
            options={[
              { value: '', label: 'Choose…' },
              ...parts.map((p) => ({ value: p.id, label: `${p.partNumber} · ${p.name} (${p.onHand} ${p.stockUnit} in stock)` })),
            ]}
            {...register('partTypeId')}
          />
          <TextField
            label="Quantity"
            inputMode="decimal"
            error={formState.errors.quantity?.message}
            {...register('quantity', { setValueAs: (x) => (x === '' ? undefined : Number(String(x).replace(',', '.'))) })}
          />
          <Button type="submit" className="sm:mt-6" busy={formState.isSubmitting}>
            Record use
          </Button>
        </form>
      )}
      {message ? (
        <Notice tone={message.tone} role={message.tone === 'danger' ? 'alert' : 'status'}>
          {message.text}
        </Notice>
      ) : null}
    </div>
  );
}
