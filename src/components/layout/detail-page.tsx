import { Fragment, type ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { Notice } from '../ui/notice';

export type Crumb = { label: ReactNode; to: string };

/** "Machines › C1 › Arc starts": the way back up from a record's own page. */
export function Breadcrumb({ trail, here }: { trail: Crumb[]; here: ReactNode }) {
  return (
    <nav aria-label="Breadcrumb" className="text-sm">
      {trail.map((c) => (
        <Fragment key={c.to}>
          <Link className="underline" to={c.to}>
            {c.label}
          </Link>{' '}
          ›{' '}
        </Fragment>
      ))}
      {here}
    </nav>
  );
}

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
      <Breadcrumb trail={typeof trail === 'function' ? trail(record) : trail} here={here(record)} />
      {children(record)}
    </>
  );
}
