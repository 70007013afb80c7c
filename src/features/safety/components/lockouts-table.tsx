import { useState } from 'react';
import { Link } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '../../../components/ui/data-table';
import { EmptyState, Notice } from '../../../components/ui/notice';
import { paths } from '../../../config/paths';
import { LOCKOUT_STATE_LABELS, LOCKOUT_STATES, type ListLockoutsQuery, type LockoutRow } from '../../../../shared/schemas/safety-lockout';
import { useLockouts } from '../api/get-lockouts';
import { SafetyMachineFilter } from './machine-filter';
import { LockoutStateBadge } from './badges';
import { useShopFormat } from '../../../lib/format';

const col = createColumnHelper<LockoutRow>();
const filterClass = 'min-h-touch rounded border border-steel-400 bg-white px-3 font-normal';

export function LockoutsTable() {
  const f = useShopFormat();
  const [page, setPage] = useState(1);
  const [state, setState] = useState<ListLockoutsQuery['state'] | ''>('');
  const [machineId, setMachineId] = useState('');
  const q = useLockouts({ page, pageSize: 25, state: state || undefined, machineId: machineId || undefined });
  return (
    <div className="space-y-3">
      {q.isError ? <Notice tone="danger">{q.error.message}</Notice> : null}
      <DataTable
        caption="Lockouts, open first"
        data={q.data?.rows ?? []}
        loading={q.isLoading}
        getRowId={(r) => r.id}
        empty={<EmptyState title="No lockouts match" />}
        server={{ total: q.data?.total ?? 0, page, pageSize: 25, sorting: [], onSortingChange: () => undefined, onPageChange: setPage }}
        toolbar={
          <>
            <label className="flex flex-col text-sm font-semibold">
              State
              <select className={filterClass} value={state} onChange={(e) => (setState(e.target.value as ListLockoutsQuery['state'] | ''), setPage(1))}>
                <option value="">Any state</option>
                <option value="open">Open (not released)</option>
                {LOCKOUT_STATES.map((s) => (
                  <option key={s} value={s}>
                    {LOCKOUT_STATE_LABELS[s]}
                  </option>
                ))}
              </select>
            </label>
            <SafetyMachineFilter value={machineId} onChange={(id) => (setMachineId(id), setPage(1))} />
          </>
        }
        columns={[
          col.accessor('machineCode', {
            header: 'Machine',
            enableSorting: false,
            cell: (c) => (
              <Link className="font-semibold underline" to={paths.safetyLockout.getHref(c.row.original.id)}>
                {c.getValue()} · {c.row.original.machineName}
              </Link>
            ),
          }),
          col.accessor('state', { header: 'State', enableSorting: false, cell: (c) => <LockoutStateBadge state={c.getValue()} /> }),
          col.accessor('reason', { header: 'Work', enableSorting: false }),
          col.accessor('primaryName', { header: 'Held by', enableSorting: false }),
          col.accessor('activeMembers', { header: 'Personal locks', enableSorting: false }),
          col.accessor('appliedAt', { header: 'Applied', enableSorting: false, cell: (c) => f.dateTime(c.getValue()) }),
          col.accessor('releasedAt', { header: 'Released', enableSorting: false, cell: (c) => f.dateTime(c.getValue()) }),
        ]}
      />
    </div>
  );
}
