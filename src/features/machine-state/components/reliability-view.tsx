import { Panel, Notice } from '../../../components/ui/notice';
import { useReliability, type ReliabilityFilters } from '../api/get-reliability';
import { DowntimeTimeline, ParetoChart } from './reliability-charts';
import type { ReliabilityFigures } from '../../../../shared/domain/reliability';

const h = (v: number | null) => (v === null ? '—' : `${v.toFixed(1)} h`);
const pct = (v: number | null) => (v === null ? '—' : `${(v * 100).toFixed(1)} %`);

function Figures({ f }: { f: ReliabilityFigures }) {
  const items: [string, string, string][] = [
    ['Failures', String(f.failures), 'Stops counted as failures in the window'],
    ['Operating time', h(f.operatingHours), 'Window less every stop'],
    ['MTBF', h(f.mtbfHours), 'Mean operating time between failures (IEC 60050-192)'],
    ['MTTR', h(f.mttrHours), 'Mean time to restoration (IEC 60050-192)'],
    ['Availability', pct(f.availability), 'Operating time / (window − planned stops) (EN 13306)'],
  ];
  return (
    <dl className="grid grid-cols-2 gap-3 sm:grid-cols-5">
      {items.map(([label, value, hint]) => (
        <div key={label} className="rounded border border-steel-300 bg-white p-3" title={hint}>
          <dt className="text-sm font-semibold text-steel-600">{label}</dt>
          <dd className="text-2xl font-bold">{value}</dd>
        </div>
      ))}
    </dl>
  );
}

export function ReliabilityView({ filters }: { filters: ReliabilityFilters }) {
  const q = useReliability(filters);
  if (q.isError)
    return (
      <Notice tone="danger" role="alert" title="Cannot show the figures">
        {q.error.message}
      </Notice>
    );
  if (!q.data) return <p role="status">Loading figures…</p>;
  const r = q.data;
  return (
    <div className="space-y-4">
      <Figures f={r.figures} />
      <Panel title="Failure downtime by cause">
        <ParetoChart bars={r.byCause} title="Failure downtime by cause" />
      </Panel>
      <Panel title="Failure downtime by failure mode">
        <ParetoChart bars={r.byFailureMode} title="Failure downtime by failure mode" />
      </Panel>
      <Panel title="Downtime timeline">
        <DowntimeTimeline rows={r.downtimes} start={r.windowStart} end={r.windowEnd} />
      </Panel>
      {r.machines.length > 1 ? (
        <Panel title="Per machine">
          <table className="w-full text-left">
            <thead>
              <tr>
                <th>Machine</th>
                <th>Failures</th>
                <th>MTBF</th>
                <th>MTTR</th>
                <th>Availability</th>
              </tr>
            </thead>
            <tbody>
              {r.machines.map((m) => (
                <tr key={m.machineId} className="border-t border-steel-200">
                  <td className="py-2 font-semibold">
                    {m.code} {m.name}
                  </td>
                  <td>{m.figures.failures}</td>
                  <td>{h(m.figures.mtbfHours)}</td>
                  <td>{h(m.figures.mttrHours)}</td>
                  <td>{pct(m.figures.availability)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </Panel>
      ) : null}
    </div>
  );
}
