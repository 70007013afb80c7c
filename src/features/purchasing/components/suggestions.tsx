import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { EmptyState, Notice } from '../../../components/ui/notice';
import { suggestionsCsvHref, useSuggestions } from '../api/get-suggestions';

const one = new Intl.NumberFormat(undefined, { maximumFractionDigits: 1 });
const money = new Intl.NumberFormat(undefined, { minimumFractionDigits: 2, maximumFractionDigits: 2 });
const BASIS = { 'arc-starts': 'torch arc starts ÷ expected life', 'arc-hours': 'torch arc hours ÷ expected life', 'daily-use': 'daily use' } as const;

/** What to order now to last the coming weeks, in whole packs: on screen, as CSV, on paper. */
export function Suggestions() {
  const [weeks, setWeeks] = useState(4);
  const q = useSuggestions(weeks);
  const total = (q.data ?? []).reduce((s, r) => s + r.quantity * r.unitCost, 0);
  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-end gap-3 print:hidden">
        <label className="flex flex-col text-sm font-semibold">
          Weeks ahead
          <input
            type="number"
            min={1}
            max={26}
            className="min-h-touch w-24 rounded border border-steel-400 px-2"
            value={weeks}
            onChange={(e) => setWeeks(Math.min(26, Math.max(1, Number(e.target.value) || 1)))}
          />
        </label>
        <a className="inline-flex min-h-touch items-center rounded border-2 border-steel-800 px-4 font-semibold" href={suggestionsCsvHref(weeks)} download>
          Download CSV
        </a>
        <Button variant="secondary" onClick={() => window.print()}>
          Print
        </Button>
      </div>
      {q.isError ? <Notice tone="danger">{q.error.message}</Notice> : null}
      {q.data && q.data.length === 0 ? <EmptyState title={`Nothing to order for the next ${weeks} weeks`} /> : null}
      {q.data && q.data.length > 0 ? (
        <table className="w-full text-left text-sm">
          <caption className="text-left font-semibold">
            Suggested order for the next {weeks} weeks · total {money.format(total)}
          </caption>
          <thead className="text-steel-700">
            <tr>
              <th className="pr-3">Supplier</th>
              <th className="pr-3">Part</th>
              <th className="pr-3">Order</th>
              <th className="pr-3">Expected use</th>
              <th className="pr-3">On hand / on order / requested</th>
              <th className="pr-3">Reorder point</th>
              <th>Pack / minimum</th>
            </tr>
          </thead>
          <tbody>
            {q.data.map((r) => (
              <tr key={r.partTypeId} className="border-t border-steel-200">
                <td className="py-1 pr-3">{r.supplier ?? '—'}</td>
                <td className="py-1 pr-3">
                  <span className="font-semibold">{r.partNumber}</span> {r.name}
                </td>
                <td className="py-1 pr-3 font-bold tabular-nums">
                  {r.quantity} {r.stockUnit}
                </td>
                <td className="py-1 pr-3 tabular-nums" title={BASIS[r.basis]}>
                  {one.format(r.expectedUse)} <span className="text-xs text-steel-700">({BASIS[r.basis]})</span>
                </td>
                <td className="py-1 pr-3 tabular-nums">
                  {r.onHand} / {r.onOrder} / {r.pending}
                </td>
                <td className="py-1 pr-3 tabular-nums">{r.reorderPoint}</td>
                <td className="py-1 tabular-nums">
                  {r.packSize} / {r.minOrderQty}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      ) : null}
    </div>
  );
}
