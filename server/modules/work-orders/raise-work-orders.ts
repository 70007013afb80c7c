/**
 * The one way a work order comes into being. People reporting work (work-orders.service.ts), an
 * oil sample outside its targets (oil-analysis.service.ts) and the scheduled pass raising due plan
 * work (server/jobs) all call `raiseWorkOrders`: it hands out the shop's numbers, writes every row
 * with one statement (a pass raises thousands), records each raise in the audit log and tells the
 * people responsible, now or through the pass's notice step.
 */
import { randomUUID } from 'node:crypto';
import type { EntityManager } from '@mikro-orm/postgresql';
import type { Role } from '../../../shared/permissions';
import type { WorkKind } from '../../../shared/schemas/work-orders';
import { executeBound, uuidArray } from '../../db';
import { insertActivityRows, recordActivity, type ActivityRow } from '../activity-log/activity-log.service';
import { loadPeople, queueRaisedNotices, workLine, type Person, type WorkLine, type WorkRow } from './work-order-mail';
import { clock } from '../../../shared/clock';

/** One due occurrence of a plan: the work copies the plan's title, instructions, checklist, parts and responsibility. */
export type PlanOccurrenceWork = {
  planId: string;
  occurrenceKey: string;
  kind: 'scheduled' | 'condition';
  reason: string;
  dueAt: Date;
};

/** Work not raised from a plan: everything it says is given here. */
export type StandaloneWork = {
  machineId: string;
  kind: WorkKind;
  title: string;
  instructions: string;
  reason: string;
  dueAt: Date | null;
  assigneeId: string | null;
  responsibleRole: Role | null;
  requiresLockout: boolean;
  safetyCritical: boolean;
  /** The person who reported it, shown on the work order. */
  raisedById: string | null;
  /** What the audit record adds about where the work came from. */
  auditDetails: Record<string, unknown>;
};

export type NewWorkOrder = { plan: PlanOccurrenceWork } | { standalone: StandaloneWork };

/** How the people responsible hear of the new work. */
export type RaiseNotice =
  /** Mailed in this transaction (work someone reported), to everyone responsible but `skipUserId`. */
  | { mode: 'now'; appUrl: string; reason: string; skipUserId: string | null }
  /** Left to the pass's notice step (`announceUntoldWork`): one mail per person per pass. */
  | { mode: 'by-pass' }
  /** Nobody is told; the work is marked as told at `at` (a replayed history). */
  | { mode: 'never'; at: Date };

export type RaisedWorkOrder = { id: string; number: number; planId: string | null; occurrenceKey: string | null };

/** Hands out `n` consecutive work order numbers for a shop (row-locked counter). Returns the first. */
async function allocateNumbers(em: EntityManager, orgId: string, n: number): Promise<number> {
  const [row] = await em.execute<{ last_number: number }[]>(
    `insert into work_order_counter (id, created_at, updated_at, organization_id, last_number) values (?, now(), now(), ?, ?)
       on conflict (organization_id) do update set last_number = work_order_counter.last_number + ?, updated_at = now()
     returning last_number`,
    [randomUUID(), orgId, 1000 + n, n],
  );
  return Number(row.last_number) - n + 1;
}

// Plan work copies from its plan inside PostgreSQL (checklist lines start unanswered); standalone work
// takes the given values. A second raise of the same (plan, occurrence key) is refused by the
// database and skipped, so each due occurrence is raised once.
const INSERT_SQL = `
with x as (
  select * from jsonb_to_recordset(?::jsonb) as x(id uuid, number int, plan_id uuid, occurrence_key text, machine_id uuid, kind text,
         title text, instructions text, reason text, due_at timestamptz, assignee_id uuid, responsible_role text, requires_lockout boolean,
         safety_critical boolean, raised_by_id uuid, notified_at timestamptz))
insert into work_order (id, created_at, updated_at, organization_id, number, machine_id, plan_id, occurrence_key, kind, title,
       instructions, reason, status, due_at, overdue, assignee_id, responsible_role, requires_lockout, safety_critical,
       checklist, planned_parts, estimated_minutes, labour_minutes, notes, notified_at, raised_by_id)
select x.id, ?::timestamptz, ?::timestamptz, p.organization_id, x.number, p.machine_id, p.id, x.occurrence_key, x.kind, p.title,
       coalesce(p.instructions, ''), x.reason, 'open', x.due_at, false, p.responsible_user_id, p.responsible_role, p.requires_lockout,
       p.safety_critical,
       coalesce((select jsonb_agg(c || '{"result": null, "value": null, "note": null}'::jsonb order by n)
                   from jsonb_array_elements(p.checklist) with ordinality as t(c, n)), '[]'::jsonb),
       coalesce(p.parts, '[]'::jsonb), p.estimated_minutes, 0, '', x.notified_at, null::uuid
  from x join maintenance_plan p on p.id = x.plan_id and p.organization_id = ?
union all
select x.id, ?::timestamptz, ?::timestamptz, m.organization_id, x.number, m.id, null::uuid, null::varchar, x.kind, x.title,
       x.instructions, x.reason, 'open', x.due_at, false, x.assignee_id, x.responsible_role, x.requires_lockout, x.safety_critical,
       '[]'::jsonb, '[]'::jsonb, null::int, 0, '', x.notified_at, x.raised_by_id
  from x join machine m on m.id = x.machine_id and m.organization_id = ?
 where x.plan_id is null
on conflict (plan_id, occurrence_key) do nothing
returning id`;

/**
 * Raises work orders of one shop in the caller's transaction. `actor` is the person whose action
 * raised them (null: the scheduled pass). Returns the rows written, in the order given; a plan
 * occurrence raised before is left out.
 */
export async function raiseWorkOrders(
  tx: EntityManager,
  orgId: string,
  actor: { userId: string } | null,
  work: NewWorkOrder[],
  notice: RaiseNotice,
): Promise<RaisedWorkOrder[]> {
  if (work.length === 0) return [];
  const now = clock.now();
  const first = await allocateNumbers(tx, orgId, work.length);
  const notifiedAt = notice.mode === 'by-pass' ? null : (notice.mode === 'now' ? now : notice.at).toISOString();
  const records = work.map((w, k) => {
    const base = { id: randomUUID(), number: first + k, notified_at: notifiedAt };
    if ('plan' in w) {
      const p = w.plan;
      return { ...base, plan_id: p.planId, occurrence_key: p.occurrenceKey, kind: p.kind, reason: p.reason, due_at: p.dueAt.toISOString() };
    }
    const s = w.standalone;
    return {
      ...base,
      machine_id: s.machineId,
      kind: s.kind,
      title: s.title,
      instructions: s.instructions,
      reason: s.reason,
      due_at: s.dueAt?.toISOString() ?? null,
      assignee_id: s.assigneeId,
      responsible_role: s.responsibleRole,
      requires_lockout: s.requiresLockout,
      safety_critical: s.safetyCritical,
      raised_by_id: s.raisedById,
    };
  });
  const inserted = await executeBound<{ id: string }>(tx, INSERT_SQL, [JSON.stringify(records), now, now, orgId, now, now, orgId]);
  if (inserted.length === 0) return [];
  const insertedIds = new Set(inserted.map((r) => r.id));
  const raised: RaisedWorkOrder[] = [];
  const audit: ActivityRow[] = [];
  work.forEach((w, k) => {
    const r = records[k];
    if (!insertedIds.has(r.id)) return;
    const planId = 'plan' in w ? w.plan.planId : null;
    const occurrenceKey = 'plan' in w ? w.plan.occurrenceKey : null;
    raised.push({ id: r.id, number: r.number, planId, occurrenceKey });
    const details = 'plan' in w ? { number: r.number, planId, occurrenceKey } : { number: r.number, kind: w.standalone.kind, ...w.standalone.auditDetails };
    audit.push({ action: 'work-order.raised', entityType: 'WorkOrder', entityId: r.id, details });
  });
  if (actor)
    for (const a of audit) recordActivity(tx, { orgId, userId: actor.userId }, a.action, { type: a.entityType, id: a.entityId }, a.details ?? undefined);
  else await insertActivityRows(tx, orgId, audit);
  if (notice.mode === 'now') {
    const rows = await loadWorkRows(
      tx,
      raised.map((r) => r.id),
    );
    const shop = await loadShop(tx, orgId, notice.appUrl);
    const people = (await loadPeople(tx, orgId)).filter((p) => p.userId !== notice.skipUserId);
    queueRaisedNotices(
      tx,
      shop,
      rows.map((r) => ({ ...workLine(r, false), reason: notice.reason })),
      people,
    );
  }
  return raised;
}

type UntoldRow = WorkRow & { status: string; overdue: boolean; reason: string | null };

/** The raised work with its machine's code and name, as notices list it. */
export async function loadWorkRows(tx: EntityManager, ids: string[]): Promise<UntoldRow[]> {
  return tx.execute(
    `select w.id, w.number, w.title, w.due_at, w.status, w.overdue, w.reason, w.safety_critical, w.requires_lockout, w.assignee_id,
            w.responsible_role, m.code, m.name
       from work_order w join machine m on m.id = w.machine_id
      where w.id = any(?::uuid[]) order by w.number`,
    [uuidArray(ids)],
  );
}

export type ShopNotices = { orgId: string; orgName: string; timeZone: string; appUrl: string };

export async function loadShop(tx: EntityManager, orgId: string, appUrl: string): Promise<ShopNotices> {
  const [org]: { name: string; time_zone: string }[] = await tx.execute(`select name, time_zone from organization where id = ?`, [orgId]);
  return { orgId, orgName: org.name, timeZone: org.time_zone, appUrl };
}

/**
 * The pass's notice step for one shop: tells the people responsible about plan work raised with
 * `by-pass` notice that nobody has been told of yet (at most `limit` work orders, one mail per
 * person), and marks it told at `at`. Work closed meanwhile is marked without a mail. Returns the
 * work orders handled and the mails queued.
 */
export async function announceUntoldWork(
  tx: EntityManager,
  shop: ShopNotices,
  people: () => Promise<Person[]>,
  at: Date,
  limit: number,
): Promise<{ handled: number; mails: number }> {
  const rows: UntoldRow[] = await tx.execute(
    `select w.id, w.number, w.title, w.due_at, w.status, w.overdue, w.reason, w.safety_critical, w.requires_lockout, w.assignee_id,
            w.responsible_role, m.code, m.name
       from work_order w join machine m on m.id = w.machine_id
      where w.organization_id = ? and w.notified_at is null and w.plan_id is not null
      order by w.number limit ${limit} for update of w skip locked`,
    [shop.orgId],
  );
  if (rows.length === 0) return { handled: 0, mails: 0 };
  await executeBound(tx, `update work_order set notified_at = ? where id = any(?::uuid[])`, [at, uuidArray(rows.map((r) => r.id))]);
  const open = rows.filter((r) => r.status === 'open' || r.status === 'in-progress' || r.status === 'on-hold');
  const lines: WorkLine[] = open.map((r) => ({ ...workLine(r, r.overdue), reason: r.reason }));
  const mails = lines.length ? queueRaisedNotices(tx, shop, lines, await people()) : 0;
  return { handled: rows.length, mails };
}
