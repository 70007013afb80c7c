import { Link } from 'react-router-dom';
import { Panel, Notice } from '../../../components/ui/notice';
import { usePartTypes } from '../api/get-part-types';
import { PART_CATEGORY_LABELS } from '../../../../shared/schemas/stock';
import { paths } from '../../../config/paths';
import { useShopFormat } from '../../../lib/format';

/** Parts at or below their reorder point, for the home pages. */
export function LowStockPanel() {
  const f = useShopFormat();
  const q = usePartTypes({ lowOnly: true });
  return (
    <Panel
      title="Stock to reorder"
      actions={
        <Link className="inline-flex min-h-touch items-center font-semibold text-mandatory-ink underline" to={paths.stock.getHref()}>
          Open stock
        </Link>
      }
    >
      {q.isError ? <Notice tone="danger">{q.error.message}</Notice> : null}
      {q.isLoading ? (
        <p role="status" className="text-steel-600">
          Loading…
        </p>
      ) : null}
      {q.data && q.data.length === 0 ? <Notice tone="safe">Every part is above its reorder point.</Notice> : null}
      {q.data && q.data.length > 0 ? (
        <ul className="divide-y divide-steel-200" aria-label="Parts at or below their reorder point">
          {q.data.slice(0, 8).map((p) => (
            <li key={p.id} className="flex flex-wrap items-center justify-between gap-2 py-2">
              <span>
                <span className="font-semibold">{p.partNumber}</span>{' '}
                <span className="text-steel-700">
                  {p.name} · {PART_CATEGORY_LABELS[p.category]}
                </span>
              </span>
              <span className="rounded border-l-8 border-caution bg-caution-soft px-2 py-1 text-sm font-semibold text-caution-ink">
                Reorder: {f.qty(p.onHand, p.stockUnit)} on hand,{' '}
                {p.reorderPoint === 0 && p.usagePerDay === 0 ? `no use in ${p.usageWindowDays} days` : `reorder point ${f.qty(p.reorderPoint, p.stockUnit)}`}
              </span>
            </li>
          ))}
          {q.data.length > 8 ? <li className="py-2 text-steel-700">and {q.data.length - 8} more</li> : null}
        </ul>
      ) : null}
    </Panel>
  );
}
