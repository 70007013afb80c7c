import { useState } from 'react';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '../../../components/ui/data-table';
import { EmptyState, Notice } from '../../../components/ui/notice';
import { useAuditEvents, type AuditRow } from '../api/get-audit-events';
import { formatWhen } from '../../../lib/format';

const col = createColumnHelper<AuditRow>();
/** 'work-order.closed' → 'Work order: closed' — readable without a label for every action. */
const describeAction = (action: string) => {
  const [area, ...rest] = action.split('.');
  const words = (s: string) => s.replace(/[-_]/g, ' ');
  const head = words(area);
  return rest.length ? `${head.charAt(0).toUpperCase()}${head.slice(1)}: ${words(rest.join(' '))}` : head;
};
const columnsFor = (timeZone: string) => [
  col.accessor('at', { header: 'When', cell: (c) => formatWhen(c.getValue(), timeZone), enableSorting: false }),
  col.accessor('actor', { header: 'Who', cell: (c) => c.getValue() ?? 'System', enableSorting: false }),
  col.accessor('action', { header: 'What', cell: (c) => describeAction(c.getValue()), enableSorting: false }),
  col.accessor('entityType', { header: 'Record', cell: (c) => c.getValue().replace(/([a-z])([A-Z])/g, '$1 $2'), enableSorting: false }),
];

export function AuditTable({ pageSize = 25, timeZone }: { pageSize?: number; timeZone: string }) {
  const [page, setPage] = useState(1);
  const q = useAuditEvents({ page, pageSize });
  if (q.isError) return <Notice tone="danger">{q.error.message}</Notice>;
  return (
    <DataTable
      caption="Activity log"
      columns={columnsFor(timeZone)}
      data={q.data?.rows ?? []}
      loading={q.isLoading}
      getRowId={(r) => r.id}
      empty={<EmptyState title="No activity yet" />}
      server={{ total: q.data?.total ?? 0, page, pageSize, sorting: [], onSortingChange: () => undefined, onPageChange: setPage }}
    />
  );
}
