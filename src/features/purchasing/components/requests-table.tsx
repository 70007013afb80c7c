import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { EmptyState, Notice } from '../../../components/ui/notice';
import { PURCHASE_STATE_LABELS, type PurchaseRequestRow } from '../../../../shared/schemas/purchasing';
import { useRequests } from '../api/get-requests';
import { useRequestAction, type RequestAction } from '../api/request-actions';

export type PurchasingRights = { approve: boolean; order: boolean; receive: boolean };

function Actions({ r, rights }: { r: PurchaseRequestRow; rights: PurchasingRights }) {
  const action = useRequestAction();
  const open = r.quantity - r.received;
  const [qty, setQty] = useState(String(open));
  const [error, setError] = useState<string | null>(null);
  const run = async (a: RequestAction) => {
    setError(null);
    try {
      await action.mutateAsync(a);
    } catch (err) {
      setError(err instanceof Error ? err.message : 'Not done');
    }
  };
  return (
    <div className="flex flex-wrap items-center gap-2">
      {r.status === 'requested' && rights.approve ? (
        <Button variant="secondary" busy={action.isPending} onClick={() => run({ kind: 'approve', id: r.id })}>
          Approve
        </Button>
      ) : null}
      {r.status === 'approved' && rights.order ? (
        <Button variant="secondary" busy={action.isPending} onClick={() => run({ kind: 'order', id: r.id })}>
          Mark as ordered
        </Button>
      ) : null}
      {r.status === 'ordered' && rights.receive ? (
        <>
          <label className="sr-only" htmlFor={`receive-${r.id}`}>
            Quantity received on request {r.number}
          </label>
          <input
            id={`receive-${r.id}`}
            inputMode="decimal"
            className="min-h-touch w-20 rounded border border-steel-400 px-2"
            value={qty}
            onChange={(e) => setQty(e.target.value)}
          />
          <Button variant="secondary" busy={action.isPending} onClick={() => run({ kind: 'receive', id: r.id, quantity: Number(qty) })}>
            Book receipt
          </Button>
        </>
      ) : null}
      {error ? (
        <p role="alert" className="w-full text-sm font-semibold text-danger">
          {error}
        </p>
      ) : null}
    </div>
  );
}

/** Purchase requests, newest first, with the next step each person may take. */
export function RequestsTable({ rights }: { rights: PurchasingRights }) {
  const [status, setStatus] = useState('open');
  const q = useRequests(status);
  return (
    <div className="space-y-3">
      <label className="flex items-center gap-2 text-sm font-semibold">
        Show
        <select className="min-h-touch rounded border border-steel-400 bg-white px-2" value={status} onChange={(e) => setStatus(e.target.value)}>
          <option value="open">Open (waiting, approved, on order)</option>
          <option value="received">Received</option>
          <option value="cancelled">Called off</option>
        </select>
      </label>
      {q.isError ? <Notice tone="danger">{q.error.message}</Notice> : null}
      {q.data && q.data.length === 0 ? <EmptyState title="No purchase requests here" /> : null}
      {q.data && q.data.length > 0 ? (
        <table className="w-full text-left">
          <caption className="sr-only">Purchase requests</caption>
          <thead className="text-sm text-steel-700">
            <tr>
              <th className="pr-3">No.</th>
              <th className="pr-3">Part</th>
              <th className="pr-3">Quantity</th>
              <th className="pr-3">Received</th>
              <th className="pr-3">Status</th>
              <th>Next step</th>
            </tr>
          </thead>
          <tbody>
            {q.data.map((r) => (
              <tr key={r.id} className="border-t border-steel-200 align-top" data-testid={`request-${r.number}`}>
                <td className="py-2 pr-3 font-semibold tabular-nums">{r.number}</td>
                <td className="py-2 pr-3">
                  <span className="font-semibold">{r.part.partNumber}</span> {r.part.name}
                  <div className="text-xs text-steel-700">
                    {r.supplier ?? 'no supplier'} · raised by {r.requestedBy ?? '—'}
                    {r.approvedBy ? ` · approved by ${r.approvedBy}` : ''}
                  </div>
                </td>
                <td className="py-2 pr-3 tabular-nums">
                  {r.quantity} {r.part.stockUnit}
                </td>
                <td className="py-2 pr-3 tabular-nums">{r.received}</td>
                <td className="py-2 pr-3">{PURCHASE_STATE_LABELS[r.status]}</td>
                <td className="py-2">
                  <Actions r={r} rights={rights} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      ) : null}
    </div>
  );
}
