import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '../../../components/ui/data-table';
import { FilterSelect, useServerTable } from '../../../components/ui/data-table-filters';
import { EmptyState, Notice } from '../../../components/ui/notice';
import { useActivityLog, type ActivityRow } from '../api/get-activity-log';
import { useShopFormat, type ShopFormat } from '../../../lib/format';

const col = createColumnHelper<ActivityRow>();
const words = (s: string) => s.replace(/[-_]/g, ' ');
const capital = (s: string) => `${s.charAt(0).toUpperCase()}${s.slice(1)}`;
/** 'work-order.closed' → 'Work order: closed' — readable without a label for every action. */
const describeAction = (action: string) => {
  const [area, ...rest] = action.split('.');
  const head = words(area);
  return rest.length ? `${capital(head)}: ${words(rest.join(' '))}` : head;
};
/** 'WorkOrder' with its number → 'Work order 1042'; with a title or name, that; else the kind of record. */
const describeRecord = (r: ActivityRow) => {
  const kind = capital(r.entityType.replace(/([a-z])([A-Z])/g, '$1 $2').toLowerCase());
  const d = r.details ?? {};
  const label =
    typeof d.number === 'number'
      ? String(d.number)
      : typeof d.title === 'string'
        ? d.title
        : typeof d.code === 'string'
          ? d.code
          : typeof d.email === 'string'
            ? d.email
            : null;
  return label ? `${kind} ${label}` : kind;
};
const columnsFor = (f: ShopFormat) => [
  col.accessor('at', { header: 'When', cell: (c) => f.dateTime(c.getValue()) }),
  col.accessor('actor', { header: 'Who', cell: (c) => c.getValue() ?? 'System', enableSorting: false }),
  col.accessor('action', { header: 'What', cell: (c) => describeAction(c.getValue()), enableSorting: false }),
  col.display({ id: 'record', header: 'Record', cell: (c) => describeRecord(c.row.original) }),
];

/** The shop's activity; `filters` off for the short list on the home page. */
export function ActivityLogTable({ pageSize = 25, filters = true }: { pageSize?: number; filters?: boolean }) {
  const f = useShopFormat();
  const t = useServerTable([{ id: 'at', desc: true }], { area: '', actor: '' });
  const { area, actor } = t.filters;
  const q = useActivityLog({
    page: t.page,
    pageSize,
    area: area || undefined,
    actor: actor || undefined,
    dir: t.sorting[0] && !t.sorting[0].desc ? 'asc' : 'desc',
  });
  if (q.isError) return <Notice tone="danger">{q.error.message}</Notice>;
  return (
    <DataTable
      caption="Activity log"
      columns={columnsFor(f)}
      data={q.data?.rows ?? []}
      loading={q.isLoading}
      fetching={q.isFetching}
      resultKey={t.resultKey}
      countLabel={(n) => `${n} ${n === 1 ? 'entry matches' : 'entries match'}`}
      getRowId={(r) => r.id}
      empty={<EmptyState title={area || actor ? 'Nothing matches these filters' : 'No activity yet'} />}
      server={t.paging(q.data?.total ?? 0, pageSize)}
      toolbar={
        filters ? (
          <>
            <FilterSelect label="Area" value={area} onChange={(v) => t.setFilter('area', v)}>
              <option value="">Everything</option>
              {(q.data?.areas ?? []).map((a) => (
                <option key={a} value={a}>
                  {capital(words(a))}
                </option>
              ))}
            </FilterSelect>
            <FilterSelect label="Who" value={actor} onChange={(v) => t.setFilter('actor', v)}>
              <option value="">Anyone</option>
              <option value="system">System (scheduled pass)</option>
              {(q.data?.people ?? []).map((p) => (
                <option key={p.id} value={p.id}>
                  {p.name}
                </option>
              ))}
            </FilterSelect>
          </>
        ) : undefined
      }
    />
  );
}
