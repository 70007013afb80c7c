/**
 * A machine's service state: in service, out of service (an open downtime interval) or locked out
 * (an energy-control lockout applied and not released). Taking a machine out and putting it back
 * opens and closes downtime intervals, writes the state history and the activity log, and tells the
 * people responsible. Other modules (fault reports, work-order sign-off) call these functions.
 */
import type { EntityManager } from '@mikro-orm/postgresql';
import { LockMode } from '@mikro-orm/core';
import { Machine, type IMachine } from './machine.entity';
import { MachineDowntime, MachineStateChange, type IMachineDowntime } from './machine-state.entity';
import { LockoutSession } from '../safety/lockout.entity';
import { openTestWindowReasons } from '../safety/testing-window.queries';
import { fedLockouts, fedReason } from '../safety/fed-lockouts';
import { User } from '../users/user.entity';
import type { Principal } from '../../http/principal';
import { conflict, notFound } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import { queueMail } from '../../mail/outbox';
import { renderMail } from '../../mail/templates';
import { loadConfig } from '../../config';
import { clock } from '../../../shared/clock';
import { DOWNTIME_KIND_LABELS, type DowntimeKind, type MachineState } from '../../../shared/schemas/machine-state';

export type MachineStatusValue = { state: MachineState; since: Date | null; reason: string | null };

/** The current state of one machine (shop filter applies: another shop's machine reads as unknown). */
export async function machineStatus(em: EntityManager, machineId: string): Promise<MachineStatusValue> {
  return (await machineStatuses(em, [machineId])).get(machineId) ?? { state: 'in-service', since: null, reason: null };
}

/** States of many machines in four queries, for lists and home pages. */
export async function machineStatuses(em: EntityManager, machineIds: string[]): Promise<Map<string, MachineStatusValue>> {
  const out = new Map<string, MachineStatusValue>();
  if (machineIds.length === 0) return out;
  const orgId = (em.getFilterParams('org') as { orgId?: string } | undefined)?.orgId ?? null;
  const [locks, open, last, fed] = await Promise.all([
    em.find(LockoutSession, { machine: { $in: machineIds }, state: { $ne: 'released' } }, { orderBy: { appliedAt: 'asc' }, populate: ['primary'] }),
    em.find(MachineDowntime, { machine: { $in: machineIds }, endedAt: null }),
    em.find(MachineStateChange, { machine: { $in: machineIds } }, { orderBy: { at: 'asc' } }),
    fedLockouts(em, orgId, machineIds),
  ]);
  for (const c of last) out.set(c.machine.id, { state: 'in-service', since: c.at, reason: null });
  for (const id of machineIds) if (!out.has(id)) out.set(id, { state: 'in-service', since: null, reason: null });
  for (const d of open) out.set(d.machine.id, { state: 'out-of-service', since: d.startedAt, reason: d.reason });
  // A lockout wins: nobody may run the machine while locks are on it, whatever else is recorded.
  // During a test window it stays locked out for production, and the reason says it is energized.
  const testing = await openTestWindowReasons(
    em,
    locks.filter((l) => l.state === 'testing').map((l) => l.id),
  );
  for (const l of locks) {
    const t = testing.get(l.id);
    if (t)
      out.set(l.machine.id, {
        state: 'locked-out',
        since: t.since,
        reason: `Energized for testing under the lockout held by ${l.primary.getEntity().name} (${l.reason}) — locks off: ${t.reason}`,
      });
    else if (out.get(l.machine.id)?.state !== 'locked-out') out.set(l.machine.id, { state: 'locked-out', since: l.appliedAt, reason: l.reason });
  }
  // So does a lock on a shared point that feeds the machine (a hydraulic unit feeding two cells).
  for (const f of fed) {
    if (out.get(f.fedMachineId)?.state !== 'locked-out') out.set(f.fedMachineId, { state: 'locked-out', since: f.appliedAt, reason: fedReason(f) });
  }
  return out;
}

/** The machine, row-locked so two state changes of one machine run one after the other. */
async function lockMachine(tx: EntityManager, machineId: string, doing: string): Promise<IMachine> {
  const m = await tx.findOne(Machine, { id: machineId }, { lockMode: LockMode.PESSIMISTIC_WRITE });
  if (!m) throw notFound('Machine');
  if (!m.active)
    throw conflict(`Machine ${m.code} is deactivated; it cannot ${doing}. Reactivate it first.`, [{ path: 'machineId', message: `${m.code} is deactivated` }]);
  return m;
}

export type TakeOutOfService = { machineId: string; reason: string; kind: DowntimeKind; workOrderId?: string | null; failureCode?: string | null };

/**
 * Takes a machine out of service: opens a downtime interval, records the change and mails the
 * people responsible once. Already out of service: the open interval is returned unchanged (a
 * work order given now is linked if it had none).
 */
export async function takeOutOfService(em: EntityManager, who: Principal, input: TakeOutOfService): Promise<IMachineDowntime> {
  return em.transactional(async (tx) => {
    const machine = await lockMachine(tx, input.machineId, 'be taken out of service');
    const open = await tx.findOne(MachineDowntime, { machine: machine.id, endedAt: null });
    if (open) {
      if (input.workOrderId && !open.workOrderId) open.workOrderId = input.workOrderId;
      if (input.failureCode && !open.failureCode) open.failureCode = input.failureCode;
      return open;
    }
    const now = clock.now();
    const before = await machineStatus(tx, machine.id);
    const downtime = tx.create(MachineDowntime, {
      organization: who.orgId,
      machine: machine.id,
      kind: input.kind,
      reason: input.reason.slice(0, 500),
      failureCode: input.failureCode ?? null,
      workOrderId: input.workOrderId ?? null,
      startedAt: now,
      startedBy: who.userId,
    });
    tx.create(MachineStateChange, {
      organization: who.orgId,
      machine: machine.id,
      fromState: before.state,
      toState: before.state === 'locked-out' ? 'locked-out' : 'out-of-service',
      at: now,
      by: who.userId,
      reason: downtime.reason,
      downtime,
      workOrderId: input.workOrderId ?? null,
    });
    recordActivity(
      tx,
      who,
      'machine.out-of-service',
      { type: 'Machine', id: machine.id },
      { code: machine.code, kind: input.kind, reason: downtime.reason, downtimeId: downtime.id, workOrderId: input.workOrderId ?? null },
    );
    await queueOutOfServiceMails(tx, who, machine, downtime, input.workOrderId ?? null);
    return downtime;
  });
}

export type ReturnToService = { machineId: string; workOrderId?: string | null; note?: string | null };

/** Puts a machine back in service: closes its open downtime interval with who and when. Not out of service: 409. */
export async function returnToService(em: EntityManager, who: Principal, input: ReturnToService): Promise<IMachineDowntime> {
  return em.transactional(async (tx) => {
    const machine = await lockMachine(tx, input.machineId, 'be returned to service');
    const open = await tx.findOne(MachineDowntime, { machine: machine.id, endedAt: null });
    if (!open) throw conflict(`Machine ${machine.code} is not out of service`);
    const now = clock.now();
    open.endedAt = now;
    open.endedBy = tx.getReference(User, who.userId, { wrapped: true });
    open.endedByWorkOrderId = input.workOrderId ?? null;
    const locked = await tx.count(LockoutSession, { machine: machine.id, state: { $ne: 'released' } });
    tx.create(MachineStateChange, {
      organization: who.orgId,
      machine: machine.id,
      fromState: locked ? 'locked-out' : 'out-of-service',
      toState: locked ? 'locked-out' : 'in-service',
      at: now,
      by: who.userId,
      reason: input.note ?? null,
      downtime: open,
      workOrderId: input.workOrderId ?? null,
    });
    recordActivity(
      tx,
      who,
      'machine.returned-to-service',
      { type: 'Machine', id: machine.id },
      {
        code: machine.code,
        downtimeId: open.id,
        minutesDown: Math.round((now.getTime() - open.startedAt.getTime()) / 60000),
        workOrderId: input.workOrderId ?? null,
        ...(input.note ? { note: input.note } : {}),
      },
    );
    return open;
  });
}

/**
 * Work-order sign-off hook: a repair that ends an open downtime interval puts its machine back
 * in service. Returns whether it did.
 */
export async function returnToServiceOnWorkDone(em: EntityManager, who: Principal, workOrderId: string): Promise<boolean> {
  const open = await em.findOne(MachineDowntime, { workOrderId, endedAt: null });
  if (!open) return false;
  await returnToService(em, who, { machineId: open.machine.id, workOrderId });
  return true;
}

/** Technicians and admins who can sign in hear that a machine stopped (not the person who stopped it). */
async function queueOutOfServiceMails(tx: EntityManager, who: Principal, machine: IMachine, downtime: IMachineDowntime, workOrderId: string | null) {
  const people: { email: string; name: string }[] = await tx.execute(
    `select u.email, u.name
       from membership m join app_user u on u.id = m.user_id
      where m.organization_id = ? and m.active and u.password_hash is not null and m.role in ('technician', 'admin') and u.id <> ?
      order by u.email`,
    [who.orgId, who.userId],
  );
  let number: number | null = null;
  if (workOrderId) {
    const [row]: { number: number }[] = await tx.execute(`select number from work_order where id = ? and organization_id = ?`, [workOrderId, who.orgId]);
    number = row?.number ?? null;
  }
  const appUrl = loadConfig().APP_URL;
  const action =
    workOrderId && number !== null
      ? { label: `Open WO ${number}`, url: `${appUrl}/work-orders/${workOrderId}` }
      : { label: `Open ${machine.code}`, url: `${appUrl}/station/${encodeURIComponent(machine.code)}` };
  for (const p of people) {
    queueMail(tx, {
      to: p.email,
      kind: 'machine-out-of-service',
      organizationId: who.orgId,
      subject: `${machine.code} out of service: ${downtime.reason}`.slice(0, 300),
      ...renderMail({
        heading: `${machine.code} ${machine.name} is out of service`,
        paragraphs: [
          `Hello ${p.name},`,
          `${who.name} took ${machine.code} out of service (${DOWNTIME_KIND_LABELS[downtime.kind].toLowerCase()}): ${downtime.reason}`,
          ...(number !== null ? [`The repair is WO ${number}. Signing it off puts the machine back in service.`] : []),
        ],
        action,
        caution: true,
      }),
    });
  }
}
