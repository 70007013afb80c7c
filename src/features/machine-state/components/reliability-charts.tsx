import type { CauseBar } from '../../../../shared/schemas/reliability';
import type { DowntimeRow } from '../../../../shared/schemas/machine-state';

const hours = (h: number) => (h >= 10 ? h.toFixed(0) : h.toFixed(1));

/** Downtime by cause, largest first, with the cumulative share as a line (a Pareto chart). */
export function ParetoChart({ bars, title }: { bars: CauseBar[]; title: string }) {
  if (bars.length === 0) return <p className="text-steel-600">No failure downtime in this window.</p>;
  const W = 640;
  const H = 240;
  const pad = { l: 44, r: 44, t: 12, b: 64 };
  const max = Math.max(...bars.map((b) => b.hours));
  const total = bars.reduce((s, b) => s + b.hours, 0);
  const bw = (W - pad.l - pad.r) / bars.length;
  const y = (h: number) => pad.t + (H - pad.t - pad.b) * (1 - h / max);
  let cum = 0;
  const points = bars.map((b, i) => {
    cum += b.hours;
    return `${pad.l + bw * (i + 0.5)},${pad.t + (H - pad.t - pad.b) * (1 - cum / total)}`;
  });
  return (
    <figure>
      <svg viewBox={`0 0 ${W} ${H}`} role="img" aria-label={title} className="w-full max-w-2xl">
        <line x1={pad.l} x2={W - pad.r} y1={H - pad.b} y2={H - pad.b} stroke="#64748b" />
        <text x={4} y={pad.t + 10} fontSize="11" fill="#334155">
          {hours(max)} h
        </text>
        <text x={W - pad.r + 4} y={pad.t + 10} fontSize="11" fill="#334155">
          100 %
        </text>
        {bars.map((b, i) => (
          <g key={b.code ?? 'none'}>
            <rect x={pad.l + bw * i + 4} y={y(b.hours)} width={bw - 8} height={H - pad.b - y(b.hours)} fill="#475569">
              <title>{`${b.label}: ${hours(b.hours)} h in ${b.stops} stop${b.stops === 1 ? '' : 's'}`}</title>
            </rect>
            <text x={pad.l + bw * (i + 0.5)} y={H - pad.b + 14} fontSize="11" textAnchor="middle" fill="#0f172a">
              {b.code ?? '—'}
            </text>
            <text x={pad.l + bw * (i + 0.5)} y={H - pad.b + 28} fontSize="10" textAnchor="middle" fill="#475569">
              {hours(b.hours)} h
            </text>
          </g>
        ))}
        <polyline points={points.join(' ')} fill="none" stroke="#b45309" strokeWidth="2" />
      </svg>
      <figcaption className="text-sm text-steel-700">
        {bars.map((b) => `${b.code ?? '—'} ${b.label}`).join(' · ')}. Line: cumulative share of the failure downtime.
      </figcaption>
    </figure>
  );
}

/** One row per machine, each stop a bar across the window: red for failures, grey for planned stops. */
export function DowntimeTimeline({ rows, start, end }: { rows: DowntimeRow[]; start: string; end: string }) {
  const s = Date.parse(start);
  const e = Date.parse(end);
  if (rows.length === 0 || e <= s) return <p className="text-steel-600">No stops in this window.</p>;
  const machines = [...new Set(rows.map((r) => r.machineCode))].sort();
  const W = 640;
  const rowH = 28;
  const left = 70;
  const x = (t: number) => left + ((Math.min(Math.max(t, s), e) - s) / (e - s)) * (W - left - 8);
  const H = machines.length * rowH + 24;
  return (
    <svg viewBox={`0 0 ${W} ${H}`} role="img" aria-label="Downtime timeline" className="w-full max-w-2xl">
      {machines.map((m, i) => (
        <g key={m}>
          <text x={4} y={i * rowH + 18} fontSize="12" fill="#0f172a">
            {m}
          </text>
          <line x1={left} x2={W - 8} y1={i * rowH + 14} y2={i * rowH + 14} stroke="#cbd5e1" />
          {rows
            .filter((r) => r.machineCode === m)
            .map((r) => {
              const a = x(Date.parse(r.startedAt));
              const b = x(r.endedAt ? Date.parse(r.endedAt) : e);
              return (
                <rect key={r.id} x={a} y={i * rowH + 5} width={Math.max(2, b - a)} height={18} fill={r.kind === 'failure' ? '#9b2423' : '#94a3b8'}>
                  <title>{`${r.reason} (${r.startedAt.slice(0, 16)} → ${r.endedAt?.slice(0, 16) ?? 'still down'})`}</title>
                </rect>
              );
            })}
        </g>
      ))}
      <text x={left} y={H - 4} fontSize="11" fill="#475569">
        {start.slice(0, 10)}
      </text>
      <text x={W - 8} y={H - 4} fontSize="11" textAnchor="end" fill="#475569">
        {end.slice(0, 10)}
      </text>
    </svg>
  );
}
