// Records the maintenance tests start from: machines, meters, readings and parts of one test shop,
// written through the ORM like the machines and stock modules write them.
import type { EntityManager, MikroORM } from '@mikro-orm/postgresql';
import { Machine } from '../../server/modules/machines/machine.entity';
import { Meter, MeterReading } from '../../server/modules/meters/meter.entity';
import { PartType } from '../../server/modules/stock/stock.entity';
import { OutboxMail } from '../../server/mail/outbox.entity';
import type { MachineKind, MeterKind } from '../../shared/schemas/machines';
import type { PartCategory } from '../../shared/schemas/stock';
export { del, get, patch, post, put } from '../setup/test-app';

export function scoped(em: EntityManager, orgId: string): EntityManager {
  em.setFilterParams('org', { orgId });
  return em;
}

export async function makeMachine(em: EntityManager, orgId: string, code: string, kind: MachineKind = 'hydraulic-unit', parent?: string) {
  const m = em.create(Machine, { organization: orgId, code, name: `${code} test machine`, kind, parent: parent ?? null, active: true });
  await em.flush();
  return m.id;
}

export async function makeMeter(em: EntityManager, orgId: string, machineId: string, code: string, kind: MeterKind = 'running-time', unit = 'h') {
  const m = em.create(Meter, { organization: orgId, machine: machineId, code, name: code.replace(/-/g, ' '), kind, unit });
  await em.flush();
  return m.id;
}

export async function addReadings(em: EntityManager, orgId: string, meterId: string, readings: { at: string | Date; value: number; isReset?: boolean }[]) {
  for (const r of readings) {
    em.create(MeterReading, { organization: orgId, meter: meterId, value: r.value, readAt: new Date(r.at), source: 'manual', isReset: r.isReset ?? false });
  }
  await em.flush();
}

export async function makePart(em: EntityManager, orgId: string, partNumber: string, onHand: number, category: PartCategory = 'hydraulic-filter') {
  const p = em.create(PartType, { organization: orgId, partNumber, name: `Part ${partNumber}`, category, onHand, stockUnit: 'pcs' });
  await em.flush();
  return p.id;
}

/** Marks every pending mail as sent, so a test can count exactly the mails it causes. */
export async function drainOutbox(orm: MikroORM) {
  await orm.em.fork().nativeUpdate(OutboxMail, { status: 'pending' }, { status: 'sent' });
}

export async function pendingMails(orm: MikroORM, orgId: string) {
  return orm.em.fork().find(OutboxMail, { status: 'pending', organizationId: orgId }, { orderBy: { createdAt: 'asc' } });
}

/** A plan body with sensible defaults; tests override what they check. */
export function planBody(machineId: string, over: Record<string, unknown> = {}) {
  return {
    machineId,
    title: 'Change return filter',
    instructions: 'Isolate, replace, check the indicator.',
    checklist: [
      { key: 'isolated', label: 'Unit isolated', kind: 'check' },
      { key: 'dp', label: 'Filter pressure drop after start', kind: 'measure', unit: 'bar', min: 0, max: 1.5 },
    ],
    estimatedMinutes: 45,
    parts: [],
    responsibleRole: 'technician',
    responsibleUserId: null,
    requiresLockout: false,
    safetyCritical: false,
    dueSoonDays: 2,
    dueSoonFraction: 0.1,
    active: true,
    triggers: [{ kind: 'calendar-floating', every: 1, unit: 'month' }],
    ...over,
  };
}
