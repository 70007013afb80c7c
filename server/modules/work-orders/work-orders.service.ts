/** Changing work orders: raising by hand, re-planning, moving through states, checklist answers, parts, sign-off. */
import type { EntityManager } from '@mikro-orm/postgresql';
import { LockMode } from '@mikro-orm/core';
import { WorkOrderPart, type IWorkOrder } from './work-order.entity';
import { MaintenancePlan } from '../plans/plan.entity';
import { Membership, User } from '../users/user.entity';
import { applyStockChanges } from '../stock/stock.service';
import type { Principal } from '../../http/principal';
import { AppError, badRequest, conflict, fieldError, notFound } from '../../http/errors';
import { appendSignOff, confirmSignature } from '../safety/chain';
import { recordActivity } from '../activity-log/activity-log.service';
import { currentBaselines, refreshPlanStatus } from '../plans/plan-evaluation';
import { findMachine } from '../plans/plans.service';
import { loadShop, loadWorkRows, raiseWorkOrders } from './raise-work-orders';
import { loadPeople, queueAssignedNotice, workLine } from './work-order-mail';
import { returnToServiceOnWorkDone } from '../machines/machine-state.service';
import { OPEN, closeBlockers, findWorkOrder, iso } from './work-orders.queries';
import { WORK_STATE_LABELS } from '../../../shared/schemas/work-orders';
import type {
  ChecklistLine,
  ChecklistResultsInput,
  CloseWorkOrderInput,
  MoveWorkOrderInput,
  RaiseWorkOrderInput,
  UpdateWorkOrderInput,
  UsePartInput,
  WorkState,
} from '../../../shared/schemas/work-orders';
import type { FieldErrors } from '../../../shared/schemas/common';
import { clock } from '../../../shared/clock';

function mustBeOpen(wo: IWorkOrder, doing: string) {
  if (!OPEN.includes(wo.status)) throw conflict(`WO ${wo.number} is ${WORK_STATE_LABELS[wo.status as WorkState]}; it cannot ${doing} any more`);
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
    const [wo] = await raiseWorkOrders(
      tx,
      who.orgId,
      who,
      [
        {
          standalone: {
            machineId: machine.id,
            kind: 'corrective',
            title: input.title,
            instructions: input.instructions,
            reason: `Reported by ${who.name}`,
            dueAt: input.dueAt ? new Date(input.dueAt) : null,
            assigneeId: input.assigneeId ?? null,
            responsibleRole: input.responsibleRole ?? null,
            requiresLockout: input.requiresLockout,
            safetyCritical: input.safetyCritical,
            raisedById: who.userId,
            auditDetails: { title: input.title },
          },
        },
      ],
      // The reporter knows already; everyone else responsible is told in this transaction.
      { mode: 'now', appUrl, reason: `${who.name} reported it`, skipUserId: who.userId },
    );
    return { id: wo.id, number: wo.number };
  });
}

/** Tells the newly named person about the work, in the caller's transaction (not when they named themselves). */
async function tellNewAssignee(tx: EntityManager, who: Principal, workOrderId: string, assigneeId: string, appUrl: string) {
  if (assigneeId === who.userId) return;
  const person = (await loadPeople(tx, who.orgId)).find((p) => p.userId === assigneeId);
  if (!person) return;
  const [row] = await loadWorkRows(tx, [workOrderId]);
  queueAssignedNotice(tx, await loadShop(tx, who.orgId, appUrl), workLine(row, row.overdue), person, who.name);
}

export async function updateWorkOrder(em: EntityManager, who: Principal, id: string, input: UpdateWorkOrderInput, appUrl: string): Promise<void> {
  await em.transactional(async (tx) => {
    const wo = await findWorkOrder(tx, id, true);
    if (input.assigneeId !== undefined || input.dueAt !== undefined || input.requiresLockout !== undefined) mustBeOpen(wo, 'be re-planned');
    await checkAssignee(tx, who, input.assigneeId);
    const before = { assignee: wo.assignee?.id ?? null, dueAt: iso(wo.dueAt), labourMinutes: wo.labourMinutes };
    if (input.assigneeId !== undefined) wo.assignee = input.assigneeId ? tx.getReference(User, input.assigneeId, { wrapped: true }) : null;
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
    if (input.assigneeId && input.assigneeId !== before.assignee) {
      await tx.flush();
      await tellNewAssignee(tx, who, wo.id, input.assigneeId, appUrl);
    }
  });
}

/**
 * Completion (or calling off) of a plan's work restarts its cycle: floating schedules and meter
 * intervals count from now, and the plan's status is evaluated again at once.
 */
export async function restartPlanCycle(tx: EntityManager, who: Principal, planId: string | undefined, at: Date) {
  if (!planId) return;
  const plan = await tx.findOne(MaintenancePlan, { id: planId }, { lockMode: LockMode.PESSIMISTIC_WRITE });
  if (!plan) return;
  if (plan.lastDoneAt && plan.lastDoneAt.getTime() >= at.getTime()) return;
  plan.lastDoneAt = at;
  const meterIds = plan.triggers.filter((t) => t.kind === 'meter').map((t) => (t as { meterId: string }).meterId);
  plan.meterBaselines = { ...plan.meterBaselines, ...(await currentBaselines(tx, meterIds)) };
  await refreshPlanStatus(tx, plan, who.timeZone, at);
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
      throw conflict(
        `WO ${wo.number} is ${WORK_STATE_LABELS[wo.status as WorkState]}; “${input.move}” only applies to work that is ${m.from.map((s) => WORK_STATE_LABELS[s]).join(' or ')}`,
      );
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
      await restartPlanCycle(tx, who, wo.plan?.id, now);
    }
    recordActivity(
      tx,
      who,
      `work-order.${input.move}`,
      { type: 'WorkOrder', id: wo.id },
      { from, to: wo.status, ...(input.reason ? { reason: input.reason } : {}) },
    );
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
          errors.push({
            path: `results.${i}.result`,
            message: `${r.value} ${line.unit ?? ''} is outside ${line.min ?? '−∞'}…${line.max ?? '∞'} ${line.unit ?? ''}: mark “${line.label}” Not OK`.replace(
              /\s+/g,
              ' ',
            ),
          });
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
    recordActivity(
      tx,
      who,
      'work-order.checklist',
      { type: 'WorkOrder', id: wo.id },
      { answered: lines.filter((l) => l.result !== null).length, of: lines.length },
    );
    return lines;
  });
}

/** Takes parts (or oil, grease) from stock for the work; all or nothing, never below zero. */
export async function usePart(em: EntityManager, who: Principal, id: string, input: UsePartInput): Promise<{ id: string }> {
  return em.transactional(async (tx) => {
    const wo = await findWorkOrder(tx, id, true);
    mustBeOpen(wo, 'take parts');
    const [move] = await applyStockChanges(tx, who, [
      {
        partTypeId: input.partTypeId,
        quantity: -input.quantity,
        kind: 'used',
        reason: `WO ${wo.number}: ${wo.title}`.slice(0, 300),
        ref: { type: 'WorkOrder', id: wo.id },
      },
    ]);
    const line = tx.create(WorkOrderPart, {
      organization: who.orgId,
      workOrder: wo,
      partType: input.partTypeId,
      quantity: input.quantity,
      stockMove: move,
      by: who.userId,
    });
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
    await applyStockChanges(tx, who, [
      {
        partTypeId: line.partType.id,
        quantity: line.quantity,
        kind: 'adjusted',
        reason: `Returned from WO ${wo.number}`,
        ref: { type: 'WorkOrder', id: wo.id },
      },
    ]);
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
      const message = `WO ${wo.number} cannot be signed off yet: ${blockers.map((b) => b.message).join('. ')}`;
      const code = blockers.some((b) => b.code === 'checklist_incomplete') ? 'checklist_incomplete' : 'conflict';
      throw new AppError(409, code, message, fields.length ? fields : undefined);
    }
    const now = clock.now();
    wo.status = 'done';
    wo.completedAt = now;
    wo.completedBy = tx.getReference(User, who.userId, { wrapped: true });
    if (wo.safetyCritical) {
      // Safety work is signed like the safety log's other records: password again, into the signed chain.
      if (!input.password) throw fieldError('password', 'Safety work is signed with your password: enter it to sign off');
      await confirmSignature(tx, who, input.password);
      const failed = wo.checklist.filter((c) => c.result === 'fail');
      await appendSignOff(
        tx,
        who,
        {
          meaning: 'safety-work-signed-off',
          subjectType: 'WorkOrder',
          subjectId: wo.id,
          machineId: wo.machine.id,
          details: {
            summary: `WO ${wo.number} signed off: ${wo.title}`,
            workOrder: wo.number,
            checklist: wo.checklist.map((c) => ({ key: c.key, result: c.result, value: c.value, followUp: c.followUp?.kind ?? null })),
            failed: failed.map((c) => c.key),
          },
          note: input.notes ?? null,
        },
        now,
      );
    }
    await restartPlanCycle(tx, who, wo.plan?.id, now);
    // A repair that ends a stop puts its machine back in service, signed by the same person.
    await returnToServiceOnWorkDone(tx, who, wo.id);
    recordActivity(
      tx,
      who,
      'work-order.closed',
      { type: 'WorkOrder', id: wo.id },
      { labourMinutes: wo.labourMinutes, failed: wo.checklist.filter((c) => c.result === 'fail').map((c) => c.key) },
    );
    await tx.flush();
    const plan = wo.plan ? await tx.findOne(MaintenancePlan, { id: wo.plan.id }) : null;
    return { planNextDueAt: iso(plan?.nextDueAt) };
  });
}
