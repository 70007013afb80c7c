import { Link } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '../../../components/ui/data-table';
import { Badge, EmptyState } from '../../../components/ui/notice';
import type { MeterRow } from '../../../../shared/schemas/machines';
import { paths } from '../../../config/paths';
import { formatValue, limitState } from './format';
import { useShopFormat } from '../../../lib/format';

const col = createColumnHelper<MeterRow>();
const KIND = { count: 'Count', 'running-time': 'Running time', condition: 'Condition' } as const;

/** `compact` (the station page): meter name and unit only; codes and kinds are for the people who set meters up. */
export function MetersTable({ meters, compact = false }: { meters: MeterRow[]; compact?: boolean }) {
  const f = useShopFormat();
  const columns = [
    col.accessor('name', {
      header: 'Meter',
      enableHiding: false,
      cell: (c) => (
        <span className="inline-flex flex-wrap items-center gap-x-2">
          <Link className="inline-flex min-h-touch items-center font-semibold text-mandatory-ink underline" to={paths.meter.getHref(c.row.original.id)}>
            {c.getValue()}
          </Link>
          {compact ? <span className="text-sm text-steel-700">in {c.row.original.unit}</span> : null}
        </span>
      ),
    }),
    col.accessor('machineCode', { header: 'On' }),
    ...(compact ? [] : [col.accessor('code', { header: 'Code' }), col.accessor('kind', { header: 'Kind', cell: (c) => KIND[c.getValue()] })]),
    col.accessor((m) => m.latest?.value ?? null, {
      id: 'latest',
      header: 'Latest',
      cell: (c) => {
        const m = c.row.original;
        if (!m.latest) return <span className="text-steel-600">No reading yet</span>;
        const state = limitState(f, m, m.latest.value);
        return (
          <span className="inline-flex flex-wrap items-center gap-2">
            <span className="font-semibold tabular-nums">{formatValue(f, m.latest.value, m.unit)}</span>
            {state ? <Badge tone="danger">{state}</Badge> : null}
          </span>
        );
      },
    }),
    col.accessor((m) => m.latest?.readAt ?? '', { id: 'readAt', header: 'Read', cell: (c) => f.dateTime(c.getValue() || null) }),
  ];
  return <DataTable caption="Meters" columns={columns} data={meters} getRowId={(m) => m.id} empty={<EmptyState title="No meters on this machine yet" />} />;
}
