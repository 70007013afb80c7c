import type { EntityManager } from '@mikro-orm/postgresql';
import { Machine, type IMachine } from './machine.entity';
import { Meter } from '../meters/meter.entity';
import type { Principal } from '../../http/principal';
import { conflict, fieldError, notFound } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import { latestReadings } from '../meters/meters.service';
import { machineStatuses, type MachineStatusValue } from './machine-state.service';
import type { MachineDetail, MachineInput, MachineRow, MachineUpdate, MeterRow } from '../../../shared/schemas/machines';

type Flat = IMachine;

/** Exact, case-insensitive match for ilike: codes may contain `_`, which is a wildcard there. */
export const ilikeExact = (s: string) => s.replace(/[\\%_]/g, (c) => `\\${c}`);

/** Orders machines as a tree (parents first, children by code) and gives each its depth. */
export function treeOrder<T extends { id: string; code: string; parentId: string | null }>(rows: T[]): (T & { depth: number })[] {
  const byParent = new Map<string | null, T[]>();
  const ids = new Set(rows.map((r) => r.id));
  for (const r of rows) {
    const key = r.parentId && ids.has(r.parentId) ? r.parentId : null;
    byParent.set(key, [...(byParent.get(key) ?? []), r]);
  }
  const out: (T & { depth: number })[] = [];
  const walk = (parent: string | null, depth: number) => {
    for (const r of (byParent.get(parent) ?? []).sort((a, b) => a.code.localeCompare(b.code, undefined, { numeric: true }))) {
      out.push({ ...r, depth });
      walk(r.id, depth + 1);
    }
  };
  walk(null, 0);
  return out;
}

function toRow(m: Flat, meterCount: number, status: MachineStatusValue | undefined): Omit<MachineRow, 'depth'> {
  return {
    id: m.id,
    code: m.code,
    name: m.name,
    kind: m.kind,
    parentId: m.parent?.id ?? null,
    location: m.location ?? null,
    serial: m.serial ?? null,
    notes: m.notes ?? null,
    active: m.active,
    meterCount,
    status: { state: status?.state ?? 'in-service', since: status?.since?.toISOString() ?? null, reason: status?.reason ?? null },
  };
}

async function meterCounts(em: EntityManager, orgId: string): Promise<Map<string, number>> {
  const rows: { machine_id: string; n: string }[] = await em.execute(
    'select machine_id, count(*) as n from meter where organization_id = ? group by machine_id',
    [orgId],
  );
  return new Map(rows.map((r) => [r.machine_id, Number(r.n)]));
}

export async function listMachines(em: EntityManager, who: Principal, opts: { includeInactive?: boolean } = {}): Promise<MachineRow[]> {
  const machines = await em.find(Machine, opts.includeInactive ? {} : { active: true });
  const counts = await meterCounts(em, who.orgId);
  const states = await machineStatuses(
    em,
    machines.map((m) => m.id),
  );
  return treeOrder(machines.map((m) => toRow(m, counts.get(m.id) ?? 0, states.get(m.id))));
}

export async function getMachine(em: EntityManager, who: Principal, id: string): Promise<MachineDetail> {
  const machine = await em.findOne(Machine, { id });
  if (!machine) throw notFound('Machine');
  const all = await em.find(Machine, {});
  const counts = await meterCounts(em, who.orgId);
  const states = await machineStatuses(
    em,
    all.map((m) => m.id),
  );
  const rows = all.map((m) => toRow(m, counts.get(m.id) ?? 0, states.get(m.id)));
  // Components: the subtree under this machine, in tree order, depth relative to it.
  const sub = new Set(subtreeIds(all, machine.id));
  const subtree = rows.filter((r) => sub.has(r.id)).map((r) => (r.id === machine.id ? { ...r, parentId: null } : r));
  const ordered = treeOrder(subtree);
  const self = ordered[0];
  const parent = machine.parent ? (all.find((m) => m.id === machine.parent!.id) ?? null) : null;
  const meters = await metersOf(em, [...sub]);
  return {
    ...self,
    parentId: machine.parent?.id ?? null,
    parent: parent ? { id: parent.id, code: parent.code, name: parent.name } : null,
    components: ordered.slice(1),
    meters,
  };
}

/** Meters of the given machines with their latest readings, ordered by machine code then meter code. */
export async function metersOf(em: EntityManager, machineIds: string[]): Promise<MeterRow[]> {
  if (machineIds.length === 0) return [];
  const meters = await em.find(Meter, { machine: { $in: machineIds } }, { populate: ['machine'], orderBy: { code: 'asc' } });
  const latest = await latestReadings(
    em,
    meters.map((m) => m.id),
  );
  return meters
    .map((m) => ({
      id: m.id,
      machineId: m.machine.id,
      machineCode: m.machine.getEntity().code,
      code: m.code,
      name: m.name,
      kind: m.kind,
      unit: m.unit,
      lowerLimit: m.lowerLimit ?? null,
      upperLimit: m.upperLimit ?? null,
      latest: latest.get(m.id) ?? null,
    }))
    .sort((a, b) => a.machineCode.localeCompare(b.machineCode, undefined, { numeric: true }) || a.code.localeCompare(b.code));
}

async function assertParent(em: EntityManager, selfId: string | null, parentId: string | null) {
  if (!parentId) return null;
  if (parentId === selfId) throw fieldError('parentId', 'A machine cannot be its own component');
  const parent = await em.findOne(Machine, { id: parentId });
  if (!parent) throw fieldError('parentId', 'The parent machine was not found');
  if (selfId) {
    // Walk up from the new parent: meeting ourselves would make a loop.
    const all = await em.find(Machine, {});
    const byId = new Map(all.map((m) => [m.id, m]));
    let cur: Flat | undefined = parent;
    for (let guard = 0; cur && guard < 1000; guard++) {
      if (cur.id === selfId) throw fieldError('parentId', 'A machine cannot sit below one of its own components');
      cur = cur.parent ? byId.get(cur.parent.id) : undefined;
    }
  }
  return parent;
}

async function assertCodeFree(em: EntityManager, code: string, selfId: string | null) {
  const other = await em.findOne(Machine, { code: { $ilike: ilikeExact(code) }, ...(selfId ? { id: { $ne: selfId } } : {}) });
  if (other) throw conflict(`Another machine already has the code ${other.code}`, [{ path: 'code', message: `Code ${other.code} is taken` }]);
}

export async function createMachine(em: EntityManager, who: Principal, input: MachineInput): Promise<{ id: string }> {
  return em.transactional(async (tx) => {
    await assertCodeFree(tx, input.code, null);
    await assertParent(tx, null, input.parentId);
    const m = tx.create(Machine, {
      organization: who.orgId,
      code: input.code,
      name: input.name,
      kind: input.kind,
      parent: input.parentId,
      location: input.location,
      serial: input.serial,
      notes: input.notes,
    });
    recordActivity(tx, who, 'machine.created', { type: 'Machine', id: m.id }, { code: input.code, name: input.name });
    return { id: m.id };
  });
}

export async function updateMachine(em: EntityManager, who: Principal, id: string, input: MachineUpdate): Promise<void> {
  await em.transactional(async (tx) => {
    const m = await tx.findOne(Machine, { id });
    if (!m) throw notFound('Machine');
    if (input.code !== undefined) await assertCodeFree(tx, input.code, id);
    if (input.parentId !== undefined) await assertParent(tx, id, input.parentId);
    const before = { code: m.code, name: m.name, parentId: m.parent?.id ?? null, active: m.active };
    if (input.code !== undefined) m.code = input.code;
    if (input.name !== undefined) m.name = input.name;
    if (input.kind !== undefined) m.kind = input.kind;
    if (input.parentId !== undefined) m.parent = input.parentId ? tx.getReference(Machine, input.parentId, { wrapped: true }) : null;
    if (input.location !== undefined) m.location = input.location;
    if (input.serial !== undefined) m.serial = input.serial;
    if (input.notes !== undefined) m.notes = input.notes;
    if (input.active !== undefined) m.active = input.active;
    recordActivity(
      tx,
      who,
      'machine.updated',
      { type: 'Machine', id },
      { before, after: { code: m.code, name: m.name, parentId: m.parent?.id ?? null, active: m.active } },
    );
  });
}

/** The machine with this code (case-insensitive), or 404. */
export async function machineByCode(em: EntityManager, code: string) {
  const m = await em.findOne(Machine, { code: { $ilike: ilikeExact(code) } });
  if (!m) throw notFound(`Machine ${code}`);
  return m;
}

/** Ids of a machine and everything below it in the component tree. */
export function subtreeIds(all: Pick<IMachine, 'id' | 'parent'>[], rootId: string): string[] {
  const ids = new Set([rootId]);
  for (let grew = true; grew;) {
    grew = false;
    for (const m of all) {
      if (m.parent && ids.has(m.parent.id) && !ids.has(m.id)) {
        ids.add(m.id);
        grew = true;
      }
    }
  }
  return [...ids];
}

/** A machine and everything below it (a cell's torch and punch head), for filters that name the cell. */
export async function subtreeMachines(em: EntityManager, rootId: string): Promise<IMachine[]> {
  const all = await em.find(Machine, {});
  const ids = new Set(subtreeIds(all, rootId));
  return all.filter((m) => ids.has(m.id));
}
