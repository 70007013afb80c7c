import type { EntityManager } from '@mikro-orm/postgresql';
import { LockMode } from '@mikro-orm/core';
import { WorkOrder, WorkOrderAttachment, WorkOrderPart, NotifyPreference, type IWorkOrder } from './work-order.entity';
import { MaintenancePlan } from '../plans/plan.entity';
import { PartType } from '../stock/stock.entity';
import { Membership } from '../users/user.entity';
import { Organization } from '../organizations/organization.entity';
import { applyStockChanges } from '../stock/stock.service';
import type { Principal } from '../../http/principal';
import { badRequest, conflict, notFound } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import { allocateNumbers } from '../../jobs/due-engine';
import { loadPeople, queueRaisedNotices } from '../../jobs/due-engine-mail';
import { currentBaselines, refreshPlanStatus } from '../plans/plan-evaluation';
import { findMachine, shopTimeZone } from '../plans/plans.service';
import { WORK_STATE_LABELS } from '../../../shared/schemas/work-orders';
import type {
  ChecklistLine,
  ChecklistResultsInput,
  CloseWorkOrderInput,
  DueFilter,
  ListWorkOrdersQuery,
  MoveWorkOrderInput,
  NotifyPreference as NotifyPreferenceView,
  NotifyPreferenceInput,
  RaiseWorkOrderInput,
  UpdateWorkOrderInput,
  UsePartInput,
  WorkOrderDetail,
  WorkOrderRow,
  WorkState,
} from '../../../shared/schemas/work-orders';
import type { FieldErrors } from '../../../shared/schemas/common';
import { clock } from '../../../shared/clock';
import type { Page } from '../../../shared/schemas/paging';

const OPEN: WorkState[] = ['open', 'in-progress', 'on-hold'];
const iso = (d: Date | null | undefined) => (d ? new Date(d).toISOString() : null);
const SOON_DAYS = 7;

/** Where a work order stands against its due point (list filter and badge). */
const dueStateSql = `case when w.status in ('done', 'cancelled') then 'closed'
  when w.overdue then 'overdue'
  when w.due_at is null then 'none'
  when w.due_at <= now() then 'due'
  when w.due_at <= now() + interval '${SOON_DAYS} days' then 'due-soon'
  else 'later' end`;

export function dueStateOf(wo: Pick<IWorkOrder, 'status' | 'overdue' | 'dueAt'>, now = clock.now()): DueFilter | 'closed' {
  if (wo.status === 'done' || wo.status === 'cancelled') return 'closed';
  if (wo.overdue) return 'overdue';
  if (!wo.dueAt) return 'none';
  if (wo.dueAt.getTime() <= now.getTime()) return 'due';
  if (wo.dueAt.getTime() <= now.getTime() + SOON_DAYS * 86_400_000) return 'due-soon';
  return 'later';
}

const SORT_SQL: Record<ListWorkOrdersQuery['sort'], string> = {
  number: 'w.number',
  dueAt: 'w.due_at',
  status: `case w.status when 'in-progress' then 0 when 'open' then 1 when 'on-hold' then 2 when 'done' then 3 else 4 end`,
  machine: 'm.code',
  title: 'w.title',
  raisedAt: 'w.created_at',
};

type Row = {
  id: string;
  number: number;
  title: string;
  kind: WorkOrderRow['kind'];
  status: WorkState;
  due_at: Date | null;
  due_state: WorkOrderRow['dueState'];
  overdue: boolean;
  machine_id: string;
  code: string;
  machine_name: string;
  plan_id: string | null;
  plan_title: string | null;
  assignee_id: string | null;
  assignee_name: string | null;
  responsible_role: WorkOrderRow['responsibleRole'];
  requires_lockout: boolean;
  safety_critical: boolean;
  created_at: Date;
  total: string;
};

export async function listWorkOrders(em: EntityManager, who: Principal, q: ListWorkOrdersQuery): Promise<Page<WorkOrderRow>> {
  const params: unknown[] = [who.orgId];
  let where = 'w.organization_id = ?';
  if (q.machineId) {
    where += ' and (w.machine_id = ? or m.parent_id = ?)';
    params.push(q.machineId, q.machineId);
  }
  if (q.planId) {
    where += ' and w.plan_id = ?';
    params.push(q.planId);
  }
  if (q.assignee === 'me') {
    where += ' and (w.assignee_id = ? or (w.assignee_id is null and w.responsible_role = ?))';
    params.push(who.userId, who.role);
  } else if (q.assignee === 'unassigned') {
    where += ' and w.assignee_id is null';
  } else if (q.assignee) {
    where += ' and w.assignee_id = ?';
    params.push(q.assignee);
  }
  if (q.status === 'active') where += ` and w.status in ('open', 'in-progress', 'on-hold')`;
  else if (q.status) {
    where += ' and w.status = ?';
    params.push(q.status);
  }
  if (q.due) {
    where += ` and (${dueStateSql}) = ?`;
    params.push(q.due);
  }
  if (q.q) {
    where += ` and (w.title ilike ? or m.code ilike ? or m.name ilike ? or w.number::text = ?)`;
    params.push(`%${q.q}%`, `%${q.q}%`, `%${q.q}%`, q.q.replace(/^wo\s*/i, ''));
  }
  const rows: Row[] = await em.execute(
    `select w.id, w.number, w.title, w.kind, w.status, w.due_at, ${dueStateSql} as due_state, w.overdue, m.id as machine_id, m.code, m.name as machine_name,
            w.plan_id, p.title as plan_title, w.assignee_id, u.name as assignee_name, w.responsible_role, w.requires_lockout, w.safety_critical,
            w.created_at, count(*) over () as total
       from work_order w join machine m on m.id = w.machine_id
       left join maintenance_plan p on p.id = w.plan_id
       left join app_user u on u.id = w.assignee_id
      where ${where}
      order by ${SORT_SQL[q.sort]} ${q.dir === 'desc' ? 'desc' : 'asc'} nulls last, w.number desc
      limit ? offset ?`,
    [...params, q.pageSize, (q.page - 1) * q.pageSize],
  );
  return {
    rows: rows.map((r) => ({
      id: r.id,
      number: Number(r.number),
      title: r.title,
      kind: r.kind,
      status: r.status,
      dueAt: iso(r.due_at),
      dueState: r.due_state,
      overdue: r.overdue,
      machine: { id: r.machine_id, code: r.code, name: r.machine_name },
      plan: r.plan_id ? { id: r.plan_id, title: r.plan_title ?? '' } : null,
      assignee: r.assignee_id ? { id: r.assignee_id, name: r.assignee_name ?? '' } : null,
      responsibleRole: r.responsible_role,
      requiresLockout: r.requires_lockout,
      safetyCritical: r.safety_critical,
      raisedAt: iso(r.created_at)!,
    })),
    total: rows[0] ? Number(rows[0].total) : 0,
    page: q.page,
    pageSize: q.pageSize,
  };
}

async function findWorkOrder(em: EntityManager, id: string, lock = false): Promise<IWorkOrder> {
  const wo = await em.findOne(WorkOrder, { id }, lock ? { lockMode: LockMode.PESSIMISTIC_WRITE } : {});
  if (!wo) throw notFound('Work order');
  return wo;
}

function mustBeOpen(wo: IWorkOrder, doing: string) {
  if (!OPEN.includes(wo.status)) throw conflict(`WO ${wo.number} is ${WORK_STATE_LABELS[wo.status as WorkState]}; it cannot ${doing} any more`);
}

async function lockoutRequired(em: EntityManager, wo: IWorkOrder): Promise<boolean> {
  if (wo.requiresLockout) return true;
  if (!wo.plan) return false;
  const plan = await em.findOne(MaintenancePlan, { id: wo.plan.id });
  return plan?.requiresLockout ?? false;
}

/** What stops this work order from being signed off; empty when it can be. */
export async function closeBlockers(em: EntityManager, wo: IWorkOrder): Promise<string[]> {
  const out: string[] = [];
  const unanswered = wo.checklist.filter((c) => c.result === null);
  if (unanswered.length) out.push(`${unanswered.length} of ${wo.checklist.length} checklist lines have no answer: ${unanswered.map((c) => c.label).join('; ')}`);
  const noValue = wo.checklist.filter((c) => c.kind === 'measure' && c.result !== null && c.result !== 'na' && c.value === null);
  if (noValue.length) out.push(`Measured values missing: ${noValue.map((c) => c.label).join('; ')}`);
  if ((await lockoutRequired(em, wo)) && !wo.lockoutReleasedAt) {
    out.push(wo.lockoutSessionId ? 'The lockout for this work has not been released in the safety log yet' : 'This work needs a lockout: apply it and release it in the safety log before signing off');
  }
  return out;
}

export async function getWorkOrder(em: EntityManager, who: Principal, id: string): Promise<WorkOrderDetail> {
  const wo = await em.findOne(WorkOrder, { id }, { populate: ['machine', 'plan', 'assignee', 'raisedBy', 'completedBy'] });
  if (!wo) throw notFound('Work order');
  const parts = await em.find(WorkOrderPart, { workOrder: wo.id }, { populate: ['partType', 'by'], orderBy: { createdAt: 'asc' } });
  const attachments = await em.find(WorkOrderAttachment, { workOrder: wo.id }, { populate: ['uploadedBy'], orderBy: { createdAt: 'asc' } });
  const planned = wo.plannedParts.length ? await em.find(PartType, { id: { $in: wo.plannedParts.map((p) => p.partTypeId) } }) : [];
  const plannedOf = new Map(planned.map((p) => [p.id, p]));
  const history: { created_at: Date; action: string; name: string | null; details: Record<string, unknown> | null }[] = await em.execute(
    `select a.created_at, a.action, u.name, a.details from audit_event a left join app_user u on u.id = a.actor_id
      where a.organization_id = ? and a.entity_type = 'WorkOrder' and a.entity_id = ? order by a.created_at`,
    [who.orgId, wo.id],
  );
  const machine = wo.machine.getEntity();
  const plan = wo.plan?.getEntity() ?? null;
  return {
    id: wo.id,
    number: wo.number,
    title: wo.title,
    instructions: wo.instructions,
    kind: wo.kind,
    status: wo.status,
    reason: wo.reason ?? null,
    machine: { id: machine.id, code: machine.code, name: machine.name, kind: machine.kind },
    plan: plan ? { id: plan.id, title: plan.title, nextDueAt: iso(plan.nextDueAt), status: plan.status } : null,
    occurrenceKey: wo.occurrenceKey ?? null,
    dueAt: iso(wo.dueAt),
    dueState: dueStateOf(wo),
    overdue: wo.overdue,
    raisedAt: wo.createdAt.toISOString(),
    raisedBy: wo.raisedBy ? { id: wo.raisedBy.id, name: wo.raisedBy.getEntity().name } : null,
    assignee: wo.assignee ? { id: wo.assignee.id, name: wo.assignee.getEntity().name } : null,
    responsibleRole: wo.responsibleRole ?? null,
    requiresLockout: await lockoutRequired(em, wo),
    safetyCritical: wo.safetyCritical,
    lockoutSessionId: wo.lockoutSessionId ?? null,
    lockoutReleasedAt: iso(wo.lockoutReleasedAt),
    checklist: wo.checklist,
    plannedParts: wo.plannedParts.map((p) => ({ ...p, partNumber: plannedOf.get(p.partTypeId)?.partNumber ?? '?', name: plannedOf.get(p.partTypeId)?.name ?? 'Removed part', stockUnit: plannedOf.get(p.partTypeId)?.stockUnit ?? '' })),
    partsUsed: parts.map((p) => {
      const part = p.partType.getEntity();
      return { id: p.id, partTypeId: part.id, partNumber: part.partNumber, name: part.name, category: part.category, quantity: p.quantity, stockUnit: part.stockUnit, at: p.createdAt.toISOString(), by: p.by?.getEntity().name ?? null };
    }),
    labourMinutes: wo.labourMinutes,
    notes: wo.notes,
    estimatedMinutes: wo.estimatedMinutes ?? null,
    startedAt: iso(wo.startedAt),
    holdReason: wo.holdReason ?? null,
    completedAt: iso(wo.completedAt),
    completedBy: wo.completedBy ? { id: wo.completedBy.id, name: wo.completedBy.getEntity().name } : null,
    cancelledAt: iso(wo.cancelledAt),
    cancelReason: wo.cancelReason ?? null,
    attachments: attachments.map((a) => ({ id: a.id, fileName: a.fileName, mimeType: a.mimeType, size: a.size, at: a.createdAt.toISOString(), by: a.uploadedBy?.getEntity().name ?? null })),
    history: history.map((h) => ({ at: new Date(h.created_at).toISOString(), action: h.action, who: h.name, details: h.details })),
    closeBlockers: OPEN.includes(wo.status) ? await closeBlockers(em, wo) : [],
  };
}

async function checkAssignee(em: EntityManager, who: Principal, assigneeId: string | null | undefined) {
  if (!assigneeId) return;
  const m = await em.findOne(Membership, { user: assigneeId, organization: who.orgId, active: true }, { filters: false });
  if (!m) throw badRequest('The assignee is not an active member of this shop', [{ path: 'assigneeId', message: 'Not an active member of this shop' }]);
}

/** Repair work raised by hand (an operator reporting a fault, a technician finding one). */
export async function raiseWorkOrder(em: EntityManager, who: Principal, input: RaiseWorkOrderInput, appUrl: string): Promise<{ id: string; number: number }> {
  return em.transactional(async (tx) => {
    const machine = await findMachine(tx, input.machineId);
    await checkAssignee(tx, who, input.assigneeId);
    const number = await allocateNumbers(tx, who.orgId, 1);
    const wo = tx.create(WorkOrder, {
      organization: who.orgId,
      number,
      machine,
      kind: 'corrective',
      title: input.title,
      instructions: input.instructions,
      reason: `Reported by ${who.name}`,
      dueAt: input.dueAt ? new Date(input.dueAt) : null,
      assignee: input.assigneeId,
      responsibleRole: input.responsibleRole,
      raisedBy: who.userId,
      requiresLockout: input.requiresLockout,
      safetyCritical: input.safetyCritical,
      checklist: [],
      plannedParts: [],
      // Told below, in this transaction.
      notifiedAt: clock.now(),
    });
    recordActivity(tx, who, 'work-order.raised', { type: 'WorkOrder', id: wo.id }, { number, kind: 'corrective', title: input.title });
    const org = await tx.findOneOrFail(Organization, who.orgId);
    const people = (await loadPeople(tx, who.orgId)).filter((p) => p.userId !== who.userId);
    queueRaisedNotices(
      tx,
      { orgId: who.orgId, orgName: org.name, timeZone: org.timeZone, appUrl },
      [
        {
          id: wo.id,
          number,
          title: wo.title,
          machineCode: machine.code,
          machineName: machine.name,
          dueAt: wo.dueAt ?? null,
          overdue: false,
          safetyCritical: wo.safetyCritical,
          requiresLockout: wo.requiresLockout,
          assigneeId: input.assigneeId,
          responsibleRole: input.responsibleRole,
          reason: `${who.name} reported it`,
        },
      ],
      people,
    );
    return { id: wo.id, number };
  });
}

export async function updateWorkOrder(em: EntityManager, who: Principal, id: string, input: UpdateWorkOrderInput): Promise<void> {
  await em.transactional(async (tx) => {
    const wo = await findWorkOrder(tx, id, true);
    if (input.assigneeId !== undefined || input.dueAt !== undefined || input.requiresLockout !== undefined) mustBeOpen(wo, 'be re-planned');
    await checkAssignee(tx, who, input.assigneeId);
    const before = { assignee: wo.assignee?.id ?? null, dueAt: iso(wo.dueAt), labourMinutes: wo.labourMinutes };
    if (input.assigneeId !== undefined) wo.assignee = input.assigneeId as never;
    if (input.dueAt !== undefined) {
      wo.dueAt = input.dueAt ? new Date(input.dueAt) : null;
      // A new due date is a new promise: the work is not past due until the engine says so again.
      wo.overdue = false;
      wo.escalatedAt = null;
    }
    if (input.labourMinutes !== undefined) wo.labourMinutes = input.labourMinutes;
    if (input.notes !== undefined) wo.notes = input.notes;
    if (input.requiresLockout !== undefined) wo.requiresLockout = input.requiresLockout;
    recordActivity(tx, who, 'work-order.updated', { type: 'WorkOrder', id: wo.id }, { before, after: input });
  });
}

/**
 * Completion (or calling off) of a plan's work restarts its cycle: floating schedules and meter
 * intervals count from now, and the plan's status is evaluated again at once.
 */
async function restartPlanCycle(tx: EntityManager, who: Principal, wo: IWorkOrder, at: Date) {
  if (!wo.plan) return;
  const plan = await tx.findOne(MaintenancePlan, { id: wo.plan.id }, { lockMode: LockMode.PESSIMISTIC_WRITE });
  if (!plan) return;
  if (plan.lastDoneAt && plan.lastDoneAt.getTime() >= at.getTime()) return;
  plan.lastDoneAt = at;
  const meterIds = plan.triggers.filter((t) => t.kind === 'meter').map((t) => (t as { meterId: string }).meterId);
  plan.meterBaselines = { ...plan.meterBaselines, ...(await currentBaselines(tx, meterIds)) };
  await refreshPlanStatus(tx, plan, await shopTimeZone(tx, who), at);
}

const MOVES: Record<MoveWorkOrderInput['move'], { from: WorkState[]; to: WorkState }> = {
  start: { from: ['open', 'on-hold'], to: 'in-progress' },
  pause: { from: ['open', 'in-progress'], to: 'on-hold' },
  resume: { from: ['on-hold'], to: 'in-progress' },
  cancel: { from: ['open', 'in-progress', 'on-hold'], to: 'cancelled' },
};

export async function moveWorkOrder(em: EntityManager, who: Principal, id: string, input: MoveWorkOrderInput): Promise<void> {
  await em.transactional(async (tx) => {
    const wo = await findWorkOrder(tx, id, true);
    const m = MOVES[input.move];
    if (!m.from.includes(wo.status)) {
      throw conflict(`WO ${wo.number} is ${WORK_STATE_LABELS[wo.status as WorkState]}; “${input.move}” only applies to work that is ${m.from.map((s) => WORK_STATE_LABELS[s]).join(' or ')}`);
    }
    const now = clock.now();
    const from = wo.status;
    wo.status = m.to;
    if (input.move === 'start' || input.move === 'resume') {
      wo.startedAt ??= now;
      wo.holdReason = null;
    }
    if (input.move === 'pause') wo.holdReason = input.reason ?? null;
    if (input.move === 'cancel') {
      wo.cancelledAt = now;
      wo.cancelReason = input.reason ?? null;
      // Calling off planned work skips this occurrence; the plan schedules the next one.
      await restartPlanCycle(tx, who, wo, now);
    }
    recordActivity(tx, who, `work-order.${input.move}`, { type: 'WorkOrder', id: wo.id }, { from, to: wo.status, ...(input.reason ? { reason: input.reason } : {}) });
  });
}

/** Saves checklist answers (some or all lines). A measured value outside its limits cannot be marked OK. */
export async function saveChecklist(em: EntityManager, who: Principal, id: string, input: ChecklistResultsInput): Promise<ChecklistLine[]> {
  return em.transactional(async (tx) => {
    const wo = await findWorkOrder(tx, id, true);
    mustBeOpen(wo, 'take checklist answers');
    const errors: FieldErrors = [];
    const lines = wo.checklist.map((c) => ({ ...c }));
    input.results.forEach((r, i) => {
      const line = lines.find((l) => l.key === r.key);
      if (!line) {
        errors.push({ path: `results.${i}.key`, message: `This work order has no checklist line “${r.key}”` });
        return;
      }
      if (line.kind === 'measure' && r.value !== null) {
        const low = line.min !== undefined && r.value < line.min;
        const high = line.max !== undefined && r.value > line.max;
        if ((low || high) && r.result === 'pass') {
          errors.push({ path: `results.${i}.result`, message: `${r.value} ${line.unit ?? ''} is outside ${line.min ?? '−∞'}…${line.max ?? '∞'} ${line.unit ?? ''}: mark “${line.label}” Not OK`.replace(/\s+/g, ' ') });
          return;
        }
      }
      line.result = r.result;
      line.value = line.kind === 'measure' ? r.value : null;
      line.note = r.note;
    });
    if (errors.length) throw badRequest(`Checklist not saved: ${errors.map((e) => e.message).join('; ')}`, errors);
    wo.checklist = lines;
    if (wo.status === 'open') {
      wo.status = 'in-progress';
      wo.startedAt ??= clock.now();
    }
    recordActivity(tx, who, 'work-order.checklist', { type: 'WorkOrder', id: wo.id }, { answered: lines.filter((l) => l.result !== null).length, of: lines.length });
    return lines;
  });
}

/** Takes parts (or oil, grease) from stock for the work; all or nothing, never below zero. */
export async function usePart(em: EntityManager, who: Principal, id: string, input: UsePartInput): Promise<{ id: string }> {
  return em.transactional(async (tx) => {
    const wo = await findWorkOrder(tx, id, true);
    mustBeOpen(wo, 'take parts');
    const [move] = await applyStockChanges(tx, who, [
      { partTypeId: input.partTypeId, quantity: -input.quantity, kind: 'used', reason: `WO ${wo.number}: ${wo.title}`.slice(0, 300), ref: { type: 'WorkOrder', id: wo.id } },
    ]);
    const line = tx.create(WorkOrderPart, { organization: who.orgId, workOrder: wo, partType: input.partTypeId, quantity: input.quantity, stockMove: move, by: who.userId });
    recordActivity(tx, who, 'work-order.part-used', { type: 'WorkOrder', id: wo.id }, { partTypeId: input.partTypeId, quantity: input.quantity });
    return { id: line.id };
  });
}

/** Puts a part line back into stock (taken by mistake). */
export async function returnPart(em: EntityManager, who: Principal, id: string, lineId: string): Promise<void> {
  await em.transactional(async (tx) => {
    const wo = await findWorkOrder(tx, id, true);
    mustBeOpen(wo, 'return parts');
    const line = await tx.findOne(WorkOrderPart, { id: lineId, workOrder: wo.id });
    if (!line) throw notFound('Part line');
    await applyStockChanges(tx, who, [{ partTypeId: line.partType.id, quantity: line.quantity, kind: 'adjusted', reason: `Returned from WO ${wo.number}`, ref: { type: 'WorkOrder', id: wo.id } }]);
    recordActivity(tx, who, 'work-order.part-returned', { type: 'WorkOrder', id: wo.id }, { partTypeId: line.partType.id, quantity: line.quantity });
    tx.remove(line);
  });
}

/** Signs the work off. Needs a complete checklist and, where lockout is required, its release. */
export async function closeWorkOrder(em: EntityManager, who: Principal, id: string, input: CloseWorkOrderInput): Promise<{ planNextDueAt: string | null }> {
  return em.transactional(async (tx) => {
    const wo = await findWorkOrder(tx, id, true);
    mustBeOpen(wo, 'be signed off');
    if (input.labourMinutes !== undefined) wo.labourMinutes = input.labourMinutes;
    if (input.notes !== undefined) wo.notes = input.notes;
    const blockers = await closeBlockers(tx, wo);
    if (blockers.length) {
      const fields: FieldErrors = [];
      wo.checklist.forEach((c, i) => {
        if (c.result === null) fields.push({ path: `checklist.${i}`, message: `“${c.label}” has no answer` });
      });
      throw conflict(`WO ${wo.number} cannot be signed off yet: ${blockers.join('. ')}`, fields.length ? fields : undefined);
    }
    const now = clock.now();
    wo.status = 'done';
    wo.completedAt = now;
    wo.completedBy = who.userId as never;
    await restartPlanCycle(tx, who, wo, now);
    recordActivity(tx, who, 'work-order.closed', { type: 'WorkOrder', id: wo.id }, { labourMinutes: wo.labourMinutes, failed: wo.checklist.filter((c) => c.result === 'fail').map((c) => c.key) });
    await tx.flush();
    const plan = wo.plan ? await tx.findOne(MaintenancePlan, { id: wo.plan.id }) : null;
    return { planNextDueAt: iso(plan?.nextDueAt) };
  });
}

// ---------------------------------------------------------------------------
// Attachments
// ---------------------------------------------------------------------------

export async function addAttachment(em: EntityManager, who: Principal, id: string, file: { name: string; mime: string; data: Buffer }): Promise<{ id: string }> {
  return em.transactional(async (tx) => {
    const wo = await findWorkOrder(tx, id);
    const a = tx.create(WorkOrderAttachment, {
      organization: who.orgId,
      workOrder: wo,
      fileName: file.name.replace(/[^\w.\- ()]+/g, '_').slice(0, 200) || 'file',
      mimeType: file.mime,
      size: file.data.length,
      data: file.data,
      uploadedBy: who.userId,
    });
    recordActivity(tx, who, 'work-order.attachment', { type: 'WorkOrder', id: wo.id }, { fileName: a.fileName, size: a.size, mimeType: a.mimeType });
    return { id: a.id };
  });
}

export async function getAttachment(em: EntityManager, workOrderId: string, attachmentId: string) {
  const a = await em.findOne(WorkOrderAttachment, { id: attachmentId, workOrder: workOrderId }, { populate: ['data'] });
  if (!a) throw notFound('Attachment');
  return { fileName: a.fileName, mimeType: a.mimeType, data: Buffer.from(a.data.unwrap() as Uint8Array) };
}

// ---------------------------------------------------------------------------
// Notice preference
// ---------------------------------------------------------------------------

export async function getNotifyPreference(em: EntityManager, who: Principal): Promise<NotifyPreferenceView> {
  const p = await em.findOne(NotifyPreference, { user: who.userId });
  return { mode: p?.mode ?? 'immediate', digestHour: p?.digestHour ?? 6, timeZone: await shopTimeZone(em, who) };
}

export async function setNotifyPreference(em: EntityManager, who: Principal, input: NotifyPreferenceInput): Promise<NotifyPreferenceView> {
  await em.transactional(async (tx) => {
    const p = await tx.findOne(NotifyPreference, { user: who.userId });
    if (p) {
      p.mode = input.mode;
      p.digestHour = input.digestHour;
    } else {
      tx.create(NotifyPreference, { organization: who.orgId, user: who.userId, mode: input.mode, digestHour: input.digestHour });
    }
    recordActivity(tx, who, 'notices.preference', { type: 'User', id: who.userId }, input);
  });
  return getNotifyPreference(em, who);
}
