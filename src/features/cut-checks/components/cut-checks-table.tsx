import { useState } from 'react';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '../../../components/ui/data-table';
import { Badge, EmptyState, Notice } from '../../../components/ui/notice';
import type { CutCheckRow } from '../../../../shared/schemas/consumables';
import { useCutChecks } from '../api/get-cut-checks';
import { ShopTime, useShopFormat, type ShopFormat } from '../../../lib/format';

const col = createColumnHelper<CutCheckRow>();
const columnsFor = (f: ShopFormat) => [
  col.accessor('checkedAt', { header: 'When', enableSorting: false, cell: (c) => <ShopTime at={c.getValue()} /> }),
  col.accessor('torchCode', { header: 'Torch', enableSorting: false }),
  col.accessor('passed', {
    header: 'Result',
    enableSorting: false,
    cell: (c) => (c.getValue() ? <Badge tone="safe">Within tolerance</Badge> : <Badge tone="danger">Out of tolerance</Badge>),
  }),
  col.accessor('dimensions', {
    header: 'Deviations',
    enableSorting: false,
    cell: (c) =>
      c
        .getValue()
        .map((d) => `${d.label} ${f.number(d.deviationMm, { signed: true, min: 2, max: 3 })} mm`)
        .join(' · '),
  }),
  col.accessor('toleranceMm', { header: 'Tolerance', enableSorting: false, cell: (c) => `±${c.getValue()} mm` }),
  col.accessor('installedParts', {
    header: 'Parts in the torch',
    enableSorting: false,
    cell: (c) =>
      c
        .getValue()
        .map((p) => p.partNumber)
        .join(', ') || '—',
  }),
  col.accessor('by', { header: 'By', enableSorting: false, cell: (c) => c.getValue() ?? '—' }),
];

export function CutChecksTable({ machineId, pageSize = 10 }: { machineId: string; pageSize?: number }) {
  const f = useShopFormat();
  const columns = columnsFor(f);
  const [page, setPage] = useState(1);
  const q = useCutChecks({ machineId, page, pageSize });
  if (q.isError) return <Notice tone="danger">{q.error.message}</Notice>;
  return (
    <DataTable
      caption="Test coupons"
      columns={columns}
      data={q.data?.rows ?? []}
      loading={q.isLoading}
      getRowId={(r) => r.id}
      empty={<EmptyState title="No coupons recorded" />}
      server={{ total: q.data?.total ?? 0, page, pageSize, sorting: [], onSortingChange: () => undefined, onPageChange: setPage }}
    />
  );
}
