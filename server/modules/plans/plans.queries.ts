/** Reading plans: the list with its filters, the detail page and the form's lookups. */
import type { EntityManager } from '@mikro-orm/postgresql';
import { MaintenancePlan } from './plan.entity';
import { Machine } from '../machines/machine.entity';
import { Meter } from '../meters/meter.entity';
import { PartType } from '../stock/stock.entity';
import type { Principal } from '../../http/principal';
import { notFound } from '../../http/errors';
import { summarizeTrigger, summarizeTriggers } from '../../../shared/domain/plan-summary';
import { ROLE_LABELS } from '../../../shared/permissions';
import type { Page } from '../../../shared/schemas/paging';
import {
  stationRecordSummary,
  type DueState,
  type ListPlansQuery,
  type PlanDetail,
  type PlanLookups,
  type PlanRow,
  type StoredTrigger,
} from '../../../shared/schemas/plans';

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
  const rule = plan.stationRecord ?? null;
  const labels = await meterLabels(em, [
    ...plan.triggers.flatMap((t) => ('meterId' in t ? [t.meterId] : [])),
    ...(rule?.kind === 'counter-reading' ? [rule.meterId] : []),
  ]);
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
    parts: plan.parts.map((p) => ({
      ...p,
      partNumber: partOf.get(p.partTypeId)?.partNumber ?? '?',
      name: partOf.get(p.partTypeId)?.name ?? 'Removed part',
      stockUnit: partOf.get(p.partTypeId)?.stockUnit ?? '',
    })),
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
    stationRecord: rule ? { ...rule, summary: stationRecordSummary(rule, rule.kind === 'counter-reading' ? labels.get(rule.meterId)?.name : undefined) } : null,
    evaluation: plan.evaluation?.triggers ?? [],
    meterDue: plan.evaluation?.meterDue ?? [],
    openWorkOrder: open ? { id: open.id, number: Number(open.number), status: open.status } : null,
    timeZone: who.timeZone,
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
    timeZone: who.timeZone,
  };
}
