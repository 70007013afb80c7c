import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { EmptyState, Notice } from '../../../components/ui/notice';
import { packedOrderQuantity } from '../../../../shared/domain/stock';
import type { PartTypeRow } from '../../../../shared/schemas/stock';
import { useLowParts } from '../api/get-low-parts';
import { useRequestAction } from '../api/request-actions';

/** Enough to get back above the reorder point, in whole packs and at least the minimum order. */
const firstGuess = (p: PartTypeRow) => packedOrderQuantity(Math.max(1, p.reorderPoint + 1 - p.onHand - p.onOrder), p.packSize, p.minOrderQty);

function RaiseRow({ part, canRaise }: { part: PartTypeRow; canRaise: boolean }) {
  const action = useRequestAction();
  const [qty, setQty] = useState(String(firstGuess(part)));
  const [msg, setMsg] = useState<{ ok: boolean; text: string } | null>(null);
  const raise = async () => {
    setMsg(null);
    try {
      const res = (await action.mutateAsync({ kind: 'raise', partTypeId: part.id, quantity: Number(qty) })) as { number: number };
      setMsg({ ok: true, text: `Request ${res.number} raised for ${qty} ${part.stockUnit}` });
    } catch (err) {
      setMsg({ ok: false, text: err instanceof Error ? err.message : 'Not raised' });
    }
  };
  return (
    <tr className="border-t border-steel-200" data-testid={`low-${part.partNumber}`}>
      <td className="py-2 pr-3 font-semibold">
        {part.partNumber} <span className="font-normal text-steel-700">{part.name}</span>
      </td>
      <td className="pr-3 tabular-nums">{part.onHand}</td>
      <td className="pr-3 tabular-nums">{part.onOrder}</td>
      <td className="pr-3 tabular-nums">{part.reorderPoint}</td>
      <td className="pr-3 text-sm">{part.supplierName ?? '—'}</td>
      <td className="py-2">
        {canRaise ? (
          <div className="flex flex-wrap items-center gap-2">
            <label className="sr-only" htmlFor={`qty-${part.id}`}>
              Quantity of {part.partNumber}
            </label>
            <input
              id={`qty-${part.id}`}
              inputMode="numeric"
              className="min-h-touch w-20 rounded border border-steel-400 px-2"
              value={qty}
              onChange={(e) => setQty(e.target.value)}
            />
            <Button variant="secondary" busy={action.isPending} onClick={raise}>
              Raise request
            </Button>
            {part.packSize > 1 ? <span className="text-xs text-steel-700">packs of {part.packSize}</span> : null}
          </div>
        ) : null}
        {msg ? (
          <p role={msg.ok ? 'status' : 'alert'} className={`text-sm font-semibold ${msg.ok ? 'text-safe-ink' : 'text-danger'}`}>
            {msg.text}
          </p>
        ) : null}
      </td>
    </tr>
  );
}

/** Parts to reorder: on hand plus on order at or below the reorder point. */
export function LowParts({ canRaise }: { canRaise: boolean }) {
  const q = useLowParts();
  if (q.isError) return <Notice tone="danger">{q.error.message}</Notice>;
  if (!q.data) return <p role="status">Loading…</p>;
  if (q.data.length === 0) return <EmptyState title="Nothing to reorder: every part has enough on hand and on order" />;
  return (
    <table className="w-full text-left">
      <caption className="sr-only">Parts to reorder</caption>
      <thead className="text-sm text-steel-700">
        <tr>
          <th className="pr-3">Part</th>
          <th className="pr-3">On hand</th>
          <th className="pr-3">On order</th>
          <th className="pr-3">Reorder point</th>
          <th className="pr-3">Supplier</th>
          <th>Request</th>
        </tr>
      </thead>
      <tbody>
        {q.data.map((p) => (
          <RaiseRow key={p.id} part={p} canRaise={canRaise} />
        ))}
      </tbody>
    </table>
  );
}
