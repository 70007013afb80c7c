import { useState, type ReactNode } from 'react';
import type { SortingState } from '@tanstack/react-table';
import type { ServerPaging } from './data-table';
import { useSettledSearch } from '../../lib/search-text';

const fieldClass = 'min-h-touch rounded border border-steel-400 bg-white px-3 font-normal';

/** A filter above a DataTable: a labelled select, 44 px tall for a gloved finger. */
export function FilterSelect({
  label,
  value,
  onChange,
  children,
  className = '',
}: {
  label: string;
  value: string;
  onChange: (value: string) => void;
  children: ReactNode;
  className?: string;
}) {
  return (
    <label className="flex flex-col text-sm font-semibold">
      {label}
      <select className={`${fieldClass} ${className}`} value={value} onChange={(e) => onChange(e.target.value)}>
        {children}
      </select>
    </label>
  );
}

/** A free-text filter above a DataTable. */
export function FilterSearch({
  label = 'Search',
  value,
  placeholder,
  onChange,
}: {
  label?: string;
  value: string;
  placeholder: string;
  onChange: (value: string) => void;
}) {
  return (
    <label className="flex flex-col text-sm font-semibold">
      {label}
      <input className={fieldClass} value={value} placeholder={placeholder} onChange={(e) => onChange(e.target.value)} />
    </label>
  );
}

/**
 * Page, sorting and filters of a server-paged DataTable held in one place: a new filter or sort
 * goes back to page 1 (page 3 of the old result may not exist in the new one), and `resultKey`
 * changes with the filters so the table announces the new count. `filters` feed the inputs;
 * `queryFilters` feed the query (the same, with the search text once typing has paused).
 */
export function useServerTable<F extends Record<string, string>>(initialSorting: SortingState, initialFilters: F) {
  const [page, setPage] = useState(1);
  const [sorting, setSorting] = useState<SortingState>(initialSorting);
  const [filters, setFilters] = useState<F>(initialFilters);
  const setFilter = <K extends keyof F>(key: K, value: F[K]) => {
    setFilters((old) => ({ ...old, [key]: value }));
    setPage(1);
  };
  const paging = (total: number, pageSize: number): ServerPaging => ({
    total,
    page,
    pageSize,
    sorting,
    onSortingChange: (s) => {
      setSorting(s);
      setPage(1);
    },
    onPageChange: setPage,
  });
  // The text filter `q` reaches the query (and the announced count) once typing pauses.
  const settledSearch = useSettledSearch(filters.q ?? '');
  const queryFilters: F = 'q' in filters ? { ...filters, q: settledSearch } : filters;
  return { page, sorting, filters, queryFilters, setFilter, paging, resultKey: JSON.stringify(queryFilters) };
}
