import type { ReactNode } from 'react';
import { Notice } from '../ui/notice';
import { Breadcrumbs, type Crumb } from './app-shell';

type RecordQuery<T> = { isError: boolean; error: Error | null; data: T | undefined };

/**
 * The shell of a record's page: the load error or "Loading…" until the record is there, then the
 * breadcrumb and the page. `children` gets the loaded record.
 */
export function DetailPage<T>({
  query,
  trail,
  here,
  children,
}: {
  query: RecordQuery<T>;
  trail: Crumb[] | ((record: T) => Crumb[]);
  here: (record: T) => ReactNode;
  children: (record: T) => ReactNode;
}) {
  if (query.isError)
    return (
      <Notice tone="danger" role="alert">
        {query.error?.message ?? 'Could not load this page.'}
      </Notice>
    );
  if (query.data === undefined) return <p role="status">Loading…</p>;
  const record = query.data;
  return (
    <>
      <Breadcrumbs trail={typeof trail === 'function' ? trail(record) : trail} current={here(record)} />
      {children(record)}
    </>
  );
}
