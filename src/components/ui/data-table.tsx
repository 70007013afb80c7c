import { useId, useState, type ReactNode } from 'react';
import {
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getPaginationRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnDef,
  type SortingState,
  type VisibilityState,
} from '@tanstack/react-table';
import { Button } from './button';
import { EmptyState } from './notice';

/** Server-driven paging and sorting, for lists that grow without bound. */
export type ServerPaging = {
  total: number;
  page: number;
  pageSize: number;
  sorting: SortingState;
  onSortingChange: (s: SortingState) => void;
  onPageChange: (page: number) => void;
};

type Props<T> = {
  columns: ColumnDef<T, any>[]; // eslint-disable-line @typescript-eslint/no-explicit-any
  data: T[];
  caption: string;
  server?: ServerPaging;
  loading?: boolean;
  empty?: ReactNode;
  toolbar?: ReactNode;
  getRowId?: (row: T) => string;
  /** Fetching a new result (a server table keeps showing the last one meanwhile): the count is announced once it is in. */
  fetching?: boolean;
  /** What the count says out loud, e.g. n => `${n} signatures match`. */
  countLabel?: (count: number) => string;
  /** Changes whenever the filters outside the table change, so the new count is announced. */
  resultKey?: string;
  /** On a phone (below 640 px) each row is shown as this card instead of a table row that would need sideways scrolling. */
  renderCard?: (row: T) => ReactNode;
  /** On a phone the toolbar (filters) folds behind a “Filters” button. */
  foldToolbar?: boolean;
};

const headerText = (header: unknown, id: string) => (typeof header === 'string' ? header : id);

/**
 * A table with sorting, paging and a filter. Sortable headers are buttons whose header cell carries
 * `aria-sort`; every change of filters, sorting or page is announced ("12 signatures match, sorted
 * by Signed, ascending") through a live region that is on the page from the start.
 */
export function DataTable<T>({
  columns,
  data,
  caption,
  server,
  loading,
  empty,
  toolbar,
  getRowId,
  fetching,
  countLabel,
  resultKey = '',
  renderCard,
  foldToolbar = false,
}: Props<T>) {
  const [filtersOpen, setFiltersOpen] = useState(false);
  const toolbarId = useId();
  const [localSorting, setLocalSorting] = useState<SortingState>([]);
  const [visibility, setVisibility] = useState<VisibilityState>({});
  const [globalFilter, setGlobalFilter] = useState('');
  const sorting = server ? server.sorting : localSorting;
  const table = useReactTable({
    data,
    columns,
    getRowId,
    state: {
      sorting,
      columnVisibility: visibility,
      ...(server ? { pagination: { pageIndex: server.page - 1, pageSize: server.pageSize } } : { globalFilter }),
    },
    onSortingChange: (updater) => {
      const next = typeof updater === 'function' ? updater(sorting) : updater;
      if (server) server.onSortingChange(next);
      else setLocalSorting(next);
    },
    onColumnVisibilityChange: setVisibility,
    onGlobalFilterChange: setGlobalFilter,
    // Every press picks a direction: a third press that dropped the sort left rows in an order no header named.
    enableSortingRemoval: false,
    getCoreRowModel: getCoreRowModel(),
    ...(server
      ? { manualSorting: true, manualPagination: true, rowCount: server.total }
      : {
          getSortedRowModel: getSortedRowModel(),
          getFilteredRowModel: getFilteredRowModel(),
          getPaginationRowModel: getPaginationRowModel(),
          initialState: { pagination: { pageSize: 25 } },
        }),
  });
  const pageCount = server ? Math.max(1, Math.ceil(server.total / server.pageSize)) : table.getPageCount() || 1;
  const pageIndex = server ? server.page - 1 : table.getState().pagination.pageIndex;
  const total = server ? server.total : table.getFilteredRowModel().rows.length;
  const goTo = (index: number) => (server ? server.onPageChange(index + 1) : table.setPageIndex(index));

  // Said once the result for the new filters, sorting or page is in; not on the page's first load.
  const signature = JSON.stringify([resultKey, sorting, pageIndex, server ? '' : globalFilter]);
  const [spoken, setSpoken] = useState({ signature, text: '' });
  if (spoken.signature !== signature && !loading && !fetching) {
    const sortedBy = sorting[0] ? table.getColumn(sorting[0].id) : undefined;
    const parts = [
      countLabel ? countLabel(total) : `${total} ${total === 1 ? 'row' : 'rows'}`,
      sortedBy ? `sorted by ${headerText(sortedBy.columnDef.header, sortedBy.id)}, ${sorting[0].desc ? 'descending' : 'ascending'}` : '',
      pageCount > 1 ? `page ${pageIndex + 1} of ${pageCount}` : '',
    ];
    setSpoken({ signature, text: parts.filter(Boolean).join(', ') });
  }

  return (
    <div className="space-y-3">
      {foldToolbar ? (
        <Button
          variant="secondary"
          className="no-print w-full sm:hidden"
          aria-expanded={filtersOpen}
          aria-controls={toolbarId}
          onClick={() => setFiltersOpen((o) => !o)}
        >
          {filtersOpen ? 'Hide filters' : 'Filters'}
        </Button>
      ) : null}
      <div
        id={toolbarId}
        className={`no-print flex-wrap items-end gap-3 ${foldToolbar && !filtersOpen ? 'hidden sm:flex' : 'flex'} ${foldToolbar ? 'max-sm:flex-col max-sm:items-stretch' : ''}`}
      >
        {toolbar}
        {!server ? (
          <label className="flex flex-col text-sm font-semibold text-steel-800">
            Filter
            <input
              value={globalFilter}
              onChange={(e) => setGlobalFilter(e.target.value)}
              className="min-h-touch rounded border border-steel-400 bg-white px-3 font-normal"
              placeholder="Type to filter…"
            />
          </label>
        ) : null}
        <details className="relative ml-auto">
          <summary className="flex min-h-touch cursor-pointer items-center rounded border border-steel-400 bg-white px-3 text-sm font-semibold">
            Columns
          </summary>
          <div className="absolute right-0 z-10 mt-1 w-56 space-y-1 rounded border border-steel-300 bg-white p-3 shadow-lg">
            {table
              .getAllLeafColumns()
              .filter((c) => c.getCanHide())
              .map((c) => (
                <label key={c.id} className="flex min-h-touch items-center gap-2 text-sm">
                  <input type="checkbox" className="h-6 w-6" checked={c.getIsVisible()} onChange={c.getToggleVisibilityHandler()} />
                  {typeof c.columnDef.header === 'string' ? c.columnDef.header : c.id}
                </label>
              ))}
          </div>
        </details>
      </div>
      {renderCard ? (
        <ul className="space-y-2 sm:hidden" aria-label={caption}>
          {table.getRowModel().rows.map((row) => (
            <li key={row.id} className="rounded border border-steel-200 bg-white p-3">
              {renderCard(row.original)}
            </li>
          ))}
          {!loading && table.getRowModel().rows.length === 0 ? <li className="p-4">{empty ?? <EmptyState title="Nothing to show" />}</li> : null}
          {loading ? (
            <li className="p-4 text-steel-600" role="status">
              Loading…
            </li>
          ) : null}
        </ul>
      ) : null}
      {/* Focusable so a table wider than a phone can be scrolled from the keyboard (WCAG 2.1.1). */}
      <div
        className={`overflow-x-auto rounded border border-steel-200 bg-white ${renderCard ? 'hidden sm:block' : ''}`}
        tabIndex={0}
        role="region"
        aria-label={caption}
      >
        <table className="w-full border-collapse text-left text-sm">
          <caption className="sr-only">{caption}</caption>
          <thead className="on-dark bg-steel-800 text-white">
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => {
                  const sorted = h.column.getIsSorted();
                  return (
                    <th
                      key={h.id}
                      scope="col"
                      className={`${h.column.getCanSort() ? 'px-1 py-0' : 'px-3 py-2'} font-semibold whitespace-nowrap`}
                      aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined}
                    >
                      {h.isPlaceholder ? null : h.column.getCanSort() ? (
                        // The whole header is the target (44 px for a gloved finger); the arrow shows the direction, aria-sort says it.
                        <button
                          type="button"
                          onClick={h.column.getToggleSortingHandler()}
                          className="inline-flex min-h-touch min-w-touch w-full items-center gap-1.5 rounded px-2 hover:underline"
                        >
                          {flexRender(h.column.columnDef.header, h.getContext())}
                          <span aria-hidden className={sorted ? 'text-base text-caution' : 'text-steel-300'}>
                            {sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : '↕'}
                          </span>
                        </button>
                      ) : (
                        flexRender(h.column.columnDef.header, h.getContext())
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className="border-t border-steel-200 odd:bg-steel-50">
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className="px-3 py-2 align-middle">
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
        {!loading && table.getRowModel().rows.length === 0 ? <div className="p-4">{empty ?? <EmptyState title="Nothing to show" />}</div> : null}
        {loading ? (
          <p className="p-4 text-steel-600" role="status">
            Loading…
          </p>
        ) : null}
      </div>
      <p role="status" aria-live="polite" aria-atomic="true" className="sr-only" data-result-count="">
        {spoken.text}
      </p>
      <nav className="no-print flex flex-wrap items-center justify-between gap-2 text-sm" aria-label={`${caption} pages`}>
        <span className="text-steel-700">
          {total} {total === 1 ? 'row' : 'rows'} · page {pageIndex + 1} of {pageCount}
        </span>
        <span className="flex gap-2">
          <Button variant="secondary" onClick={() => goTo(pageIndex - 1)} disabled={pageIndex <= 0}>
            Previous
          </Button>
          <Button variant="secondary" onClick={() => goTo(pageIndex + 1)} disabled={pageIndex + 1 >= pageCount}>
            Next
          </Button>
        </span>
      </nav>
    </div>
  );
}
