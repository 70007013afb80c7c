import { isRouteErrorResponse, Link, useRouteError } from 'react-router-dom';
import { usePageTitle } from '../../components/layout/app-shell';

export function RouteError() {
  const err = useRouteError();
  usePageTitle('Something went wrong');
  const message = isRouteErrorResponse(err) ? `${err.status} ${err.statusText}` : err instanceof Error ? err.message : 'Unknown error';
  return (
    <main className="mx-auto max-w-xl space-y-3 p-6">
      <h1 className="text-2xl font-bold">Something went wrong</h1>
      <p className="text-steel-700">{message}</p>
      <Link className="font-semibold text-mandatory underline" to="/">
        Back to the start page
      </Link>
    </main>
  );
}
