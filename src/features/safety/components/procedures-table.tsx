import { Link } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '../../../components/ui/data-table';
import { Badge, EmptyState, Notice } from '../../../components/ui/notice';
import { paths } from '../../../config/paths';
import type { ProcedureSummary } from '../../../../shared/schemas/safety-procedures';
import { useProcedures } from '../api/get-procedures';
import { useShopFormat } from '../../../lib/format';

const col = createColumnHelper<ProcedureSummary>();

export function ProceduresTable() {
  const f = useShopFormat();
  const q = useProcedures();
  const now = Date.now();
  return (
    <>
      {q.isError ? <Notice tone="danger">{q.error.message}</Notice> : null}
      <DataTable
        caption="Energy-control procedures"
        data={q.data ?? []}
        loading={q.isLoading}
        getRowId={(r) => r.id}
        empty={<EmptyState title="No procedures yet">The safety officer writes one per machine; until then nobody can lock out with Kerfbook.</EmptyState>}
        columns={[
          col.accessor('machineCode', { header: 'Machine', cell: (c) => `${c.getValue()} · ${c.row.original.machineName}` }),
          col.accessor('title', {
            header: 'Procedure',
            cell: (c) => (
              <Link className="font-semibold underline" to={paths.safetyProcedure.getHref(c.row.original.id)}>
                {c.getValue()}
              </Link>
            ),
          }),
          col.accessor('currentVersion', {
            header: 'In force',
            cell: (c) => (c.getValue() ? <Badge tone="safe">{`v${c.getValue()}`}</Badge> : <Badge tone="caution">Not approved</Badge>),
          }),
          col.accessor('draftVersion', { header: 'Draft', cell: (c) => (c.getValue() ? `v${c.getValue()} waiting` : '—') }),
          col.accessor('lastInspectionAt', { header: 'Last inspection', cell: (c) => f.date(c.getValue() as string | null) }),
          col.accessor('inspectionDueAt', {
            header: 'Inspection due',
            cell: (c) => {
              const v = c.getValue() as string | null;
              if (!v) return '—';
              const overdue = new Date(v).getTime() < now;
              return (
                <span className="flex items-center gap-2">
                  {f.date(v)}{' '}
                  {overdue ? (
                    <Badge tone="danger">Overdue</Badge>
                  ) : new Date(v).getTime() - now < 30 * 86_400_000 ? (
                    <Badge tone="caution">Due soon</Badge>
                  ) : null}
                </span>
              );
            },
          }),
        ]}
      />
    </>
  );
}
