import { useMemo } from 'react';
import { Link } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '../../../components/ui/data-table';
import { FilterSearch, FilterSelect, useServerTable } from '../../../components/ui/data-table-filters';
import { Badge, EmptyState, Notice } from '../../../components/ui/notice';
import { DUE_STATES, DUE_STATE_LABELS, type DueState, type ListPlansQuery, type PlanRow } from '../../../../shared/schemas/plans';
import { usePlans } from '../api/get-plans';
import { useLookups } from '../../../lib/lookups';
import { PlanDueBadge } from './plan-badges';
import { useShopFormat } from '../../../lib/format';

const col = createColumnHelper<PlanRow>();

export function PlansTable({ machineId: fixedMachine }: { machineId?: string }) {
  const f = useShopFormat();
  const lookups = useLookups();
  const t = useServerTable([{ id: 'nextDueAt', desc: false }], {
    q: '',
    machineId: '',
    status: '' as DueState | '',
    active: 'true' as ListPlansQuery['active'],
  });
  const { q, machineId, status, active } = t.filters;
  const pageSize = 25;
  const plans = usePlans({
    page: t.page,
    pageSize,
    q: t.queryFilters.q || undefined,
    machineId: fixedMachine ?? (machineId || undefined),
    status: status || undefined,
    active,
    sort: (t.sorting[0]?.id ?? 'nextDueAt') as ListPlansQuery['sort'],
    dir: t.sorting[0]?.desc ? 'desc' : 'asc',
  });
  const columns = useMemo(
    () => [
      col.accessor('title', {
        id: 'title',
        header: 'Plan',
        enableHiding: false,
        cell: (c) => (
          <div className="min-w-56">
            <Link className="inline-flex min-h-touch items-center font-semibold text-mandatory underline" to={`/plans/${c.row.original.id}`}>
              {c.getValue()}
            </Link>
            <p className="text-xs text-steel-600">{c.row.original.triggerSummary}</p>
            <div className="mt-1 flex flex-wrap gap-1">
              {c.row.original.requiresLockout ? <Badge tone="mandatory">Lockout</Badge> : null}
              {c.row.original.safetyCritical ? <Badge tone="mandatory">Safety work</Badge> : null}
              {!c.row.original.active ? <Badge>Paused plan</Badge> : null}
            </div>
          </div>
        ),
      }),
      col.accessor((r) => r.machine.code, { id: 'machine', header: 'Machine', cell: (c) => <span title={c.row.original.machine.name}>{c.getValue()}</span> }),
      col.accessor('status', { id: 'status', header: 'Status', cell: (c) => <PlanDueBadge status={c.getValue()} /> }),
      col.accessor('nextDueAt', {
        id: 'nextDueAt',
        header: 'Next due',
        cell: (c) => (
          <div className="whitespace-nowrap">
            <div>{f.dateTime(c.getValue())}</div>
            <div className="text-xs text-steel-600">{f.relative(c.getValue())}</div>
          </div>
        ),
      }),
      col.accessor('lastDoneAt', { id: 'lastDoneAt', header: 'Last done', enableSorting: false, cell: (c) => f.date(c.getValue()) }),
      col.accessor('responsible', { id: 'responsible', header: 'For (role or person)', enableSorting: false }),
    ],
    [f],
  );
  return (
    <div className="space-y-3">
      {plans.isError ? (
        <Notice tone="danger" role="alert">
          {plans.error.message}
        </Notice>
      ) : null}
      <DataTable
        caption="Maintenance plans"
        columns={columns}
        data={plans.data?.rows ?? []}
        loading={plans.isLoading}
        fetching={plans.isFetching}
        resultKey={t.resultKey}
        countLabel={(n) => `${n} ${n === 1 ? 'plan matches' : 'plans match'}`}
        getRowId={(r) => r.id}
        empty={<EmptyState title="No plans match">Apply starter plans to a machine, or write a plan of your own.</EmptyState>}
        server={t.paging(plans.data?.total ?? 0, pageSize)}
        toolbar={
          <>
            <FilterSearch value={q} placeholder="Plan or machine" onChange={(v) => t.setFilter('q', v)} />
            {fixedMachine ? null : (
              <FilterSelect label="Machine" value={machineId} onChange={(v) => t.setFilter('machineId', v)}>
                <option value="">All machines</option>
                {(lookups.data?.machines ?? [])
                  .filter((m) => !m.parentId)
                  .map((m) => (
                    <option key={m.id} value={m.id}>
                      {m.code} · {m.name}
                    </option>
                  ))}
              </FilterSelect>
            )}
            <FilterSelect label="Status" value={status} onChange={(v) => t.setFilter('status', v as DueState | '')}>
              <option value="">Any status</option>
              {[...DUE_STATES].reverse().map((s) => (
                <option key={s} value={s}>
                  {DUE_STATE_LABELS[s]}
                </option>
              ))}
            </FilterSelect>
            <FilterSelect label="Plans" value={active} onChange={(v) => t.setFilter('active', v as ListPlansQuery['active'])}>
              <option value="true">In use</option>
              <option value="false">Paused</option>
              <option value="all">All</option>
            </FilterSelect>
          </>
        }
      />
    </div>
  );
}
