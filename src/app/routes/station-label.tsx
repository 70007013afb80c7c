import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { Notice } from '../../components/ui/notice';
import { usePageTitle } from '../../components/layout/app-shell';
import { Button } from '../../components/ui/button';
import { getStationQueryOptions, useStation } from '../../features/station/api/get-station';
import { QrLabel } from '../../features/station/components/qr-label';
import { queryClient } from '../../lib/query-client';
import { paths } from '../../config/paths';

export const loader = ({ params }: LoaderFunctionArgs) => queryClient.ensureQueryData(getStationQueryOptions(params.code!)).catch(() => null);

export function Component() {
  const { code } = useParams();
  const q = useStation(code!);
  usePageTitle(`QR label ${code}`);
  if (q.isError)
    return (
      <Notice tone="danger" role="alert">
        {q.error.message}
      </Notice>
    );
  if (!q.data) return <p role="status">Loading…</p>;
  const m = q.data.machine;
  const url = `${window.location.origin}${paths.station.getHref(m.code)}`;
  return (
    <div className="space-y-4">
      <div className="no-print flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-2xl font-bold">QR label for {m.code}</h1>
        <div className="flex gap-2">
          <Link to={paths.station.getHref(m.code)} className="inline-flex min-h-touch items-center rounded border border-steel-400 bg-white px-4 font-semibold">
            Back to the station
          </Link>
          <Button onClick={() => window.print()}>Print</Button>
        </div>
      </div>
      <QrLabel code={m.code} name={m.name} url={url} />
      <p className="no-print text-center text-sm text-steel-700">
        Print on a label and fix it where the operator stands. Scanning it asks for sign-in first, then opens this station.
      </p>
    </div>
  );
}
