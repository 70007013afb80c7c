import { Link } from 'react-router-dom';
import { EmptyState } from '../../components/ui/notice';
import { PageTitle } from '../../components/layout/app-shell';

export function Component() {
  return (
    <>
      <PageTitle title="Page not found" />
      <EmptyState title="This page does not exist">
        <Link className="font-semibold text-mandatory underline" to="/">
          Back to today’s work
        </Link>
      </EmptyState>
    </>
  );
}
