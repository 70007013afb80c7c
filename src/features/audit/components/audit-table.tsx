import { useState } from 'react';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '../../../components/ui/data-table';
import { EmptyState, Notice } from '../../../components/ui/notice';
import { useAuditEvents, type AuditRow } from '../api/get-audit-events';

const col = createColumnHelper<AuditRow>();
/** 'work-order.closed' → 'Work order: closed' — readable without a label for every action. */
const describeAction = (action: string) => {
  const [area, ...rest] = action.split('.');
  const words = (s: string) => s.replace(/[-_]/g, ' ');
  const head = words(area);
  return rest.length ? `${head.charAt(0).toUpperCase()}${head.slice(1)}: ${words(rest.join(' '))}` : head;
};
const fmt = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'short' });
const columns = [
  col.accessor('at', { header: 'When', cell: (c) => fmt.format(new Date(c.getValue())), enableSorting: false }),
  col.accessor('actor', { header: 'Who', cell: (c) => c.getValue() ?? 'System', enableSorting: false }),
  col.accessor('action', { header: 'What', cell: (c) => describeAction(c.getValue()), enableSorting: false }),
  col.accessor('entityType', { header: 'Record', cell: (c) => `${c.getValue()}${c.row.original.entityId ? ` ${c.row.original.entityId.slice(0, 8)}` : ''}`, enableSorting: false }),
];

export function AuditTable({ pageSize = 25 }: { pageSize?: number }) {
  const [page, setPage] = useState(1);
  const q = useAuditEvents({ page, pageSize });
  if (q.isError) return <Notice tone="danger">{q.error.message}</Notice>;
  return (
    <DataTable
      caption="Activity log"
      columns={columns}
      data={q.data?.rows ?? []}
      loading={q.isLoading}
      getRowId={(r) => r.id}
      empty={<EmptyState title="No activity yet" />}
      server={{ total: q.data?.total ?? 0, page, pageSize, sorting: [], onSortingChange: () => undefined, onPageChange: setPage }}
    />
  );
}
