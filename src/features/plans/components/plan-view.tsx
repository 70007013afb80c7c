import { Link } from 'react-router-dom';
import { Badge, Notice, Panel } from '../../../components/ui/notice';
import { WorkCaution } from '../../../components/ui/caution';
import { ROLE_LABELS } from '../../../../shared/permissions';
import { DUE_STATE_LABELS, TRIGGER_KIND_LABELS, type PlanDetail } from '../../../../shared/schemas/plans';
import { PlanDueBadge } from './plan-badges';
import { useShopFormat, type ShopFormat } from '../../../lib/format';
import { intervalUsed } from '../../../../shared/domain/plan-summary';

/** "Run hours: 12,009.8 h now, due at 11,986.4 h (23.4 h past)": the reading, the mark and the gap in words. */
function meterLine(f: ShopFormat, name: string, unit: string, current: number | null, due: number): string {
  const u = unit ? ` ${unit}` : '';
  if (current === null) return `${name}: no reading yet, due at ${f.number(due)}${u}`;
  const gap = due - current;
  const tail = gap > 0 ? `${f.number(gap)}${u} to go` : gap === 0 ? 'at the mark' : `${f.number(-gap)}${u} past`;
  return `${name}: ${f.number(current)}${u} now, due at ${f.number(due)}${u} (${tail})`;
}

/** A plan's state at a glance: status and why, each trigger's own view, meters against their marks. */
export function PlanView({ plan }: { plan: PlanDetail }) {
  const f = useShopFormat();
  const meterName = (id: string) => plan.triggers.find((t) => 'meterId' in t && t.meterId === id)?.meter;
  return (
    <div className="grid gap-4 lg:grid-cols-[3fr_2fr]">
      <Panel title="Where it stands">
        <div className="space-y-3">
          <div className="flex flex-wrap items-center gap-2">
            <PlanDueBadge status={plan.status} />
            {plan.requiresLockout ? <Badge tone="mandatory">Lockout required</Badge> : null}
            {plan.safetyCritical ? <Badge tone="mandatory">Safety work</Badge> : null}
            {!plan.active ? <Badge>Paused plan</Badge> : null}
          </div>
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
            <dt className="font-semibold">Next due</dt>
            <dd>
              {f.dateTime(plan.nextDueAt)} {plan.nextDueAt ? <span className="text-steel-600">({f.relative(plan.nextDueAt)})</span> : null}
            </dd>
            <dt className="font-semibold">Last done</dt>
            <dd>{plan.lastDoneAt ? f.dateTime(plan.lastDoneAt) : 'Not yet'}</dd>
            <dt className="font-semibold">For (role or person)</dt>
            <dd>{plan.responsibleUser?.name ?? (plan.responsibleRole ? `Any ${ROLE_LABELS[plan.responsibleRole].toLowerCase()}` : '—')}</dd>
            <dt className="font-semibold">Done at the station by</dt>
            <dd>{plan.stationRecord?.summary ?? 'Nothing: a signed-off work order'}</dd>
          </dl>
          {plan.openWorkOrder ? (
            <Notice tone={plan.status === 'overdue' ? 'danger' : 'caution'} title="Work is open">
              <Link className="font-semibold underline" to={`/work-orders/${plan.openWorkOrder.id}`}>
                WO {plan.openWorkOrder.number}
              </Link>{' '}
              was raised for the current occurrence.
            </Notice>
          ) : null}
          <table className="w-full text-left text-sm">
            <caption className="mb-1 text-left font-semibold">Triggers (whichever comes first)</caption>
            <thead>
              <tr className="border-b border-steel-300">
                <th scope="col" className="py-1">
                  Trigger
                </th>
                <th scope="col">Status</th>
                <th scope="col">Due / forecast</th>
              </tr>
            </thead>
            <tbody>
              {plan.triggers.map((t, i) => {
                const ev = plan.evaluation[i];
                return (
                  <tr key={i} className="border-b border-steel-100 align-top">
                    <td className="py-1 pr-2">
                      <span className="block text-xs uppercase tracking-wide text-steel-600">{TRIGGER_KIND_LABELS[t.kind]}</span>
                      {t.summary}
                    </td>
                    <td className="pr-2">{ev ? <span title={ev.reason}>{DUE_STATE_LABELS[ev.status]}</span> : '—'}</td>
                    <td>{ev ? f.dateTime(ev.dueAt) : '—'}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
          {plan.meterDue.map((m) => {
            const meter = meterName(m.meterId);
            // An evaluation stored before the start was kept: the interval is the trigger's own length.
            const trigger = plan.triggers.find((t) => t.kind === 'meter' && t.meterId === m.meterId);
            const every = trigger?.kind === 'meter' ? trigger.every : undefined;
            const start = m.startValue ?? (every !== undefined ? m.dueValue - every : 0);
            const pct = intervalUsed(m.current, start, m.dueValue) * 100;
            return (
              <div key={m.meterId}>
                <p className="text-sm font-semibold">{meterLine(f, meter?.name ?? 'Meter', meter?.unit ?? '', m.current, m.dueValue)}</p>
                <div className="h-3 w-full rounded bg-steel-200" role="img" aria-label={`${meter?.name ?? 'Meter'}: ${Math.round(pct)} % of the interval used`}>
                  <div className={`h-3 rounded ${pct >= 100 ? 'bg-danger' : pct >= 90 ? 'bg-caution' : 'bg-steel-500'}`} style={{ width: `${pct}%` }} />
                </div>
                {m.forecastAt ? (
                  <p className="text-xs text-steel-600">
                    Forecast from the latest reading at the usage rate per calendar day (fitted on the last 28 days of readings): {f.dateTime(m.forecastAt)}
                  </p>
                ) : null}
              </div>
            );
          })}
          {plan.statusReason ? <p className="text-xs text-steel-600">Engine’s note: {plan.statusReason}</p> : null}
        </div>
      </Panel>
      <div className="space-y-4">
        <Panel title="What to do">
          {plan.instructions ? <p className="whitespace-pre-line">{plan.instructions}</p> : <p className="text-steel-600">No instructions written.</p>}
          {plan.estimatedMinutes ? <p className="mt-2 text-sm">Planned time: {plan.estimatedMinutes} min</p> : null}
          <div className="mt-3">
            <WorkCaution />
          </div>
        </Panel>
        <Panel title="Checklist">
          {plan.checklist.length === 0 ? (
            <p className="text-steel-600">No checklist.</p>
          ) : (
            <ol className="list-decimal space-y-1 pl-5">
              {plan.checklist.map((c) => (
                <li key={c.key}>
                  {c.label}
                  {c.kind === 'measure' ? (
                    <span className="text-steel-600">
                      {' '}
                      — measured in {c.unit}
                      {c.min !== undefined || c.max !== undefined ? `, OK ${c.min ?? '…'} to ${c.max ?? '…'}` : ''}
                    </span>
                  ) : null}
                </li>
              ))}
            </ol>
          )}
        </Panel>
        {plan.parts.length ? (
          <Panel title="Parts to have ready">
            <ul className="space-y-1">
              {plan.parts.map((p) => (
                <li key={p.partTypeId}>
                  {p.quantity} {p.stockUnit} · {p.partNumber} {p.name}
                </li>
              ))}
            </ul>
          </Panel>
        ) : null}
      </div>
    </div>
  );
}
