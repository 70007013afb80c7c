import { useState } from 'react';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '../../../components/ui/data-table';
import { EmptyState, Notice } from '../../../components/ui/notice';
import { REMOVAL_REASON_LABELS, type ChangeRow } from '../../../../shared/schemas/consumables';
import { PART_CATEGORY_LABELS } from '../../../../shared/schemas/stock';
import { useChanges } from '../api/get-changes';
import { useShopFormat, type ShopFormat } from '../../../lib/format';

const col = createColumnHelper<ChangeRow>();

const columnsFor = (f: ShopFormat) => [
  col.accessor('changedAt', { header: 'When', cell: (c) => f.dateTime(c.getValue()) }),
  col.accessor('torchCode', { header: 'Torch' }),
  col.accessor((r) => r.parts.map((p) => PART_CATEGORY_LABELS[p.category]).join(', '), { id: 'parts', header: 'Parts' }),
  col.accessor((r) => r.parts.map((p) => (p.reason ? `${PART_CATEGORY_LABELS[p.category]}: ${REMOVAL_REASON_LABELS[p.reason].toLowerCase()}` : '')).join(' '), {
    id: 'why',
    header: 'Why',
    cell: (c) => {
      const parts = c.row.original.parts.filter((p) => p.reason);
      if (parts.length === 0) return '—';
      return parts.map((p) => `${PART_CATEGORY_LABELS[p.category]}: ${REMOVAL_REASON_LABELS[p.reason!].toLowerCase()}`).join('; ');
    },
  }),
  col.accessor((r) => r.parts.map((p) => (p.lifeStarts === null ? null : p.lifeStarts)).find((x) => x !== null) ?? null, {
    id: 'life',
    header: 'Life of the old parts',
    cell: (c) => {
      const lives = c.row.original.parts.filter((p) => p.lifeStarts !== null || p.lifeArcHours !== null);
      if (lives.length === 0) return '—';
      return lives
        .map(
          (p) =>
            `${PART_CATEGORY_LABELS[p.category]} ${p.lifeStarts !== null ? `${f.number(p.lifeStarts)} starts` : ''}${p.lifeArcHours !== null ? ` / ${f.number(p.lifeArcHours)} h` : ''}`,
        )
        .join('; ');
    },
  }),
  col.accessor('pitDepthMm', { header: 'Pit', cell: (c) => (c.getValue() === null ? '—' : `${c.getValue()} mm`) }),
  col.accessor('by', { header: 'By', cell: (c) => c.getValue() ?? '—' }),
  col.accessor('hasPhoto', {
    header: 'Photo',
    enableSorting: false,
    cell: (c) =>
      c.getValue() ? (
        <a
          className="inline-flex min-h-touch items-center font-semibold text-mandatory-ink underline"
          href={`/api/consumable-changes/${c.row.original.id}/photo`}
          target="_blank"
          rel="noreferrer"
        >
          Open photo
        </a>
      ) : (
        '—'
      ),
  }),
];

export function RecentChanges({ rows, caption = 'Recent consumable changes' }: { rows: ChangeRow[]; caption?: string }) {
  const f = useShopFormat();
  return <DataTable caption={caption} columns={columnsFor(f)} data={rows} getRowId={(r) => r.id} empty={<EmptyState title="No changes logged yet" />} />;
}

/** Every change on a machine's torches, newest first, paged by the server. */
export function ChangesHistory({ machineId }: { machineId: string }) {
  const f = useShopFormat();
  const [page, setPage] = useState(1);
  const pageSize = 20;
  const q = useChanges({ machineId, page, pageSize });
  if (q.isError) return <Notice tone="danger">{q.error.message}</Notice>;
  return (
    <DataTable
      caption="Consumable changes"
      columns={columnsFor(f).map((c) => ({ ...c, enableSorting: false }))}
      data={q.data?.rows ?? []}
      loading={q.isLoading}
      getRowId={(r) => r.id}
      empty={<EmptyState title="No changes logged yet" />}
      server={{ total: q.data?.total ?? 0, page, pageSize, sorting: [], onSortingChange: () => undefined, onPageChange: setPage }}
    />
  );
}
