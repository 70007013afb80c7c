import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '../../../components/ui/data-table';
import { Badge, EmptyState } from '../../../components/ui/notice';
import { Button } from '../../../components/ui/button';
import { LIFE_UNIT_LABELS, PART_CATEGORY_LABELS, type PartTypeRow } from '../../../../shared/schemas/stock';
import { useShopFormat } from '../../../lib/format';

const col = createColumnHelper<PartTypeRow>();

export function PartsTable({
  rows,
  loading,
  selectedId,
  onSelect,
  toolbar,
}: {
  rows: PartTypeRow[];
  loading?: boolean;
  selectedId?: string | null;
  onSelect: (id: string) => void;
  toolbar?: React.ReactNode;
}) {
  const f = useShopFormat();
  const columns = [
    col.accessor('partNumber', { header: 'Part number', enableHiding: false, cell: (c) => <span className="font-semibold">{c.getValue()}</span> }),
    col.accessor('name', { header: 'Name' }),
    col.accessor('category', { header: 'Category', cell: (c) => PART_CATEGORY_LABELS[c.getValue()] }),
    col.accessor('onHand', {
      header: 'On hand',
      cell: (c) => (
        <span className="inline-flex flex-wrap items-center gap-2">
          <span className="tabular-nums">{f.qty(c.getValue(), c.row.original.stockUnit)}</span>
          {c.row.original.low ? <Badge tone="caution">Reorder</Badge> : null}
        </span>
      ),
    }),
    col.accessor('reorderPoint', {
      header: 'Reorder point',
      cell: (c) => {
        const r = c.row.original;
        // Zero from no recorded use is "not known yet", not "keep none".
        if (c.getValue() === 0 && r.usagePerDay === 0) {
          return (
            <span className="flex flex-col">
              <span aria-hidden>—</span>
              <span className="text-sm text-steel-700">no use in {r.usageWindowDays} days</span>
            </span>
          );
        }
        return (
          <span className="flex flex-col">
            <span className="tabular-nums">{f.qty(c.getValue(), r.stockUnit)}</span>
            <span className="text-sm text-steel-700">
              {f.number(r.usagePerDay, { max: 2 })}/day, {r.leadTimeDays} d lead time
            </span>
          </span>
        );
      },
    }),
    col.accessor('usagePerDay', { header: 'Use per day', cell: (c) => f.number(c.getValue(), { max: 2 }) }),
    col.accessor('leadTimeDays', { header: 'Lead time', cell: (c) => `${c.getValue()} d` }),
    col.accessor('expectedLife', {
      header: 'Expected life',
      cell: (c) =>
        c.getValue() !== null ? `${f.number(c.getValue()!, { max: 2 })} ${c.row.original.lifeUnit ? LIFE_UNIT_LABELS[c.row.original.lifeUnit] : ''}` : '—',
    }),
    col.accessor('unitCost', { header: 'Unit cost', cell: (c) => <span className="tabular-nums">{f.money(c.getValue(), c.row.original.currency)}</span> }),
    col.display({
      id: 'select',
      header: 'Moves',
      cell: (c) => (
        <Button
          variant={selectedId === c.row.original.id ? 'primary' : 'secondary'}
          onClick={() => onSelect(c.row.original.id)}
          aria-pressed={selectedId === c.row.original.id}
          aria-label={`Moves of ${c.row.original.partNumber}`}
        >
          Moves
        </Button>
      ),
    }),
  ];
  return (
    <DataTable
      caption="Part catalogue"
      columns={columns}
      data={rows}
      loading={loading}
      getRowId={(r) => r.id}
      toolbar={toolbar}
      empty={<EmptyState title="No parts in the catalogue yet" />}
    />
  );
}
