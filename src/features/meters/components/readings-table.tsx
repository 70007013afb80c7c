import { useState } from 'react';
import { createColumnHelper, type SortingState } from '@tanstack/react-table';
import { DataTable } from '../../../components/ui/data-table';
import { Badge, EmptyState, Notice } from '../../../components/ui/notice';
import type { MeterRow, ReadingRow } from '../../../../shared/schemas/machines';
import { useReadings } from '../api/get-readings';
import { formatValue } from './format';
import { useShopFormat } from '../../../lib/format';

const col = createColumnHelper<ReadingRow>();
const SOURCE = { manual: 'Typed in', import: 'Imported', 'work-order': 'Work order', 'consumable-change': 'Consumable change' } as const;

export function ReadingsTable({ meter }: { meter: MeterRow }) {
  const f = useShopFormat();
  const [page, setPage] = useState(1);
  const [sorting, setSorting] = useState<SortingState>([{ id: 'readAt', desc: true }]);
  const pageSize = 25;
  const q = useReadings(meter.id, { page, pageSize, dir: sorting[0]?.desc === false ? 'asc' : 'desc' });
  const columns = [
    col.accessor('readAt', { header: 'Read at', cell: (c) => f.dateTime(c.getValue()) }),
    col.accessor('value', {
      header: 'Value',
      enableSorting: false,
      cell: (c) => (
        <span className="inline-flex items-center gap-2">
          <span className="tabular-nums">{formatValue(f, c.getValue(), meter.unit)}</span>
          {c.row.original.isReset ? <Badge>Reset</Badge> : null}
        </span>
      ),
    }),
    col.accessor('source', { header: 'Source', enableSorting: false, cell: (c) => SOURCE[c.getValue()] }),
    col.accessor('recordedBy', { header: 'By', enableSorting: false, cell: (c) => c.getValue() ?? '—' }),
    col.accessor('note', { header: 'Note', enableSorting: false, cell: (c) => c.getValue() ?? '' }),
  ];
  if (q.isError) return <Notice tone="danger">{q.error.message}</Notice>;
  return (
    <DataTable
      caption={`Readings of ${meter.name}`}
      columns={columns}
      data={q.data?.rows ?? []}
      loading={q.isLoading}
      getRowId={(r) => r.id}
      empty={<EmptyState title="No readings yet" />}
      server={{
        total: q.data?.total ?? 0,
        page,
        pageSize,
        sorting,
        onSortingChange: (s) => {
          setSorting(s.length ? s : [{ id: 'readAt', desc: true }]);
          setPage(1);
        },
        onPageChange: setPage,
      }}
    />
  );
}
