import { Link } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '../../../components/ui/data-table';
import { Badge, EmptyState } from '../../../components/ui/notice';
import { MachineStateBadge } from '../../../components/ui/machine-state-badge';
import { MACHINE_KIND_LABELS, type MachineRow } from '../../../../shared/schemas/machines';
import { paths } from '../../../config/paths';

const col = createColumnHelper<MachineRow>();

/** Machines in tree order; components are indented under their machine. */
export function MachinesTable({ rows, loading, toolbar }: { rows: MachineRow[]; loading?: boolean; toolbar?: React.ReactNode }) {
  const columns = [
    col.accessor('code', {
      header: 'Code',
      enableHiding: false,
      cell: (c) => (
        <Link
          to={paths.machine.getHref(c.row.original.id)}
          className="inline-flex min-h-touch min-w-touch items-center font-bold text-mandatory-ink underline"
          style={{ paddingLeft: `${c.row.original.depth * 1.25}rem` }}
        >
          {c.row.original.depth > 0 ? (
            <span aria-hidden className="mr-1 text-steel-500">
              └
            </span>
          ) : null}
          {c.getValue()}
        </Link>
      ),
    }),
    col.accessor('name', { header: 'Name' }),
    col.accessor('kind', { header: 'Kind', cell: (c) => MACHINE_KIND_LABELS[c.getValue()] }),
    col.accessor('location', { header: 'Location', cell: (c) => c.getValue() ?? '—' }),
    col.accessor('serial', { header: 'Serial', cell: (c) => c.getValue() ?? '—' }),
    col.accessor('meterCount', { header: 'Meters' }),
    col.accessor((r) => r.status.state, {
      id: 'state',
      header: 'State',
      cell: (c) =>
        c.row.original.active ? (
          <span title={c.row.original.status.reason ?? undefined}>
            <MachineStateBadge state={c.row.original.status.state} />
          </span>
        ) : (
          <Badge>Retired</Badge>
        ),
    }),
  ];
  return (
    <DataTable
      caption="Machines and components"
      columns={columns}
      data={rows}
      loading={loading}
      getRowId={(r) => r.id}
      toolbar={toolbar}
      empty={<EmptyState title="No machines yet">Add the first machine with the form above.</EmptyState>}
    />
  );
}
