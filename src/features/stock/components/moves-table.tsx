import { useState } from 'react';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '../../../components/ui/data-table';
import { EmptyState, Notice } from '../../../components/ui/notice';
import type { StockMoveRow } from '../../../../shared/schemas/stock';
import { useStockMoves } from '../api/get-stock-moves';
import { unitFor } from '../../../lib/format';
import { useShopFormat } from '../../../lib/format';

const col = createColumnHelper<StockMoveRow>();
const KIND = { received: 'Received', used: 'Used', adjusted: 'Adjusted' } as const;
const REF: Record<string, string> = { ConsumableChange: 'consumable change', WorkOrder: 'work order' };

export function MovesTable({ partTypeId, unit }: { partTypeId: string; unit: string }) {
  const f = useShopFormat();
  const [page, setPage] = useState(1);
  const pageSize = 25;
  const q = useStockMoves(partTypeId, page, pageSize);
  const columns = [
    col.accessor('at', { header: 'When', enableSorting: false, cell: (c) => f.dateTime(c.getValue()) }),
    col.accessor('kind', { header: 'Move', enableSorting: false, cell: (c) => KIND[c.getValue()] }),
    col.accessor('quantity', {
      header: 'Change',
      enableSorting: false,
      cell: (c) => (
        <span className="tabular-nums">
          {f.number(c.getValue(), { signed: true, max: 2 })} {unitFor(c.getValue(), unit)}
        </span>
      ),
    }),
    col.accessor('onHandAfter', {
      header: 'On hand after',
      enableSorting: false,
      cell: (c) => <span className="tabular-nums">{f.qty(c.getValue(), unit)}</span>,
    }),
    col.accessor('by', { header: 'Who', enableSorting: false, cell: (c) => c.getValue() ?? 'System' }),
    col.accessor('reason', {
      header: 'Why',
      enableSorting: false,
      cell: (c) => c.getValue() ?? (c.row.original.refType ? `From a ${REF[c.row.original.refType] ?? c.row.original.refType}` : '—'),
    }),
  ];
  if (q.isError) return <Notice tone="danger">{q.error.message}</Notice>;
  return (
    <DataTable
      caption="Stock moves"
      columns={columns}
      data={q.data?.rows ?? []}
      loading={q.isLoading}
      getRowId={(r) => r.id}
      empty={<EmptyState title="No moves yet" />}
      server={{ total: q.data?.total ?? 0, page, pageSize, sorting: [], onSortingChange: () => undefined, onPageChange: setPage }}
    />
  );
}
