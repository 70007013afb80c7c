/** Reading work orders: the list with its filters and the detail page (with what stops a sign-off). */
import type { EntityManager } from '@mikro-orm/postgresql';
import { LockMode } from '@mikro-orm/core';
import { WorkOrder, WorkOrderAttachment, WorkOrderPart, type IWorkOrder } from './work-order.entity';
import { MaintenancePlan } from '../plans/plan.entity';
import { PartType } from '../stock/stock.entity';
import type { Principal } from '../../http/principal';
import { notFound } from '../../http/errors';
import {
  checklistBlockerText,
  type CloseBlocker,
  type DueFilter,
  type ListWorkOrdersQuery,
  type WorkOrderDetail,
  type WorkOrderRow,
  type WorkState,
} from '../../../shared/schemas/work-orders';
import type { Page } from '../../../shared/schemas/paging';
import { clock } from '../../../shared/clock';
import { executePrepared } from '../../db';

/** States in which work can still be done, re-planned or signed off. */
export const OPEN: WorkState[] = ['open', 'in-progress', 'on-hold'];
export const iso = (d: Date | null | undefined) => (d ? new Date(d).toISOString() : null);
const SOON_DAYS = 7;

/** Where a work order stands against its due point (list filter and badge). */
const dueStateSql = `case when w.status in ('done', 'cancelled') then 'closed'
  when w.overdue then 'overdue'
  when w.due_at is null then 'none'
  when w.due_at <= now() then 'due'
  when w.due_at <= now() + interval '${SOON_DAYS * 24} hours' then 'due-soon'
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
  const order = `${SORT_SQL[q.sort]} ${q.dir === 'desc' ? 'desc' : 'asc'} nulls last, w.number desc`;
  // The page's ids first (sorting only the columns the order needs), then the columns of those
  // rows alone; the total by itself, joined to the machine only when a filter asks about it (every
  // work order has one). Before, the whole filtered history was joined, counted with a window and
  // sorted with all its columns to return one page.
  const total = `select count(*) from work_order w${/\bm\./.test(where) ? ' join machine m on m.id = w.machine_id' : ''} where ${where}`;
  const rows: Row[] = await executePrepared(
    em,
    `select w.id, w.number, w.title, w.kind, w.status, w.due_at, ${dueStateSql} as due_state, w.overdue, m.id as machine_id, m.code, m.name as machine_name,
            w.plan_id, p.title as plan_title, w.assignee_id, u.name as assignee_name, w.responsible_role, w.requires_lockout, w.safety_critical,
            w.created_at, (${total}) as total
       from (select w.id from work_order w join machine m on m.id = w.machine_id where ${where} order by ${order} limit ? offset ?) page
       join work_order w on w.id = page.id
       join machine m on m.id = w.machine_id
       left join maintenance_plan p on p.id = w.plan_id
       left join app_user u on u.id = w.assignee_id
      order by ${order}`,
    [...params, ...params, q.pageSize, (q.page - 1) * q.pageSize],
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

/**
 * Milliseconds until any open work order of the shop changes its due state with nothing written
 * (it falls due, or comes within the due-soon window), or null when none will: a kept list is
 * dropped then. Measured against the database clock, as the list's due states are.
 */
export async function nextDueStateChangeInMs(em: EntityManager, orgId: string): Promise<number | null> {
  const [row] = await executePrepared<{ in_ms: number | null }>(
    em,
    `select (extract(epoch from min(v.t) - now()) * 1000)::float8 as in_ms
       from work_order w cross join lateral (values (w.due_at), (w.due_at - interval '${SOON_DAYS * 24} hours')) v(t)
      where w.organization_id = ? and w.status not in ('done', 'cancelled') and not w.overdue and w.due_at is not null and v.t > now()`,
    [orgId],
  );
  return row?.in_ms ?? null;
}

/** A work order of the caller's shop (row-locked for a change when `lock`), or 404. */
export async function findWorkOrder(em: EntityManager, id: string, lock = false): Promise<IWorkOrder> {
  const wo = await em.findOne(WorkOrder, { id }, lock ? { lockMode: LockMode.PESSIMISTIC_WRITE } : {});
  if (!wo) throw notFound('Work order');
  return wo;
}

async function lockoutRequired(em: EntityManager, wo: IWorkOrder): Promise<boolean> {
  if (wo.requiresLockout) return true;
  if (!wo.plan) return false;
  const plan = await em.findOne(MaintenancePlan, { id: wo.plan.id });
  return plan?.requiresLockout ?? false;
}

/** What stops this work order from being signed off; empty when it can be. */
export async function closeBlockers(em: EntityManager, wo: IWorkOrder): Promise<CloseBlocker[]> {
  const out: CloseBlocker[] = [];
  const unanswered = wo.checklist.filter((c) => c.result === null);
  if (unanswered.length) out.push({ code: 'checklist_incomplete', message: checklistBlockerText(unanswered, wo.checklist.length) });
  const noValue = wo.checklist.filter((c) => c.kind === 'measure' && c.result !== null && c.result !== 'na' && c.value === null);
  if (noValue.length) out.push({ code: 'measured_value_missing', message: `Measured values missing: ${noValue.map((c) => c.label).join('; ')}` });
  // A failed safety-critical check is not done work: it needs repair work raised or a signed deviation first.
  const failedSafety = wo.checklist.filter((c) => c.safetyCritical && c.result === 'fail' && !c.followUp);
  if (failedSafety.length)
    out.push({
      code: 'safety_check_failed',
      message: `Safety-critical check failed: ${failedSafety.map((c) => c.label).join('; ')}. Raise repair work (the machine goes out of service until it is done) or have the safety officer sign a deviation`,
    });
  if ((await lockoutRequired(em, wo)) && !wo.lockoutReleasedAt) {
    out.push({
      code: 'lockout_not_released',
      message: wo.lockoutSessionId
        ? 'The lockout for this work has not been released in the safety log yet'
        : 'This work needs a lockout: apply it and release it in the safety log before signing off',
    });
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
    plannedParts: wo.plannedParts.map((p) => ({
      ...p,
      partNumber: plannedOf.get(p.partTypeId)?.partNumber ?? '?',
      name: plannedOf.get(p.partTypeId)?.name ?? 'Removed part',
      stockUnit: plannedOf.get(p.partTypeId)?.stockUnit ?? '',
    })),
    partsUsed: parts.map((p) => {
      const part = p.partType.getEntity();
      return {
        id: p.id,
        partTypeId: part.id,
        partNumber: part.partNumber,
        name: part.name,
        category: part.category,
        quantity: p.quantity,
        stockUnit: part.stockUnit,
        at: p.createdAt.toISOString(),
        by: p.by?.getEntity().name ?? null,
      };
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
    stationRecord:
      wo.stationRecordType && wo.stationRecordId ? { type: wo.stationRecordType, id: wo.stationRecordId, summary: wo.stationRecordSummary ?? '' } : null,
    attachments: attachments.map((a) => ({
      id: a.id,
      fileName: a.fileName,
      mimeType: a.mimeType,
      size: a.size,
      at: a.createdAt.toISOString(),
      by: a.uploadedBy?.getEntity().name ?? null,
    })),
    history: history.map((h) => ({ at: new Date(h.created_at).toISOString(), action: h.action, who: h.name, details: h.details })),
    closeBlockers: OPEN.includes(wo.status) ? await closeBlockers(em, wo) : [],
  };
}
