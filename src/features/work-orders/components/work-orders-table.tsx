import { useMemo, useState } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { createColumnHelper, type SortingState } from '@tanstack/react-table';
import { DataTable } from '../../../components/ui/data-table';
import { EmptyState, Notice } from '../../../components/ui/notice';
import {
  DUE_FILTERS,
  DUE_FILTER_LABELS,
  WORK_KIND_LABELS,
  WORK_STATES,
  WORK_STATE_LABELS,
  type ListWorkOrdersQuery,
  type WorkOrderRow,
} from '../../../../shared/schemas/work-orders';
import { ROLE_LABELS } from '../../../../shared/permissions';
import { useWorkOrders } from '../api/get-work-orders';
import { useLookups } from '../../../lib/lookups';
import { usePlanOptions } from '../api/get-plan-options';
import { DueBadge, LockoutBadge, StateBadge } from '../../../components/ui/work-badges';
import { useShopFormat } from '../../../lib/format';
import { useSettledSearch } from '../../../lib/search-text';

const col = createColumnHelper<WorkOrderRow>();

/** One work order on a phone: number and work, machine, due and state, with no sideways scrolling. */
function WorkOrderCard({ row }: { row: WorkOrderRow }) {
  const f = useShopFormat();
  return (
    <div className="space-y-1">
      <div className="flex items-start justify-between gap-2">
        <Link
          className="inline-flex min-h-touch min-w-0 flex-1 items-center font-semibold underline"
          to={`/work-orders/${row.id}`}
          aria-label={`WO ${row.number}: ${row.title}`}
        >
          <span className="break-words">
            <span className="font-bold text-mandatory">WO {row.number}</span> · {row.title}
          </span>
        </Link>
        <span className="shrink-0 pt-2">
          <StateBadge status={row.status} />
        </span>
      </div>
      <p className="text-sm text-steel-800">
        {row.machine.code} · {row.machine.name}
        {row.requiresLockout ? (
          <span className="ml-2 inline-block align-middle">
            <LockoutBadge />
          </span>
        ) : null}
      </p>
      <p className="flex flex-wrap items-center gap-x-2 text-sm text-steel-700">
        <span>Due {f.dateTime(row.dueAt)}</span>
        <DueBadge state={row.dueState} />
        {row.dueState !== 'closed' && row.dueAt ? <span>{f.relative(row.dueAt)}</span> : null}
      </p>
    </div>
  );
}

/** The orders a phone offers in place of the table's sortable headers. */
const PHONE_SORTS = [
  { value: 'dueAt:asc', label: 'Due, soonest first' },
  { value: 'dueAt:desc', label: 'Due, latest first' },
  { value: 'number:desc', label: 'Newest first' },
  { value: 'number:asc', label: 'Oldest first' },
  { value: 'machine:asc', label: 'Machine' },
  { value: 'status:asc', label: 'State' },
] as const;
const filterClass = 'min-h-touch rounded border border-steel-400 bg-white px-3 font-normal';

/**
 * Work orders with server paging. Filters live in the URL (?assignee=me&due=overdue …) so links in
 * mails and on the home page open the right view. `fixed` filters (e.g. a plan's work) are not shown.
 */
export function WorkOrdersTable({
  fixed = {},
  caption = 'Work orders',
  pageSize = 25,
  defaultStatus = 'active',
  defaultSort = { sort: 'dueAt', dir: 'asc' },
}: {
  fixed?: Partial<ListWorkOrdersQuery>;
  caption?: string;
  pageSize?: number;
  /** 'active' lists unfinished work; 'any' includes signed-off and called-off work (a plan's history). */
  defaultStatus?: 'active' | 'any';
  /** The order before anyone sorts: soonest due for a to-do list, newest first for a history. */
  defaultSort?: { sort: ListWorkOrdersQuery['sort']; dir: 'asc' | 'desc' };
}) {
  const f = useShopFormat();
  const [params, setParams] = useSearchParams();
  const lookups = useLookups();
  const plans = usePlanOptions();
  const get = (k: string) => params.get(k) ?? '';
  const page = Number(params.get('page') ?? '1') || 1;
  const sort = (params.get('sort') ?? defaultSort.sort) as ListWorkOrdersQuery['sort'];
  const dir = (params.get('sort') ? (params.get('dir') ?? 'asc') : defaultSort.dir) as 'asc' | 'desc';
  const status = (params.get('status') ?? defaultStatus) as ListWorkOrdersQuery['status'] | 'any';
  const set = (k: string, v: string) => {
    const next = new URLSearchParams(params);
    if (v) next.set(k, v);
    else next.delete(k);
    if (k !== 'page') next.delete('page');
    setParams(next, { replace: true });
  };
  const settledSearch = useSettledSearch(get('q'));
  const filters = {
    page,
    pageSize,
    sort,
    dir,
    status: status === 'any' ? undefined : status,
    machineId: get('machineId') || undefined,
    due: (get('due') || undefined) as ListWorkOrdersQuery['due'],
    assignee: get('assignee') || undefined,
    planId: get('planId') || undefined,
    q: settledSearch || undefined,
    ...fixed,
  };
  const q = useWorkOrders(filters);
  // The search box keeps its own text: read back from the address, quick typing lost letters ("Rhe ps").
  const [search, setSearch] = useState(get('q'));
  const [searchInUrl, setSearchInUrl] = useState(get('q'));
  if (searchInUrl !== get('q')) {
    setSearchInUrl(get('q'));
    if (get('q') !== search.trim()) setSearch(get('q'));
  }
  const sorting: SortingState = [{ id: sort, desc: dir === 'desc' }];

  const columns = useMemo(
    () => [
      col.accessor('number', {
        id: 'number',
        header: 'WO',
        enableHiding: false,
        // The row's link for everyone: a 44 px target for a gloved finger, and a name that tells rows
        // apart for a screen reader (titles repeat: every month's "Renew hydraulic oil").
        cell: (c) => (
          <Link
            className="inline-flex min-h-touch min-w-touch items-center justify-center font-bold text-mandatory underline"
            to={`/work-orders/${c.row.original.id}`}
            aria-label={`WO ${c.getValue()}: ${c.row.original.title}`}
          >
            {c.getValue()}
          </Link>
        ),
      }),
      col.accessor('title', {
        id: 'title',
        header: 'Work',
        cell: (c) => (
          <div className="min-w-48">
            {/* The same place as the number link: a pointer target only, so a keyboard meets each row once. */}
            <Link
              className="inline-flex min-h-touch items-center font-semibold underline"
              to={`/work-orders/${c.row.original.id}`}
              tabIndex={-1}
              aria-hidden="true"
            >
              {c.getValue()}
            </Link>
            <div className="mt-1 flex flex-wrap gap-1">
              {c.row.original.requiresLockout ? <LockoutBadge /> : null}
              <span className="text-xs text-steel-600">
                {WORK_KIND_LABELS[c.row.original.kind]}
                {c.row.original.plan && c.row.original.plan.title !== c.getValue() ? ` · plan: ${c.row.original.plan.title}` : ''}
              </span>
            </div>
          </div>
        ),
      }),
      col.accessor((r) => r.machine.code, { id: 'machine', header: 'Machine', cell: (c) => <span title={c.row.original.machine.name}>{c.getValue()}</span> }),
      col.accessor('dueAt', {
        id: 'dueAt',
        header: 'Due',
        cell: (c) => (
          <div className="whitespace-nowrap">
            <div>{f.dateTime(c.getValue())}</div>
            <div className="flex items-center gap-1 text-xs text-steel-600">
              <DueBadge state={c.row.original.dueState} /> {c.row.original.dueState !== 'closed' ? f.relative(c.getValue()) : null}
            </div>
          </div>
        ),
      }),
      col.accessor('status', { id: 'status', header: 'State', cell: (c) => <StateBadge status={c.getValue()} /> }),
      col.accessor((r) => r.assignee?.name ?? (r.responsibleRole ? `Any ${ROLE_LABELS[r.responsibleRole].toLowerCase()}` : '—'), {
        id: 'assignee',
        header: 'For',
        enableSorting: false,
      }),
      col.accessor('raisedAt', { id: 'raisedAt', header: 'Raised', cell: (c) => f.date(c.getValue()) }),
    ],
    [f],
  );

  return (
    <div className="space-y-3">
      {q.isError ? (
        <Notice tone="danger" role="alert">
          {q.error.message}
        </Notice>
      ) : null}
      <DataTable
        caption={caption}
        columns={columns}
        data={q.data?.rows ?? []}
        loading={q.isLoading}
        fetching={q.isFetching}
        resultKey={JSON.stringify(filters)}
        countLabel={(n) => `${n} work ${n === 1 ? 'order matches' : 'orders match'}`}
        getRowId={(r) => r.id}
        foldToolbar
        renderCard={(r) => <WorkOrderCard row={r} />}
        empty={<EmptyState title="No work matches these filters">Try “Any state” or clear the filters.</EmptyState>}
        server={{
          total: q.data?.total ?? 0,
          page,
          pageSize,
          sorting,
          onSortingChange: (s) => {
            const next = new URLSearchParams(params);
            next.set('sort', s[0]?.id ?? defaultSort.sort);
            next.set('dir', s[0]?.desc ? 'desc' : 'asc');
            next.delete('page');
            setParams(next, { replace: true });
          },
          onPageChange: (p) => set('page', String(p)),
        }}
        toolbar={
          <>
            {/* Cards have no column headers to press: on a phone the order is chosen here. */}
            <label className="flex flex-col text-sm font-semibold sm:hidden">
              Sort by
              <select
                className={filterClass}
                value={`${sort}:${dir}`}
                onChange={(e) => {
                  const [id, d] = e.target.value.split(':');
                  const next = new URLSearchParams(params);
                  next.set('sort', id);
                  next.set('dir', d);
                  next.delete('page');
                  setParams(next, { replace: true });
                }}
              >
                {PHONE_SORTS.map((o) => (
                  <option key={o.value} value={o.value}>
                    {o.label}
                  </option>
                ))}
                {PHONE_SORTS.some((o) => o.value === `${sort}:${dir}`) ? null : <option value={`${sort}:${dir}`}>As chosen</option>}
              </select>
            </label>
            <label className="flex flex-col text-sm font-semibold">
              Search
              <input
                className={filterClass}
                value={search}
                placeholder="Title, machine or WO number"
                onChange={(e) => {
                  setSearch(e.target.value);
                  set('q', e.target.value.trim());
                }}
              />
            </label>
            {fixed.machineId || fixed.planId ? null : (
              <label className="flex flex-col text-sm font-semibold">
                Machine
                <select className={filterClass} value={get('machineId')} onChange={(e) => set('machineId', e.target.value)}>
                  <option value="">All machines</option>
                  {(lookups.data?.machines ?? []).map((m) => (
                    <option key={m.id} value={m.id}>
                      {m.code} · {m.name}
                    </option>
                  ))}
                </select>
              </label>
            )}
            <label className="flex flex-col text-sm font-semibold">
              State
              <select
                className={filterClass}
                value={status ?? defaultStatus}
                onChange={(e) => set('status', e.target.value === defaultStatus ? '' : e.target.value)}
              >
                <option value="active">Not finished</option>
                {WORK_STATES.map((s) => (
                  <option key={s} value={s}>
                    {WORK_STATE_LABELS[s]}
                  </option>
                ))}
                <option value="any">Any state</option>
              </select>
            </label>
            <label className="flex flex-col text-sm font-semibold">
              Due
              <select className={filterClass} value={get('due')} onChange={(e) => set('due', e.target.value)}>
                <option value="">Any time</option>
                {DUE_FILTERS.map((d) => (
                  <option key={d} value={d}>
                    {DUE_FILTER_LABELS[d]}
                  </option>
                ))}
              </select>
            </label>
            {fixed.planId ? null : (
              <label className="flex flex-col text-sm font-semibold">
                Plan
                <select className={`${filterClass} max-w-64`} value={get('planId')} onChange={(e) => set('planId', e.target.value)}>
                  <option value="">Any plan, or none</option>
                  {(plans.data?.rows ?? [])
                    // Narrowed to the chosen machine, but a chosen plan stays listed so the select never shows blank.
                    .filter((p) => !get('machineId') || p.machine.id === get('machineId') || p.id === get('planId'))
                    .map((p) => (
                      <option key={p.id} value={p.id}>
                        {p.machine.code} · {p.title}
                        {p.active ? '' : ' (retired)'}
                      </option>
                    ))}
                </select>
              </label>
            )}
            {fixed.assignee ? null : (
              <label className="flex flex-col text-sm font-semibold">
                For
                <select className={filterClass} value={get('assignee')} onChange={(e) => set('assignee', e.target.value)}>
                  <option value="">Everyone</option>
                  <option value="me">Me (and my role)</option>
                  <option value="unassigned">No one named</option>
                  {(lookups.data?.people ?? []).map((p) => (
                    <option key={p.userId} value={p.userId}>
                      {p.name}
                    </option>
                  ))}
                </select>
              </label>
            )}
          </>
        }
      />
    </div>
  );
}
