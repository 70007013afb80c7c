/** Writing plans: creating and editing one, with its triggers checked against the machine's meters. */
import type { EntityManager } from '@mikro-orm/postgresql';
import { MaintenancePlan, type IMaintenancePlan } from './plan.entity';
import { Machine, type IMachine } from '../machines/machine.entity';
import { Meter } from '../meters/meter.entity';
import { PartType } from '../stock/stock.entity';
import { Membership } from '../users/user.entity';
import { Organization } from '../organizations/organization.entity';
import type { Principal } from '../../http/principal';
import { badRequest, notFound } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import { buildRecurrenceText } from '../../../shared/domain/recurrence';
import type { FieldErrors } from '../../../shared/schemas/common';
import type { PlanInput, StoredTrigger, TriggerInput } from '../../../shared/schemas/plans';
import { currentBaselines, refreshPlanStatus } from './plan-evaluation';
import { clock } from '../../../shared/clock';

export type MeterInfo = { id: string; code: string; name: string; unit: string; kind: string; machineId: string };

export async function shopTimeZone(em: EntityManager, who: Principal): Promise<string> {
  const org = await em.findOneOrFail(Organization, who.orgId);
  return org.timeZone;
}

/** A machine of the caller's shop, or 404 (another shop's machine is simply not found). */
export async function findMachine(em: EntityManager, id: string): Promise<IMachine> {
  const m = await em.findOne(Machine, { id });
  if (!m) throw notFound('Machine');
  return m;
}

/** The machine, its parent and its components: meters on any of them can drive the machine's plans. */
export async function relatedMachineIds(em: EntityManager, machine: IMachine): Promise<string[]> {
  const children = await em.find(Machine, { parent: machine.id }, { fields: ['id'] });
  return [machine.id, ...(machine.parent ? [machine.parent.id] : []), ...children.map((c) => c.id)];
}

export async function metersOf(em: EntityManager, machineIds: string[]): Promise<MeterInfo[]> {
  const meters = await em.find(Meter, { machine: { $in: machineIds } }, { orderBy: { code: 'asc' } });
  return meters.map((m) => ({ id: m.id, code: m.code, name: m.name, unit: m.unit, kind: m.kind, machineId: m.machine.id }));
}

/** Turns form triggers into stored ones; collects field errors with their paths (triggers.N.field). */
async function resolveTriggers(em: EntityManager, machine: IMachine, triggers: TriggerInput[], timeZone: string): Promise<StoredTrigger[]> {
  const errors: FieldErrors = [];
  const related = await relatedMachineIds(em, machine);
  const out: StoredTrigger[] = [];
  for (const [i, t] of triggers.entries()) {
    const at = (f: string) => `triggers.${i}.${f}`;
    switch (t.kind) {
      case 'calendar-fixed': {
        try {
          const ical = buildRecurrenceText({ start: t.start, tzid: timeZone, rrule: t.rrule });
          out.push({
            kind: 'calendar-fixed',
            start: t.start.length === 16 ? `${t.start}:00` : t.start,
            rrule: ical.split('\n')[1].replace(/^RRULE:/, ''),
            ical,
          });
        } catch (err) {
          const message = (err instanceof Error ? err.message : String(err)).replace(/^recurrence: /, '');
          errors.push({ path: /DTSTART/.test(message) ? at('start') : at('rrule'), message: message.replace(/DTSTART/g, 'The start') });
        }
        break;
      }
      case 'calendar-floating':
        out.push(t);
        break;
      case 'meter':
      case 'condition': {
        const meter = await em.findOne(Meter, { id: t.meterId });
        if (!meter) throw notFound('Meter');
        if (!related.includes(meter.machine.id)) {
          errors.push({ path: at('meterId'), message: 'This meter belongs to another machine; choose one of this machine or its components' });
        } else if (t.kind === 'meter' && meter.kind === 'condition') {
          errors.push({ path: at('meterId'), message: `${meter.name} is a condition reading; a meter interval needs a counter or running hours` });
        } else if (t.kind === 'condition' && meter.kind !== 'condition') {
          errors.push({ path: at('meterId'), message: `${meter.name} is a counter; a condition trigger needs a condition reading` });
        }
        out.push(t);
        break;
      }
      case 'oil-analysis':
        if (machine.kind !== 'hydraulic-unit') errors.push({ path: at('kind'), message: 'Oil analysis triggers belong on a hydraulic unit' });
        out.push(t);
        break;
    }
  }
  if (errors.length) throw badRequest(`The plan has problems: ${errors.map((e) => `${e.path}: ${e.message}`).join('; ')}`, errors);
  return out;
}

async function checkPeopleAndParts(em: EntityManager, who: Principal, input: PlanInput) {
  if (input.responsibleUserId) {
    const m = await em.findOne(Membership, { user: input.responsibleUserId, organization: who.orgId, active: true }, { filters: false });
    if (!m)
      throw badRequest('The responsible person is not an active member of this shop', [
        { path: 'responsibleUserId', message: 'Not an active member of this shop' },
      ]);
  }
  for (const [i, p] of input.parts.entries()) {
    const part = await em.findOne(PartType, { id: p.partTypeId });
    if (!part) throw badRequest('A planned part is not in this shop’s catalogue', [{ path: `parts.${i}.partTypeId`, message: 'Part not found' }]);
  }
}

/** The station record a plan names must be one this machine can make: a torch for parts and coupons, its own counter for a reading. */
async function checkStationRecord(em: EntityManager, machine: IMachine, input: PlanInput) {
  const rule = input.stationRecord;
  if (!rule) return;
  const related = await relatedMachineIds(em, machine);
  if (rule.kind === 'consumable-change' || rule.kind === 'cut-check') {
    const torches = await em.count(Machine, { id: { $in: related }, kind: 'torch' });
    if (machine.kind !== 'torch' && torches === 0)
      throw badRequest(`${machine.code} has no torch, so no ${rule.kind === 'cut-check' ? 'test coupon' : 'consumable change'} is recorded on it`, [
        { path: 'stationRecord.kind', message: `${machine.code} has no torch` },
      ]);
  }
  if (rule.kind === 'counter-reading') {
    const meter = await em.findOne(Meter, { id: rule.meterId });
    if (!meter || !related.includes(meter.machine.id))
      throw badRequest('The counter must belong to this machine or its components', [
        { path: 'stationRecord.meterId', message: 'Choose a counter of this machine or its components' },
      ]);
  }
}

const meterIdsOf = (ts: StoredTrigger[]) => ts.filter((t): t is Extract<StoredTrigger, { kind: 'meter' }> => t.kind === 'meter').map((t) => t.meterId);

/** The plan columns a create or an edit takes straight from the form. */
function editableFields(input: PlanInput, triggers: Awaited<ReturnType<typeof resolveTriggers>>) {
  return {
    title: input.title,
    instructions: input.instructions,
    checklist: input.checklist,
    estimatedMinutes: input.estimatedMinutes,
    parts: input.parts,
    responsibleRole: input.responsibleRole,
    responsibleUser: input.responsibleUserId,
    requiresLockout: input.requiresLockout,
    safetyCritical: input.safetyCritical,
    triggers,
    dueSoonDays: input.dueSoonDays,
    dueSoonFraction: input.dueSoonFraction,
    active: input.active,
    stationRecord: input.stationRecord,
  };
}

export async function createPlan(em: EntityManager, who: Principal, input: PlanInput, extra: { starterKey?: string } = {}): Promise<{ id: string }> {
  return em.transactional(async (tx) => {
    const machine = await findMachine(tx, input.machineId);
    const tz = await shopTimeZone(tx, who);
    await checkPeopleAndParts(tx, who, input);
    await checkStationRecord(tx, machine, input);
    const triggers = await resolveTriggers(tx, machine, input.triggers, tz);
    const plan = tx.create(MaintenancePlan, {
      organization: who.orgId,
      machine,
      ...editableFields(input, triggers),
      startedAt: clock.now(),
      meterBaselines: await currentBaselines(tx, meterIdsOf(triggers)),
      starterKey: extra.starterKey ?? null,
    });
    await refreshPlanStatus(tx, plan, tz);
    recordActivity(
      tx,
      who,
      'plan.created',
      { type: 'MaintenancePlan', id: plan.id },
      { title: plan.title, machine: machine.code, starter: extra.starterKey ?? null },
    );
    return { id: plan.id };
  });
}

export async function updatePlan(em: EntityManager, who: Principal, id: string, input: PlanInput): Promise<void> {
  await em.transactional(async (tx) => {
    const plan = await tx.findOne(MaintenancePlan, { id });
    if (!plan) throw notFound('Plan');
    const machine = await findMachine(tx, input.machineId);
    const tz = await shopTimeZone(tx, who);
    await checkPeopleAndParts(tx, who, input);
    await checkStationRecord(tx, machine, input);
    const triggers = await resolveTriggers(tx, machine, input.triggers, tz);
    // Meters already counted keep their baseline; newly added meters count from their current value.
    const fresh = await currentBaselines(
      tx,
      meterIdsOf(triggers).filter((m) => !plan.meterBaselines[m]),
    );
    const before = { title: plan.title, triggers: plan.triggers, active: plan.active };
    Object.assign(plan, {
      machine,
      ...editableFields(input, triggers),
      meterBaselines: { ...plan.meterBaselines, ...fresh },
    });
    await refreshPlanStatus(tx, plan, tz);
    recordActivity(
      tx,
      who,
      'plan.updated',
      { type: 'MaintenancePlan', id: plan.id },
      { before, after: { title: plan.title, triggers: plan.triggers, active: plan.active } },
    );
  });
}

export type { IMaintenancePlan };
