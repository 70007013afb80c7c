/** Reliability figures and downtime of a shop's machines over a window of shop-local days. */
import type { EntityManager } from '@mikro-orm/postgresql';
import { DateTime } from 'luxon';
import { Machine } from './machine.entity';
import { FailureCode, MachineDowntime, type IMachineDowntime } from './machine-state.entity';
import type { Principal } from '../../http/principal';
import { notFound } from '../../http/errors';
import { clock } from '../../../shared/clock';
import { clippedStops, reliabilityFigures, type ReliabilityFigures } from '../../../shared/domain/reliability';
import type { DowntimeRow } from '../../../shared/schemas/machine-state';
import type { CauseBar, ReliabilityQuery, ReliabilityReport } from '../../../shared/schemas/reliability';

const HOUR_MS = 3_600_000;

export function toDowntimeRow(d: IMachineDowntime, names: Map<string, string>): DowntimeRow {
  return {
    id: d.id,
    machineId: d.machine.id,
    machineCode: d.machine.isInitialized() ? d.machine.getEntity().code : '',
    kind: d.kind,
    reason: d.reason,
    failureCode: d.failureCode ?? null,
    causeCode: d.causeCode ?? null,
    remedyCode: d.remedyCode ?? null,
    workOrderId: d.workOrderId ?? null,
    startedAt: d.startedAt.toISOString(),
    startedBy: d.startedBy ? (names.get(d.startedBy.id) ?? null) : null,
    endedAt: d.endedAt?.toISOString() ?? null,
    endedBy: d.endedBy ? (names.get(d.endedBy.id) ?? null) : null,
  };
}

async function userNames(em: EntityManager, ids: string[]): Promise<Map<string, string>> {
  if (ids.length === 0) return new Map();
  const rows: { id: string; name: string }[] = await em.execute(`select id, name from app_user where id = any(?::uuid[])`, [
    `{${[...new Set(ids)].join(',')}}`,
  ]);
  return new Map(rows.map((r) => [r.id, r.name]));
}

/** Sums per-machine figures: operating and down time add up; the means and the ratio follow from the sums. */
function fleetFigures(list: ReliabilityFigures[], windowHours: number): ReliabilityFigures {
  const sum = (k: 'failures' | 'operatingHours' | 'failureDowntimeHours' | 'plannedDowntimeHours') => list.reduce((s, f) => s + f[k], 0);
  const failures = sum('failures');
  const operatingHours = sum('operatingHours');
  const failureDowntimeHours = sum('failureDowntimeHours');
  const plannedDowntimeHours = sum('plannedDowntimeHours');
  const meantToRun = list.length * windowHours - plannedDowntimeHours;
  return {
    failures,
    operatingHours,
    mtbfHours: failures ? operatingHours / failures : null,
    mttrHours: failures ? failureDowntimeHours / failures : null,
    availability: list.length && meantToRun > 0 ? operatingHours / meantToRun : null,
    failureDowntimeHours,
    plannedDowntimeHours,
    windowHours: list.length * windowHours,
  };
}

/** Failure downtime inside the window per code, largest first (stops of one code merged as the figures merge them). */
function bars(downtimes: IMachineDowntime[], key: 'causeCode' | 'failureCode', labels: Map<string, string>, from: Date, to: Date): CauseBar[] {
  const groups = new Map<string | null, IMachineDowntime[]>();
  for (const d of downtimes) if (d.kind === 'failure') groups.set(d[key] ?? null, [...(groups.get(d[key] ?? null) ?? []), d]);
  const out: CauseBar[] = [];
  for (const [code, list] of groups) {
    // Per machine, so two machines down at once both count.
    const byMachine = new Map<string, IMachineDowntime[]>();
    for (const d of list) byMachine.set(d.machine.id, [...(byMachine.get(d.machine.id) ?? []), d]);
    let hours = 0;
    let stops = 0;
    for (const ds of byMachine.values()) {
      const { failure } = clippedStops({ from, to, downtimes: ds.map((d) => ({ start: d.startedAt, end: d.endedAt ?? null, kind: 'failure' as const })) });
      hours += failure.reduce((s, [a, b]) => s + (b - a), 0) / HOUR_MS;
      stops += failure.length;
    }
    if (stops) out.push({ code, label: code ? (labels.get(code) ?? code) : 'Not coded yet', hours, stops });
  }
  return out.sort((a, b) => b.hours - a.hours || (a.code ?? '~').localeCompare(b.code ?? '~'));
}

export async function reliabilityReport(em: EntityManager, who: Principal, q: ReliabilityQuery): Promise<ReliabilityReport> {
  const zone = who.timeZone;
  const start = DateTime.fromISO(q.from, { zone }).startOf('day').toJSDate();
  const dayAfter = DateTime.fromISO(q.to, { zone }).plus({ days: 1 }).startOf('day').toJSDate();
  const now = clock.now();
  const end = dayAfter > now ? now : dayAfter;
  const machines = q.machineId ? await em.find(Machine, { id: q.machineId }) : await em.find(Machine, { active: true }, { orderBy: { code: 'asc' } });
  if (q.machineId && machines.length === 0) throw notFound('Machine');
  const windowStart = end > start ? start : end;
  const ids = machines.map((m) => m.id);
  const all = ids.length
    ? await em.find(
        MachineDowntime,
        { machine: { $in: ids }, startedAt: { $lt: end }, $or: [{ endedAt: null }, { endedAt: { $gt: windowStart } }] },
        { populate: ['machine'], orderBy: { startedAt: 'asc' } },
      )
    : [];
  const codes = await em.find(FailureCode, {});
  const labels = (category: string) => new Map(codes.filter((c) => c.category === category).map((c) => [c.code, c.label]));
  const windowHours = (end.getTime() - windowStart.getTime()) / HOUR_MS;
  const perMachine = machines.map((m) => {
    const mine = all.filter((d) => d.machine.id === m.id);
    const input = (list: IMachineDowntime[]) => ({
      from: windowStart,
      to: end,
      downtimes: list.map((d) => ({ start: d.startedAt, end: d.endedAt ?? null, kind: d.kind })),
    });
    // No time in the window (it starts now): nothing ran, nothing to measure.
    if (windowHours <= 0) return { machineId: m.id, code: m.code, name: m.name, figures: fleetFigures([], 0) };
    const figures = reliabilityFigures(input(mine));
    if (!q.failureCode) return { machineId: m.id, code: m.code, name: m.name, figures };
    // One failure mode: its stops are the failures; operating time is still the machine's own.
    const coded = reliabilityFigures(input(mine.filter((d) => d.kind === 'failure' && d.failureCode === q.failureCode)));
    return {
      machineId: m.id,
      code: m.code,
      name: m.name,
      figures: {
        ...figures,
        failures: coded.failures,
        failureDowntimeHours: coded.failureDowntimeHours,
        mtbfHours: coded.failures ? figures.operatingHours / coded.failures : null,
        mttrHours: coded.failures ? coded.failureDowntimeHours / coded.failures : null,
      },
    };
  });
  const shown = q.failureCode ? all.filter((d) => d.kind === 'failure' && d.failureCode === q.failureCode) : all;
  const names = await userNames(
    em,
    all.flatMap((d) => [d.startedBy?.id, d.endedBy?.id].filter((x): x is string => !!x)),
  );
  return {
    from: q.from,
    to: q.to,
    windowStart: windowStart.toISOString(),
    windowEnd: end.toISOString(),
    failureCode: q.failureCode ?? null,
    figures: fleetFigures(
      perMachine.map((r) => r.figures),
      windowHours,
    ),
    machines: perMachine,
    byCause: bars(shown, 'causeCode', labels('cause'), windowStart, end),
    byFailureMode: bars(shown, 'failureCode', labels('mode'), windowStart, end),
    downtimes: shown.map((d) => toDowntimeRow(d, names)),
  };
}

/** The latest stops of one machine, newest first. */
export async function machineDowntimes(em: EntityManager, machineId: string, limit = 50): Promise<DowntimeRow[]> {
  const list = await em.find(MachineDowntime, { machine: machineId }, { populate: ['machine'], orderBy: { startedAt: 'desc' }, limit });
  const names = await userNames(
    em,
    list.flatMap((d) => [d.startedBy?.id, d.endedBy?.id].filter((x): x is string => !!x)),
  );
  return list.map((d) => toDowntimeRow(d, names));
}
