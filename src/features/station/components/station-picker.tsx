import { Link } from 'react-router-dom';
import { Notice, Panel } from '../../../components/ui/notice';
import { paths } from '../../../config/paths';
import { useStations } from '../api/get-stations';

/** Big buttons to the station pages, for the operator's home. */
export function StationPicker() {
  const q = useStations();
  return (
    <Panel title="Stations">
      {q.isError ? <Notice tone="danger">{q.error.message}</Notice> : null}
      {q.isLoading ? <p role="status">Loading…</p> : null}
      <ul className="grid gap-2 sm:grid-cols-2">
        {(q.data ?? []).map((s) => (
          <li key={s.code}>
            <Link
              to={paths.station.getHref(s.code)}
              className="flex min-h-[3.5rem] flex-col justify-center rounded border-2 border-steel-800 bg-white px-4 py-2 hover:bg-steel-50"
            >
              <span className="text-xl font-bold">{s.code}</span>
              <span className="text-sm text-steel-700">
                {s.name}
                {s.location ? ` · ${s.location}` : ''}
              </span>
            </Link>
          </li>
        ))}
      </ul>
      {q.data && q.data.length === 0 ? <p className="text-steel-700">No machine with a torch or punch head yet.</p> : null}
    </Panel>
  );
}
