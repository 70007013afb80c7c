import { useMemo, useState } from 'react';
import { Link } from 'react-router-dom';
import { createColumnHelper, type SortingState } from '@tanstack/react-table';
import { DataTable } from '../../../components/ui/data-table';
import { EmptyState } from '../../../components/ui/notice';
import type { ListOilAnalysesQuery, OilAnalysisRow } from '../../../../shared/schemas/oil-analysis';
import { useOilAnalyses } from '../api/get-oil-analyses';
import { OilVerdict } from './oil-badges';
import { useShopFormat } from '../../../lib/format';

const col = createColumnHelper<OilAnalysisRow>();

export function OilAnalysesTable({ machineId }: { machineId?: string }) {
  const f = useShopFormat();
  const [page, setPage] = useState(1);
  const [sorting, setSorting] = useState<SortingState>([{ id: 'sampledAt', desc: true }]);
  const pageSize = 20;
  const sort = (sorting[0]?.id ?? 'sampledAt') as ListOilAnalysesQuery['sort'];
  const q = useOilAnalyses({ machineId, page, pageSize, sort, dir: sorting[0] && !sorting[0].desc ? 'asc' : 'desc' });
  const columns = useMemo(
    () => [
      col.accessor('sampledAt', { header: 'Sampled', cell: (c) => f.date(c.getValue()) }),
      col.accessor((r) => r.machine.code, { id: 'unit', header: 'Unit' }),
      col.accessor('isoCode', { header: 'ISO 4406', enableSorting: false, cell: (c) => <span className="font-bold">{c.getValue()}</span> }),
      col.accessor('targetCode', { header: 'Target', enableSorting: false, cell: (c) => c.getValue() ?? '—' }),
      col.accessor('viscosity40', { header: 'Viscosity 40 °C', cell: (c) => (c.getValue() === null ? '—' : `${c.getValue()} mm²/s`) }),
      col.accessor('waterPpm', { header: 'Water', cell: (c) => (c.getValue() === null ? '—' : `${c.getValue()} ppm`) }),
      col.accessor('temperatureC', { header: 'Oil temp.', cell: (c) => (c.getValue() === null ? '—' : `${c.getValue()} °C`) }),
      col.display({ id: 'verdict', header: 'Verdict', cell: (c) => <OilVerdict row={c.row.original} /> }),
      col.display({
        id: 'work',
        header: 'Work',
        cell: (c) =>
          c.row.original.workOrder ? (
            <Link className="underline" to={`/work-orders/${c.row.original.workOrder.id}`}>
              WO {c.row.original.workOrder.number}
            </Link>
          ) : (
            '—'
          ),
      }),
    ],
    [f],
  );
  return (
    <DataTable
      caption="Oil results"
      columns={columns}
      data={q.data?.rows ?? []}
      loading={q.isLoading}
      getRowId={(r) => r.id}
      empty={<EmptyState title="No oil results yet" />}
      server={{
        total: q.data?.total ?? 0,
        page,
        pageSize,
        sorting,
        onSortingChange: (next) => {
          setSorting(next);
          setPage(1);
        },
        onPageChange: setPage,
      }}
    />
  );
}
