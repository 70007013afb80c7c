import { useState } from 'react';
import { Link } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '../../../components/ui/data-table';
import { Badge, EmptyState, Notice } from '../../../components/ui/notice';
import { paths } from '../../../config/paths';
import type { LockRegisterQuery, LockRegisterRow, LockUse } from '../../../../shared/schemas/safety-lockout';
import { useLockRegister } from '../api/get-lock-register';
import { useShopFormat } from '../../../lib/format';
import { useSettledSearch } from '../../../lib/search-text';

const col = createColumnHelper<LockRegisterRow>();
const filterClass = 'min-h-touch rounded border border-steel-400 bg-white px-3 font-normal';
const PAGE_SIZE = 25;

function UseLine({ use }: { use: LockUse }) {
  const f = useShopFormat();
  return (
    <>
      <Link className="font-semibold underline" to={paths.safetyLockout.getHref(use.lockoutId)}>
        {use.machineCode}
      </Link>{' '}
      · {use.where} · {use.holderName} · {f.dateTime(use.appliedAt)}
      {use.removedAt
        ? ` to ${f.dateTime(use.removedAt)}${use.removedByName && use.removedByName !== use.holderName ? ` (removed by ${use.removedByName})` : ''}`
        : ''}
    </>
  );
}

/** Every lock by its number: whose it is, where it hangs now, and where it has been. */
export function LockRegister() {
  const [page, setPage] = useState(1);
  const [status, setStatus] = useState<LockRegisterQuery['status']>('all');
  const [search, setSearch] = useState('');
  const settledSearch = useSettledSearch(search);
  const q = useLockRegister({ page, pageSize: PAGE_SIZE, status, q: settledSearch || undefined });
  return (
    <div className="space-y-3">
      {q.isError ? <Notice tone="danger">{q.error.message}</Notice> : null}
      <DataTable
        caption="Locks by number, applied ones first"
        data={q.data?.rows ?? []}
        loading={q.isLoading}
        fetching={q.isFetching}
        resultKey={`${status}|${settledSearch}`}
        getRowId={(r) => r.lockNumber}
        empty={<EmptyState title={search || status !== 'all' ? 'No lock matches' : 'No lock has been applied yet'} />}
        server={{ total: q.data?.total ?? 0, page, pageSize: PAGE_SIZE, sorting: [], onSortingChange: () => undefined, onPageChange: setPage }}
        toolbar={
          <>
            <label className="flex flex-col text-sm font-semibold">
              Lock number or holder
              <input className={filterClass} type="search" value={search} onChange={(e) => (setSearch(e.target.value), setPage(1))} autoComplete="off" />
            </label>
            <label className="flex flex-col text-sm font-semibold">
              Where
              <select className={filterClass} value={status} onChange={(e) => (setStatus(e.target.value as LockRegisterQuery['status']), setPage(1))}>
                <option value="all">All locks</option>
                <option value="applied">Applied now</option>
                <option value="free">Not applied</option>
              </select>
            </label>
          </>
        }
        columns={[
          col.accessor('lockNumber', { header: 'Lock', enableSorting: false, cell: (c) => <span className="font-mono font-bold">{c.getValue()}</span> }),
          col.accessor('holderName', { header: 'Holder', enableSorting: false }),
          col.accessor('current', {
            header: 'Applied now',
            enableSorting: false,
            cell: (c) => {
              const use = c.getValue();
              return use ? (
                <span className="flex flex-wrap items-center gap-2">
                  <Badge tone="danger">On</Badge>
                  <span>
                    <UseLine use={use} />
                  </span>
                </span>
              ) : (
                <span className="text-steel-600">Not applied</span>
              );
            },
          }),
          col.accessor('history', {
            header: 'Where it has been',
            enableSorting: false,
            cell: (c) => {
              const { history, uses } = c.row.original;
              return (
                <details>
                  <summary className="min-h-touch cursor-pointer py-2 font-semibold underline">
                    {uses} use{uses === 1 ? '' : 's'}
                    {uses > history.length ? ` (latest ${history.length} shown)` : ''}
                  </summary>
                  <ol className="list-decimal space-y-1 pl-5 text-sm">
                    {history.map((u) => (
                      <li key={`${u.lockoutId}-${u.appliedAt}-${u.where}`}>
                        <UseLine use={u} />
                      </li>
                    ))}
                  </ol>
                </details>
              );
            },
          }),
        ]}
      />
    </div>
  );
}
