import { useState } from 'react';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '../../../components/ui/data-table';
import { Badge, EmptyState, Notice } from '../../../components/ui/notice';
import { SAFETY_EVENT_KIND_LABELS, safetyEventActionLabel, type SafetyEventRow } from '../../../../shared/schemas/safety-audit';
import { useSafetyEvents, type SafetyEventFilters } from '../api/get-safety-events';
import { SafetyMachineFilter } from './machine-filter';
import { useShopFormat } from '../../../lib/format';

const col = createColumnHelper<SafetyEventRow>();
const filterClass = 'min-h-touch rounded border border-steel-400 bg-white px-3 font-normal';
const PAGE_SIZE = 25;

/** Refused attempts and raised alarms: what the signatures alone do not show. */
export function SafetyEventsTable() {
  const f = useShopFormat();
  const [page, setPage] = useState(1);
  const [kind, setKind] = useState<SafetyEventFilters['kind'] | ''>('');
  const [machineId, setMachineId] = useState('');
  const q = useSafetyEvents({ page, pageSize: PAGE_SIZE, kind: kind || undefined, machineId: machineId || undefined });
  return (
    <div className="space-y-3">
      {q.isError ? <Notice tone="danger">{q.error.message}</Notice> : null}
      <DataTable
        caption="Refusals and alarms, newest first"
        data={q.data?.rows ?? []}
        loading={q.isLoading}
        fetching={q.isFetching}
        resultKey={`${kind}|${machineId}`}
        getRowId={(r) => r.id}
        empty={<EmptyState title={kind || machineId ? 'Nothing matches these filters' : 'Nothing refused and no alarm raised so far'} />}
        server={{ total: q.data?.total ?? 0, page, pageSize: PAGE_SIZE, sorting: [], onSortingChange: () => undefined, onPageChange: setPage }}
        toolbar={
          <>
            <label className="flex flex-col text-sm font-semibold">
              Kind
              <select className={filterClass} value={kind} onChange={(e) => (setKind(e.target.value as SafetyEventFilters['kind'] | ''), setPage(1))}>
                <option value="">Both</option>
                <option value="refused">{SAFETY_EVENT_KIND_LABELS.refused}</option>
                <option value="alarm">{SAFETY_EVENT_KIND_LABELS.alarm}</option>
              </select>
            </label>
            <SafetyMachineFilter value={machineId} onChange={(id) => (setMachineId(id), setPage(1))} />
          </>
        }
        columns={[
          col.accessor('at', { header: 'When', enableSorting: false, cell: (c) => f.dateTime(c.getValue()) }),
          col.accessor('kind', {
            header: 'Kind',
            enableSorting: false,
            cell: (c) => <Badge tone={c.row.original.kind === 'alarm' ? 'danger' : 'caution'}>{SAFETY_EVENT_KIND_LABELS[c.row.original.kind]}</Badge>,
          }),
          col.accessor('action', { header: 'What', enableSorting: false, cell: (c) => safetyEventActionLabel(c.row.original.action) }),
          col.accessor('reason', { header: 'Why', enableSorting: false }),
          col.accessor('personName', { header: 'Person', enableSorting: false, cell: (c) => c.getValue() ?? '—' }),
          col.accessor('machineCode', { header: 'Machine', enableSorting: false, cell: (c) => c.getValue() ?? '—' }),
        ]}
      />
    </div>
  );
}
