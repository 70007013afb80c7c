import { Link } from 'react-router-dom';
import { EmptyState } from '../../components/ui/notice';

export function Component() {
  return (
    <EmptyState title="This page does not exist">
      <Link className="font-semibold text-mandatory underline" to="/">
        Back to today’s work
      </Link>
    </EmptyState>
  );
}
