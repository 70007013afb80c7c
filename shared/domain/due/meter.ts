/** Meter triggers (every N units, with a usage forecast) and condition triggers (limits on a reading). */
import { DAY_MS, MIN_GRACE_MS, type DueStatus, type MeterDue, type PlanInput, type Reading, type Trigger, type TriggerEvaluation } from './types';
import { daysText, iso, justAfter, numText, readingsOf, usageRateOf } from './inputs';
import { forecastReach, projectFromLatest, reachedAt } from '../forecast';

/** The one forecast (../forecast projectFromLatest): from the latest reading along the windowed rate per calendar day. */
function forecastFromLatest(readings: Reading[], target: number): Date | null {
  if (readings.length < 2) return null;
  return projectFromLatest(readings[readings.length - 1], usageRateOf(readings), target);
}

export function evalMeter(t: Extract<Trigger, { kind: 'meter' }>, input: PlanInput, index: number): { evaluation: TriggerEvaluation; meter: MeterDue } {
  const { now, dueSoon } = input;
  const m = input.meters[t.meterId];
  const readings = readingsOf(m);
  const dueValue = m.baseline + t.every;
  const last = readings.length > 0 ? readings[readings.length - 1] : null;
  const current = m.latest?.value ?? last?.value ?? null;
  const base = { index, kind: t.kind } as const;
  const label = `meter ${t.meterId}`;
  if (current === null) {
    return {
      evaluation: { ...base, status: 'not-due', dueAt: null, key: null, reason: `${label}: no reading yet (due at ${numText(dueValue)})`, changesAt: null },
      meter: { meterId: t.meterId, startValue: m.baseline, dueValue, current: null, forecastAt: null },
    };
  }
  const windowUnits = (dueSoon.fraction ?? 0) * t.every;
  if (current >= dueValue) {
    const crossedAt = reachedAt(readings, dueValue) ?? (m.latest?.at as Date);
    const over = current - dueValue;
    const sinceMs = now.getTime() - crossedAt.getTime();
    const graceMs = Math.max((dueSoon.days ?? 0) * DAY_MS, MIN_GRACE_MS);
    const overdue = windowUnits > 0 ? over > windowUnits : sinceMs > graceMs;
    const status: DueStatus = overdue ? 'overdue' : 'due';
    const overText = !overdue ? '' : windowUnits > 0 ? `, overdue by ${numText(over)}` : `, overdue: reached about ${daysText(sinceMs)} ago`;
    return {
      evaluation: {
        ...base,
        status,
        dueAt: crossedAt,
        key: `meter:${t.meterId}:${dueValue}`,
        reason: `${label} reads ${numText(current)}, due at ${numText(dueValue)} (every ${numText(t.every)} from ${numText(m.baseline)})${overText}`,
        // With a unit window only new readings make it overdue; without one, time since the crossing does.
        changesAt: !overdue && windowUnits <= 0 ? justAfter(crossedAt.getTime() + graceMs) : null,
      },
      meter: { meterId: t.meterId, startValue: m.baseline, dueValue, current, forecastAt: crossedAt },
    };
  }
  const forecastAt = readings.length < 2 ? null : forecastReach(readings, dueValue, { sorted: readings, ratePerDay: usageRateOf(readings) });
  const byUnits = windowUnits > 0 && dueValue - current <= windowUnits;
  const byTime = dueSoon.days !== undefined && forecastAt !== null && forecastAt.getTime() - now.getTime() <= dueSoon.days * DAY_MS;
  const soon = byUnits || byTime;
  return {
    evaluation: {
      ...base,
      status: soon ? 'due-soon' : 'not-due',
      dueAt: forecastAt,
      key: null,
      reason: `${label} reads ${numText(current)} of ${numText(dueValue)}${forecastAt ? `, forecast ${iso(forecastAt)}` : ''}`,
      changesAt: !soon && dueSoon.days !== undefined && forecastAt !== null ? new Date(forecastAt.getTime() - dueSoon.days * DAY_MS) : null,
    },
    meter: { meterId: t.meterId, startValue: m.baseline, dueValue, current, forecastAt },
  };
}

export function evalCondition(t: Extract<Trigger, { kind: 'condition' }>, input: PlanInput, index: number): TriggerEvaluation {
  const { now, lastDoneAt, dueSoon } = input;
  const base = { index, kind: t.kind } as const;
  const label = `meter ${t.meterId}`;
  // Only readings taken after the last completion describe the serviced machine.
  const readings = readingsOf(input.meters[t.meterId]).filter((r) => lastDoneAt === null || r.at.getTime() > lastDoneAt.getTime());
  const crosses = (v: number) => (t.above !== undefined && v > t.above) || (t.below !== undefined && v < t.below);
  const limitText = [t.above !== undefined ? `above ${numText(t.above)}` : '', t.below !== undefined ? `below ${numText(t.below)}` : '']
    .filter(Boolean)
    .join(' or ');
  if (readings.length === 0) {
    return {
      ...base,
      status: 'not-due',
      dueAt: null,
      key: null,
      reason: `${label}: no reading${lastDoneAt ? ' since last done' : ''} (limit: ${limitText})`,
      changesAt: null,
    };
  }
  const last = readings[readings.length - 1];
  if (crosses(last.value)) {
    let i = readings.length - 1;
    while (i > 0 && crosses(readings[i - 1].value)) i--;
    const firstPast = readings[i];
    const sinceMs = now.getTime() - firstPast.at.getTime();
    const graceMs = Math.max((dueSoon.days ?? 0) * DAY_MS, MIN_GRACE_MS);
    const status: DueStatus = sinceMs > graceMs ? 'overdue' : 'due';
    return {
      ...base,
      status,
      dueAt: firstPast.at,
      key: `cond:${t.meterId}:${iso(firstPast.at)}`,
      reason: `${label} reads ${numText(last.value)} (limit: ${limitText}) since ${iso(firstPast.at)}`,
      changesAt: status === 'due' ? justAfter(firstPast.at.getTime() + graceMs) : null,
    };
  }
  const f = dueSoon.fraction ?? 0;
  const near =
    f > 0 &&
    ((t.above !== undefined && last.value >= t.above - f * Math.abs(t.above)) || (t.below !== undefined && last.value <= t.below + f * Math.abs(t.below)));
  const forecasts = [t.above, t.below]
    .filter((x): x is number => x !== undefined)
    .map((limit) => forecastFromLatest(readings, limit))
    .filter((d): d is Date => d !== null)
    .sort((a, b) => a.getTime() - b.getTime());
  const forecastAt = forecasts[0] ?? null;
  const byTrend = dueSoon.days !== undefined && forecastAt !== null && forecastAt.getTime() - now.getTime() <= dueSoon.days * DAY_MS;
  return {
    ...base,
    status: near || byTrend ? 'due-soon' : 'not-due',
    dueAt: forecastAt,
    key: null,
    reason: `${label} reads ${numText(last.value)} (limit: ${limitText})${forecastAt ? `, trend reaches it ${iso(forecastAt)}` : ''}`,
    changesAt: !(near || byTrend) && dueSoon.days !== undefined && forecastAt !== null ? new Date(forecastAt.getTime() - dueSoon.days * DAY_MS) : null,
  };
}
