import type { EntityManager } from '@mikro-orm/postgresql';
import type { StationAlarm, StationDueRow, StationLockout } from '../../../shared/schemas/consumables';
import { clock } from '../../../shared/clock';
import { fedLockouts } from '../safety/fed-lockouts';

/** Alarms stay on the station page for a week after they are raised (and while their lockout is open). */
export const ALARM_SHOWN_MS = 7 * 86_400_000;

/**
 * What an operator must know before touching the machine: open lockouts on it, its
 * components or the machines it is part of, and open work orders on it or its components. Read-only raw SQL on the safety and work-order tables so
 * this module depends on their tables, not on their services. Raw SQL bypasses the ORM's
 * shop filter, so every query names the organization itself.
 */
export async function stationStatus(
  em: EntityManager,
  orgId: string,
  machineIds: string[],
  ancestorIds: string[] = [],
): Promise<{ lockouts: StationLockout[]; due: StationDueRow[]; alarms: StationAlarm[] }> {
  if (machineIds.length === 0) return { lockouts: [], due: [], alarms: [] };
  const ids = `{${machineIds.join(',')}}`;
  const lockable = `{${[...machineIds, ...ancestorIds].join(',')}}`;
  // The holder's name tells the operator whom to ask before anything is switched back on.
  const lockouts: { id: string; code: string; state: string; applied_at: Date; reason: string; held_by: string }[] = await em.execute(
    `select l.id, m.code, l.state, l.applied_at, l.reason, u.name as held_by
       from safety_lockout l join machine m on m.id = l.machine_id join app_user u on u.id = l.primary_id
      where l.organization_id = ? and l.machine_id = any(?::uuid[]) and l.state <> 'released' and l.released_at is null
      order by l.applied_at desc`,
    [orgId, lockable],
  );
  const due: { id: string; number: number; code: string; title: string; status: string; due_at: Date | null; overdue: boolean; requires_lockout: boolean }[] =
    await em.execute(
      `select w.id, w.number, m.code, w.title, w.status, w.due_at, w.overdue, w.requires_lockout
       from work_order w join machine m on m.id = w.machine_id
      where w.organization_id = ? and w.machine_id = any(?::uuid[]) and w.status in ('open', 'in-progress', 'on-hold')
      order by w.due_at asc nulls last, w.number asc
      limit 20`,
      [orgId, ids],
    );
  // A lock on a shared point elsewhere (the hydraulic unit feeding this cell) stops this machine too.
  const fed = await fedLockouts(em, orgId, [...machineIds, ...ancestorIds]);
  const now = clock.ms();
  // Alarms stay on the page while their lockout is open and for a week after it is raised.
  const alarms: { id: string; code: string; at: Date; reason: string; subject_id: string | null }[] = await em.execute(
    `select e.id, m.code, e.at, e.reason, e.subject_id
       from safety_event e join machine m on m.id = e.machine_id left join safety_lockout l on l.id = e.subject_id
      where e.organization_id = ? and e.kind = 'alarm' and e.machine_id = any(?::uuid[])
        and (e.at > ? or (l.id is not null and l.state <> 'released'))
      order by e.at desc limit 10`,
    [orgId, lockable, new Date(now - ALARM_SHOWN_MS)],
  );
  return {
    alarms: alarms.map((a) => ({ id: a.id, machineCode: a.code, at: new Date(a.at).toISOString(), reason: a.reason, lockoutId: a.subject_id })),
    lockouts: [
      ...lockouts.map((l) => ({
        id: l.id,
        machineCode: l.code,
        state: l.state as StationLockout['state'],
        appliedAt: new Date(l.applied_at).toISOString(),
        reason: l.reason,
        heldBy: l.held_by,
      })),
      ...fed
        .filter((f, i) => fed.findIndex((x) => x.lockoutId === f.lockoutId) === i && !lockouts.some((l) => l.id === f.lockoutId))
        .map((f) => ({
          id: f.lockoutId,
          machineCode: f.machineCode,
          state: f.state,
          appliedAt: f.appliedAt.toISOString(),
          reason: f.reason,
          heldBy: f.heldBy,
          sharedPoint: f.pointKey,
        })),
    ],
    due: due.map((w) => {
      const dueAt = w.due_at ? new Date(w.due_at) : null;
      return {
        id: w.id,
        number: w.number,
        machineCode: w.code,
        title: w.title,
        status: w.status as StationDueRow['status'],
        dueAt: dueAt?.toISOString() ?? null,
        overdue: w.overdue || (!!dueAt && dueAt.getTime() < now),
        requiresLockout: w.requires_lockout,
      };
    }),
  };
}
