import { Bar, BarChart, CartesianGrid, Legend, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '../../../components/ui/data-table';
import { EmptyState, Notice, Panel } from '../../../components/ui/notice';
import { REMOVAL_KIND_LABELS, REMOVAL_REASON_LABELS, type LifeStats } from '../../../../shared/schemas/consumables';
import { useLifeStats, type LifeFilters } from '../api/get-life-stats';
import { useShopFormat } from '../../../lib/format';

type PerMachine = LifeStats['perMachine'][number];
const col = createColumnHelper<PerMachine>();

function Figure({ label, value, note }: { label: string; value: string; note?: string }) {
  return (
    <div className="rounded border border-steel-200 bg-steel-50 p-3">
      <dt className="text-sm font-semibold text-steel-700">{label}</dt>
      <dd className="text-2xl font-bold tabular-nums">{value}</dd>
      {note ? <dd className="text-xs text-steel-700">{note}</dd> : null}
    </div>
  );
}

export function LifeView({ filters }: { filters: LifeFilters }) {
  const f = useShopFormat();
  const q = useLifeStats(filters);
  if (q.isError) return <Notice tone="danger">{q.error.message}</Notice>;
  if (!q.data) return <p role="status">Loading…</p>;
  const s = q.data;
  const unit = s.unit === 'starts' ? 'starts' : 'arc h';
  const fmt = (v: number) => (s.unit === 'starts' ? f.number(v, { max: 0 }) : f.number(v, { max: 2 }));
  const columns = [
    col.accessor('machineCode', { header: 'Torch' }),
    col.accessor('removed', { header: 'Parts removed' }),
    col.accessor('meanLife', { header: `Mean life (${unit})`, cell: (c) => (c.getValue() === null ? '—' : fmt(c.getValue()!)) }),
    col.accessor('costPerArcHour', { header: 'Cost per arc-hour', cell: (c) => (c.getValue() === null ? '—' : f.number(c.getValue()!, { min: 2, max: 2 })) }),
  ];
  const total = s.failures.length + s.suspensions.length;
  return (
    <div className="space-y-4">
      {s.warning ? (
        <Notice tone="caution" title="Few failures">
          {s.warning}
        </Notice>
      ) : null}
      <dl className="grid grid-cols-2 gap-3 md:grid-cols-4">
        <Figure label="Worn out" value={String(s.failures.length)} note="worn, failed start, poor cut" />
        <Figure
          label="Suspensions"
          value={String(s.suspensions.length)}
          note={`with its partner, preventive, damaged, ${s.processFaults} process faults, ${s.stillInstalled} still in`}
        />
        <Figure label={`Mean achieved life`} value={s.meanLife === null ? '—' : `${fmt(s.meanLife)} ${unit}`} note="of parts removed" />
        <Figure
          label="B10 life"
          value={s.fit ? `${fmt(s.fit.b10)} ${unit}` : '—'}
          note={
            s.fit?.bounds
              ? `${Math.round(s.fit.bounds.level * 100)} % bounds ${fmt(s.fit.bounds.b10.lower)}–${fmt(s.fit.bounds.b10.upper)}`
              : '10 % have worn out by then'
          }
        />
        <Figure
          label="Cheapest change"
          value={s.fit?.plan.age != null ? `${fmt(s.fit.plan.age)} ${unit}` : '—'}
          note={
            s.fit?.plan.savingPercent != null
              ? `${int.format(s.fit.plan.savingPercent)} % cheaper than running to failure`
              : (s.fit?.plan.note ?? 'needs a fit and a failure cost')
          }
        />
        <Figure
          label="Recommended change"
          value={s.fit ? `${fmt(s.fit.recommended)} ${unit}` : '—'}
          note={s.fit ? `where ${Math.round(s.fit.targetReliability * 100)} % still run` : undefined}
        />
        <Figure
          label="Cost per arc-hour"
          value={s.costPerArcHour === null ? '—' : f.number(s.costPerArcHour, { min: 2, max: 2 })}
          note={`unit cost ${f.number(s.partType.unitCost, { min: 2, max: 2 })}`}
        />
      </dl>
      {s.fit ? (
        <p className="text-sm text-steel-700">
          Weibull fit by maximum likelihood with suspensions (NIST e-Handbook of Statistical Methods §8.4.1.2): shape β = {f.number(s.fit.shape, { max: 2 })} (
          {s.fit.shape > 1.2
            ? 'wear-out: a planned change pays'
            : s.fit.shape < 0.9
              ? 'early failures: look at fitting and gas quality before planning changes'
              : 'close to random failures'}
          ), characteristic life η = {fmt(s.fit.scale)} {unit}.
          {s.fit.bounds
            ? ` ${Math.round(s.fit.bounds.level * 100)} % two-sided Fisher-matrix bounds (Meeker & Escobar, Statistical Methods for Reliability Data, §8.4): β ${dec.format(s.fit.bounds.shape.lower)}–${dec.format(s.fit.bounds.shape.upper)}, η ${fmt(s.fit.bounds.scale.lower)}–${fmt(s.fit.bounds.scale.upper)} ${unit}.`
            : ''}
          {s.partType.expectedLife !== null ? ` The catalogue expects ${fmt(s.partType.expectedLife)} ${unit}.` : ''}
          {s.fit.plan.age !== null && s.fit.plan.costRate !== null && s.fit.plan.runToFailureCostRate !== null
            ? ` Cheapest change point (age replacement, Barlow & Proschan): planned change ${money.format(s.fit.plan.plannedCost)}, failure in service ${money.format(s.fit.plan.failureCost ?? 0)} → change at ${fmt(s.fit.plan.age)} ${unit}, ${money.format(s.fit.plan.costRate * 1000)} per 1000 ${unit} against ${money.format(s.fit.plan.runToFailureCostRate * 1000)} when run to failure.`
            : ''}
        </p>
      ) : (
        <Notice tone="info" title="No fit yet">
          {s.fitProblem}
        </Notice>
      )}
      {s.byReason.length ? (
        <ul className="flex flex-wrap gap-2 text-sm" aria-label="Removals by reason">
          {s.byReason.map((r) => (
            <li
              key={r.reason}
              className={`rounded border px-2 py-1 ${r.kind === 'process' ? 'border-caution bg-caution-soft' : 'border-steel-300 bg-white'}`}
              title={REMOVAL_KIND_LABELS[r.kind]}
            >
              {REMOVAL_REASON_LABELS[r.reason]}: <span className="font-bold tabular-nums">{r.count}</span>
              {r.kind === 'process' ? ' (process fault)' : ''}
            </li>
          ))}
        </ul>
      ) : null}
      {total === 0 ? (
        <EmptyState title="No lives recorded for this part yet" />
      ) : (
        <div className="grid gap-4 lg:grid-cols-2">
          <Panel title="Achieved lives">
            <div
              className="h-72"
              role="img"
              aria-label={`Histogram of ${total} achieved lives in ${unit}: ${s.failures.length} worn out, ${s.suspensions.length} suspensions`}
            >
              <ResponsiveContainer width="100%" height="100%">
                <BarChart data={s.histogram.map((b) => ({ ...b, label: `${fmt(b.from)}–${fmt(b.to)}` }))} margin={{ top: 8, right: 8, bottom: 24, left: 0 }}>
                  <CartesianGrid stroke="#cdd4db" strokeDasharray="3 3" />
                  <XAxis dataKey="label" stroke="#38434e" angle={-30} textAnchor="end" height={50} interval={0} fontSize={12} />
                  <YAxis allowDecimals={false} stroke="#38434e" />
                  <Tooltip />
                  <Legend formatter={(v) => <span style={{ color: '#1e2730' }}>{v}</span>} />
                  <Bar dataKey="failures" name="Worn out" stackId="a" fill="#38434e" isAnimationActive={false} />
                  <Bar dataKey="suspensions" name="Suspension" stackId="a" fill="#a9b4bf" isAnimationActive={false} />
                </BarChart>
              </ResponsiveContainer>
            </div>
          </Panel>
          <Panel title="Share still running">
            {s.fit ? (
              <div
                className="h-72"
                role="img"
                aria-label={`Reliability curve: B10 at ${fmt(s.fit.b10)} ${unit}, recommended change at ${fmt(s.fit.recommended)} ${unit}`}
              >
                <ResponsiveContainer width="100%" height="100%">
                  <LineChart data={s.fit.curve} margin={{ top: 8, right: 16, bottom: 8, left: 0 }}>
                    <CartesianGrid stroke="#cdd4db" strokeDasharray="3 3" />
                    <XAxis dataKey="life" type="number" domain={[0, 'dataMax']} tickFormatter={fmt} stroke="#38434e" />
                    <YAxis domain={[0, 1]} tickFormatter={(v) => `${Math.round(v * 100)} %`} stroke="#38434e" />
                    <Tooltip labelFormatter={(v) => `${fmt(Number(v))} ${unit}`} formatter={(v) => [`${(Number(v) * 100).toFixed(1)} %`, 'Still running']} />
                    <ReferenceLine
                      x={s.fit.recommended}
                      stroke="#1d4ed8"
                      strokeDasharray="6 3"
                      label={{ value: 'Change here', fill: '#15347f', position: 'insideTopRight' }}
                    />
                    <Line type="monotone" dataKey="reliability" stroke="#28313a" strokeWidth={2} dot={false} isAnimationActive={false} />
                  </LineChart>
                </ResponsiveContainer>
              </div>
            ) : (
              <EmptyState title="Needs a fit" />
            )}
          </Panel>
        </div>
      )}
      <Panel title="By torch">
        <DataTable
          caption="Life and cost by torch"
          columns={columns}
          data={s.perMachine}
          getRowId={(r) => r.machineId}
          empty={<EmptyState title="No removals yet" />}
        />
      </Panel>
    </div>
  );
}
