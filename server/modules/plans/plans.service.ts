import type { EntityManager } from '@mikro-orm/postgresql';
import { DateTime } from 'luxon';
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
import { summarizeTrigger, summarizeTriggers } from '../../../shared/domain/plan-summary';
import { STARTER_PLANS, findStarter, type StarterMeter, type StarterPlan } from '../../../shared/domain/starter-plans';
import { ROLE_LABELS } from '../../../shared/permissions';
import { MACHINE_KIND_LABELS, type MachineKind } from '../../../shared/schemas/machines';
import type { FieldErrors } from '../../../shared/schemas/common';
import type {
  ApplyStartersInput,
  ApplyStartersResult,
  DueState,
  ListPlansQuery,
  PlanDetail,
  PlanInput,
  PlanLookups,
  PlanRow,
  StarterFit,
  StarterView,
  StoredTrigger,
  TriggerInput,
} from '../../../shared/schemas/plans';
import { currentBaselines, refreshPlanStatus } from './plan-evaluation';
import { clock } from '../../../shared/clock';
import type { Page } from '../../../shared/schemas/paging';

type MeterInfo = { id: string; code: string; name: string; unit: string; kind: string; machineId: string };

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
async function relatedMachineIds(em: EntityManager, machine: IMachine): Promise<string[]> {
  const children = await em.find(Machine, { parent: machine.id }, { fields: ['id'] });
  return [machine.id, ...(machine.parent ? [machine.parent.id] : []), ...children.map((c) => c.id)];
}

async function metersOf(em: EntityManager, machineIds: string[]): Promise<MeterInfo[]> {
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
          out.push({ kind: 'calendar-fixed', start: t.start.length === 16 ? `${t.start}:00` : t.start, rrule: ical.split('\n')[1].replace(/^RRULE:/, ''), ical });
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
    if (!m) throw badRequest('The responsible person is not an active member of this shop', [{ path: 'responsibleUserId', message: 'Not an active member of this shop' }]);
  }
  for (const [i, p] of input.parts.entries()) {
    const part = await em.findOne(PartType, { id: p.partTypeId });
    if (!part) throw badRequest('A planned part is not in this shop’s catalogue', [{ path: `parts.${i}.partTypeId`, message: 'Part not found' }]);
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
  };
}

export async function createPlan(em: EntityManager, who: Principal, input: PlanInput, extra: { starterKey?: string } = {}): Promise<{ id: string }> {
  return em.transactional(async (tx) => {
    const machine = await findMachine(tx, input.machineId);
    const tz = await shopTimeZone(tx, who);
    await checkPeopleAndParts(tx, who, input);
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
    recordActivity(tx, who, 'plan.created', { type: 'MaintenancePlan', id: plan.id }, { title: plan.title, machine: machine.code, starter: extra.starterKey ?? null });
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
    const triggers = await resolveTriggers(tx, machine, input.triggers, tz);
    // Meters already counted keep their baseline; newly added meters count from their current value.
    const fresh = await currentBaselines(tx, meterIdsOf(triggers).filter((m) => !plan.meterBaselines[m]));
    const before = { title: plan.title, triggers: plan.triggers, active: plan.active };
    Object.assign(plan, {
      machine,
      ...editableFields(input, triggers),
      meterBaselines: { ...plan.meterBaselines, ...fresh },
    });
    await refreshPlanStatus(tx, plan, tz);
    recordActivity(tx, who, 'plan.updated', { type: 'MaintenancePlan', id: plan.id }, { before, after: { title: plan.title, triggers: plan.triggers, active: plan.active } });
  });
}

const SORT_SQL: Record<ListPlansQuery['sort'], string> = {
  title: 'p.title',
  machine: 'm.code',
  status: `case p.status when 'overdue' then 0 when 'due' then 1 when 'due-soon' then 2 else 3 end`,
  nextDueAt: 'p.next_due_at',
};

type PlanSql = {
  id: string;
  title: string;
  status: DueState;
  next_due_at: Date | null;
  status_reason: string | null;
  triggers: StoredTrigger[];
  requires_lockout: boolean;
  safety_critical: boolean;
  active: boolean;
  last_done_at: Date | null;
  responsible_role: PlanRow['responsible'] | null;
  responsible_name: string | null;
  machine_id: string;
  code: string;
  machine_name: string;
  total: string;
};

async function meterLabels(em: EntityManager, ids: string[]) {
  if (ids.length === 0) return new Map<string, { id: string; code: string; name: string; unit: string }>();
  const meters = await em.find(Meter, { id: { $in: ids } });
  return new Map(meters.map((m) => [m.id, { id: m.id, code: m.code, name: m.name, unit: m.unit }]));
}

const iso = (d: Date | null | undefined) => (d ? new Date(d).toISOString() : null);

export async function listPlans(em: EntityManager, who: Principal, q: ListPlansQuery): Promise<Page<PlanRow>> {
  const params: unknown[] = [who.orgId];
  let where = 'p.organization_id = ?';
  if (q.active !== 'all') {
    where += ' and p.active = ?';
    params.push(q.active === 'true');
  }
  if (q.machineId) {
    where += ' and (p.machine_id = ? or m.parent_id = ?)';
    params.push(q.machineId, q.machineId);
  }
  if (q.status) {
    where += ' and p.status = ?';
    params.push(q.status);
  }
  if (q.q) {
    where += ' and (p.title ilike ? or m.code ilike ? or m.name ilike ?)';
    params.push(`%${q.q}%`, `%${q.q}%`, `%${q.q}%`);
  }
  const rows: PlanSql[] = await em.execute(
    `select p.id, p.title, p.status, p.next_due_at, p.status_reason, p.triggers, p.requires_lockout, p.safety_critical, p.active, p.last_done_at,
            p.responsible_role, u.name as responsible_name, m.id as machine_id, m.code, m.name as machine_name, count(*) over () as total
       from maintenance_plan p join machine m on m.id = p.machine_id left join app_user u on u.id = p.responsible_user_id
      where ${where}
      order by ${SORT_SQL[q.sort]} ${q.dir === 'desc' ? 'desc' : 'asc'} nulls last, p.title, p.id
      limit ? offset ?`,
    [...params, q.pageSize, (q.page - 1) * q.pageSize],
  );
  const labels = await meterLabels(em, [...new Set(rows.flatMap((r) => r.triggers.flatMap((t) => ('meterId' in t ? [t.meterId] : []))))]);
  return {
    rows: rows.map((r) => ({
      id: r.id,
      title: r.title,
      machine: { id: r.machine_id, code: r.code, name: r.machine_name },
      status: r.status,
      nextDueAt: iso(r.next_due_at),
      statusReason: r.status_reason,
      triggerSummary: summarizeTriggers(r.triggers, (id) => labels.get(id)),
      requiresLockout: r.requires_lockout,
      safetyCritical: r.safety_critical,
      active: r.active,
      lastDoneAt: iso(r.last_done_at),
      responsible: r.responsible_name ?? (r.responsible_role ? ROLE_LABELS[r.responsible_role as keyof typeof ROLE_LABELS] : '—'),
    })),
    total: rows[0] ? Number(rows[0].total) : 0,
    page: q.page,
    pageSize: q.pageSize,
  };
}

export async function getPlan(em: EntityManager, who: Principal, id: string): Promise<PlanDetail> {
  const plan = await em.findOne(MaintenancePlan, { id }, { populate: ['machine', 'responsibleUser'] });
  if (!plan) throw notFound('Plan');
  const labels = await meterLabels(em, plan.triggers.flatMap((t) => ('meterId' in t ? [t.meterId] : [])));
  const parts = plan.parts.length ? await em.find(PartType, { id: { $in: plan.parts.map((p) => p.partTypeId) } }) : [];
  const partOf = new Map(parts.map((p) => [p.id, p]));
  const [open]: { id: string; number: number; status: string }[] = await em.execute(
    `select id, number, status from work_order where plan_id = ? and status in ('open', 'in-progress', 'on-hold') order by created_at desc limit 1`,
    [plan.id],
  );
  const machine = plan.machine.getEntity();
  return {
    id: plan.id,
    machine: { id: machine.id, code: machine.code, name: machine.name, kind: machine.kind },
    title: plan.title,
    instructions: plan.instructions,
    checklist: plan.checklist,
    estimatedMinutes: plan.estimatedMinutes ?? null,
    parts: plan.parts.map((p) => ({ ...p, partNumber: partOf.get(p.partTypeId)?.partNumber ?? '?', name: partOf.get(p.partTypeId)?.name ?? 'Removed part', stockUnit: partOf.get(p.partTypeId)?.stockUnit ?? '' })),
    responsibleRole: plan.responsibleRole ?? null,
    responsibleUser: plan.responsibleUser ? { id: plan.responsibleUser.id, name: plan.responsibleUser.getEntity().name } : null,
    requiresLockout: plan.requiresLockout,
    safetyCritical: plan.safetyCritical,
    triggers: plan.triggers.map((t) => {
      const meter = 'meterId' in t ? labels.get(t.meterId) : undefined;
      return { ...t, summary: summarizeTrigger(t, meter), ...(meter ? { meter } : {}) };
    }),
    dueSoonDays: plan.dueSoonDays ?? null,
    dueSoonFraction: plan.dueSoonFraction ?? null,
    active: plan.active,
    startedAt: plan.startedAt.toISOString(),
    lastDoneAt: iso(plan.lastDoneAt),
    status: plan.status,
    nextDueAt: iso(plan.nextDueAt),
    statusReason: plan.statusReason ?? null,
    evaluatedAt: iso(plan.evaluatedAt),
    starterKey: plan.starterKey ?? null,
    evaluation: plan.evaluation?.triggers ?? [],
    meterDue: plan.evaluation?.meterDue ?? [],
    openWorkOrder: open ? { id: open.id, number: Number(open.number), status: open.status } : null,
    timeZone: await shopTimeZone(em, who),
  };
}

export async function planLookups(em: EntityManager, who: Principal): Promise<PlanLookups> {
  const machines = await em.find(Machine, { active: true }, { orderBy: { code: 'asc' } });
  const meters = await em.find(Meter, {}, { orderBy: { code: 'asc' } });
  const parts = await em.find(PartType, { active: true }, { orderBy: { partNumber: 'asc' } });
  const people: { user_id: string; name: string; role: PlanLookups['people'][number]['role'] }[] = await em.execute(
    `select u.id as user_id, u.name, m.role from membership m join app_user u on u.id = m.user_id where m.organization_id = ? and m.active order by u.name`,
    [who.orgId],
  );
  return {
    machines: machines.map((m) => ({ id: m.id, code: m.code, name: m.name, kind: m.kind, parentId: m.parent?.id ?? null })),
    meters: meters.map((m) => ({ id: m.id, machineId: m.machine.id, code: m.code, name: m.name, kind: m.kind, unit: m.unit })),
    parts: parts.map((p) => ({ id: p.id, partNumber: p.partNumber, name: p.name, category: p.category, stockUnit: p.stockUnit, onHand: p.onHand })),
    people: people.map((p) => ({ userId: p.user_id, name: p.name, role: p.role })),
    timeZone: await shopTimeZone(em, who),
  };
}

// ---------------------------------------------------------------------------
// Starter plans
// ---------------------------------------------------------------------------

function starterSummary(s: StarterPlan): string {
  return s.triggers
    .map((t) => {
      switch (t.kind) {
        case 'calendar-fixed':
          return summarizeTrigger({ kind: 'calendar-fixed', rrule: t.rrule, start: `2000-01-01T${t.time}:00`, ical: '' }).replace(/ \(from .*\)$/, '');
        case 'calendar-floating':
          return summarizeTrigger(t);
        case 'meter':
          return `every ${t.every.toLocaleString('en-US')} ${t.meter.unit} (${t.meter.codes[0]})`;
        case 'condition':
          return `${t.meter.codes[0]} ${t.above !== undefined ? `above ${t.above}` : `below ${t.below}`} ${t.meter.unit}`;
        case 'oil-analysis':
          return 'an oil result outside targets';
      }
    })
    .join(', or ');
}

export function listStarters(): StarterView[] {
  return STARTER_PLANS.map((s) => ({
    key: s.key,
    title: s.title,
    machineKinds: s.machineKinds,
    summary: starterSummary(s),
    needsMeters: [...new Set(s.triggers.flatMap((t) => ('meter' in t ? [`${t.meter.codes[0]} (${t.meter.unit})`] : [])))],
    requiresLockout: s.requiresLockout,
    safetyCritical: s.safetyCritical,
  }));
}

function pickMeter(meters: MeterInfo[], want: StarterMeter, condition: boolean): MeterInfo | null {
  const fit = meters.filter((m) => (condition ? m.kind === 'condition' : m.kind !== 'condition'));
  for (const code of want.codes) {
    const byCode = fit.find((m) => m.code === code);
    if (byCode) return byCode;
  }
  const byUnit = fit.filter((m) => m.unit === want.unit);
  return byUnit.length === 1 ? byUnit[0] : null;
}

const kindLabel = (k: string) => MACHINE_KIND_LABELS[k as MachineKind]?.toLowerCase() ?? k;
const article = (w: string) => (/^[aeiou]/i.test(w) ? 'an' : 'a');

type StarterPick =
  | { ok: false; reason: string }
  /** `missing`: meters the machine lacks, for triggers that are left out (a calendar trigger remains). */
  | { ok: true; triggers: TriggerInput[]; missing: string[] };

/** One place decides whether a starter fits a machine, so the preview and the apply agree. */
function pickStarter(s: StarterPlan, machine: IMachine, meters: MeterInfo[], applied: Set<string | null | undefined>, today: string | null): StarterPick {
  if (!s.machineKinds.includes(machine.kind)) {
    const meant = s.machineKinds.map(kindLabel);
    return { ok: false, reason: `Meant for ${article(meant[0])} ${meant.join(' or ')}; ${machine.code} is ${article(kindLabel(machine.kind))} ${kindLabel(machine.kind)}` };
  }
  if (applied.has(s.key)) return { ok: false, reason: `Already applied to ${machine.code}` };
  const triggers: TriggerInput[] = [];
  const missing: string[] = [];
  for (const t of s.triggers) {
    if (t.kind === 'meter' || t.kind === 'condition') {
      const m = pickMeter(meters, t.meter, t.kind === 'condition');
      if (!m) {
        missing.push(`${t.meter.codes[0]} (${t.meter.unit})`);
        continue;
      }
      triggers.push(t.kind === 'meter' ? { kind: 'meter', meterId: m.id, every: t.every } : { kind: 'condition', meterId: m.id, above: t.above, below: t.below });
    } else if (t.kind === 'calendar-fixed') {
      triggers.push({ kind: 'calendar-fixed', start: `${today}T${t.time}`, rrule: t.rrule });
    } else {
      triggers.push(t);
    }
  }
  // A starter whose only triggers are missing meters cannot work; one with a calendar fallback still can.
  if (triggers.length === 0) return { ok: false, reason: `${machine.code} has no meter for ${missing.join(', ')}` };
  return { ok: true, triggers, missing };
}

/** Every starter with whether it fits this machine and why not, before anything is applied. */
export async function starterFits(em: EntityManager, machineId: string): Promise<StarterView[]> {
  const machine = await findMachine(em, machineId);
  const meters = await metersOf(em, await relatedMachineIds(em, machine));
  const existing = await em.find(MaintenancePlan, { machine: machine.id, active: true, starterKey: { $ne: null } }, { fields: ['starterKey'] });
  const applied = new Set(existing.map((p) => p.starterKey));
  const views = listStarters();
  return STARTER_PLANS.map((s, i) => {
    // The date only shapes a calendar trigger's start, which the preview does not show.
    const pick = pickStarter(s, machine, meters, applied, '2000-01-01');
    const fit: StarterFit = !pick.ok
      ? { status: 'no', reason: pick.reason }
      : pick.missing.length
        ? { status: 'partial', reason: `Without its ${pick.missing.join(', ')} trigger: ${machine.code} has no such meter` }
        : { status: 'fits', reason: null };
    return { ...views[i], fit };
  });
}

/**
 * Turns starters into plans on one machine, in one transaction; explains every starter it skips.
 * Fixed calendars start today (site time) unless `startDate` (YYYY-MM-DD) says otherwise.
 */
export async function applyStarters(em: EntityManager, who: Principal, input: ApplyStartersInput, opts: { startDate?: string } = {}): Promise<ApplyStartersResult> {
  return em.transactional(async (tx) => {
    const machine = await findMachine(tx, input.machineId);
    const tz = await shopTimeZone(tx, who);
    const meters = await metersOf(tx, await relatedMachineIds(tx, machine));
    const existing = await tx.find(MaintenancePlan, { machine: machine.id, active: true, starterKey: { $ne: null } }, { fields: ['starterKey'] });
    const have = new Set(existing.map((p) => p.starterKey));
    const today = opts.startDate ?? DateTime.fromMillis(clock.ms()).setZone(tz).toISODate();
    const result: ApplyStartersResult = { created: [], skipped: [] };
    for (const key of [...new Set(input.starterKeys)]) {
      const s = findStarter(key);
      if (!s) {
        result.skipped.push({ key, title: key, reason: 'No starter plan has this key' });
        continue;
      }
      const pick = pickStarter(s, machine, meters, have, today);
      if (!pick.ok) {
        result.skipped.push({ key, title: s.title, reason: pick.reason });
        continue;
      }
      const { triggers, missing } = pick;
      const parts: PlanInput['parts'] = [];
      for (const p of s.parts) {
        const part = await tx.findOne(PartType, { category: p.category, active: true }, { orderBy: { partNumber: 'asc' } });
        if (part) parts.push({ partTypeId: part.id, quantity: p.quantity });
      }
      const { id } = await createPlan(
        tx,
        who,
        {
          machineId: machine.id,
          title: s.title,
          instructions: s.instructions,
          checklist: s.checklist,
          estimatedMinutes: s.estimatedMinutes,
          parts,
          responsibleRole: s.responsibleRole,
          responsibleUserId: null,
          requiresLockout: s.requiresLockout,
          safetyCritical: s.safetyCritical,
          triggers,
          dueSoonDays: s.dueSoonDays,
          dueSoonFraction: s.dueSoonFraction,
          active: true,
        },
        { starterKey: s.key },
      );
      have.add(key);
      result.created.push({ key, planId: id, title: s.title });
      if (missing.length) result.skipped.push({ key, title: s.title, reason: `Created without its ${missing.join(', ')} trigger: ${machine.code} has no such meter` });
    }
    return result;
  });
}

export type { IMaintenancePlan };
