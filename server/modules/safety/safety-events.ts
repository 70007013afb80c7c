/** Refusals and alarms for the safety audit (append-only `safety_event`), written outside the refused transaction. */
import type { EntityManager } from '@mikro-orm/postgresql';
import { randomUUID } from 'node:crypto';
import { AppError } from '../../http/errors';
import type { Principal } from '../../http/principal';
import { clock } from '../../../shared/clock';
import type { SafetyEventRow } from '../../../shared/schemas/safety-audit';
import type { Page } from '../../../shared/schemas/paging';

export type EventContext = { machineId?: string | null; subjectId?: string | null; lockoutId?: string | null; procedureId?: string | null };

/** Statuses that are a refusal of what was asked (not a wrong password, a missing record of another shop, or a fault). */
const REFUSALS = new Set([400, 403, 409]);

async function machineOf(em: EntityManager, ctx: EventContext): Promise<string | null> {
  if (ctx.machineId) return ctx.machineId;
  const conn = em.getConnection();
  if (ctx.lockoutId) {
    const [row] = await conn.execute<{ machine_id: string }[]>('select machine_id from safety_lockout where id = ?', [ctx.lockoutId]);
    return row?.machine_id ?? null;
  }
  if (ctx.procedureId) {
    const [row] = await conn.execute<{ machine_id: string }[]>('select machine_id from safety_procedure where id = ?', [ctx.procedureId]);
    return row?.machine_id ?? null;
  }
  return null;
}

/** Records one refused attempt in its own statement (the attempt's transaction has rolled back by now). */
export async function recordRefusal(em: EntityManager, who: Principal, action: string, err: AppError, ctx: EventContext = {}): Promise<void> {
  const machineId = await machineOf(em, ctx);
  const fields = err.fields?.map((f) => ({ path: f.path, message: f.message })) ?? [];
  await em
    .getConnection()
    .execute(
      `insert into safety_event (id, organization_id, at, kind, action, reason, person_id, person_name, machine_id, subject_id, details) values (?, ?, ?, 'refused', ?, ?, ?, ?, ?, ?, ?)`,
      [
        randomUUID(),
        who.orgId,
        clock.now(),
        action,
        err.message,
        who.userId,
        who.name,
        machineId,
        ctx.subjectId ?? ctx.lockoutId ?? ctx.procedureId ?? null,
        JSON.stringify({ status: err.status, code: err.code, fields }),
      ],
    );
}

/**
 * Runs a safety action; when it is refused, the refusal (who, what, why) goes into the safety
 * audit and the same error goes back to the caller. Nothing of the action itself was written.
 */
export async function refusable<T>(em: EntityManager, who: Principal, action: string, ctx: EventContext, fn: () => Promise<T>): Promise<T> {
  try {
    return await fn();
  } catch (err) {
    if (err instanceof AppError && REFUSALS.has(err.status)) await recordRefusal(em.fork(), who, action, err, ctx);
    throw err;
  }
}

type AlarmInput = { action: string; reason: string; machineId: string; subjectId?: string | null; details: Record<string, unknown>; dedupeKey: string };

/** Raises an alarm once per dedupe key inside the caller's transaction; returns false when it was raised before. */
export async function raiseAlarm(tx: EntityManager, orgId: string, input: AlarmInput): Promise<boolean> {
  const rows = await tx.execute<{ id: string }[]>(
    `insert into safety_event (id, organization_id, at, kind, action, reason, machine_id, subject_id, details, dedupe_key)
     values (?, ?, ?, 'alarm', ?, ?, ?, ?, ?, ?) on conflict (organization_id, dedupe_key) do nothing returning id`,
    [randomUUID(), orgId, clock.now(), input.action, input.reason, input.machineId, input.subjectId ?? null, JSON.stringify(input.details), input.dedupeKey],
  );
  return rows.length > 0;
}

type EventSql = {
  id: string;
  at: Date;
  kind: 'refused' | 'alarm';
  action: string;
  reason: string;
  person_id: string | null;
  person_name: string | null;
  machine_id: string | null;
  machine_code: string | null;
  subject_id: string | null;
  details: Record<string, unknown>;
  total: string;
};

export async function listSafetyEvents(
  em: EntityManager,
  who: Principal,
  q: { kind?: 'refused' | 'alarm'; machineId?: string; page: number; pageSize: number },
): Promise<Page<SafetyEventRow>> {
  const params: unknown[] = [who.orgId];
  let where = 'e.organization_id = ?';
  if (q.kind) {
    where += ' and e.kind = ?';
    params.push(q.kind);
  }
  if (q.machineId) {
    where += ' and e.machine_id = ?';
    params.push(q.machineId);
  }
  const rows = await em
    .getConnection()
    .execute<EventSql[]>(
      `select e.*, m.code as machine_code, count(*) over () as total from safety_event e left join machine m on m.id = e.machine_id where ${where} order by e.at desc, e.id limit ? offset ?`,
      [...params, q.pageSize, (q.page - 1) * q.pageSize],
    );
  return {
    rows: rows.map((r) => ({
      id: r.id,
      at: new Date(r.at).toISOString(),
      kind: r.kind,
      action: r.action,
      reason: r.reason,
      personId: r.person_id,
      personName: r.person_name,
      machineId: r.machine_id,
      machineCode: r.machine_code,
      subjectId: r.subject_id,
    })),
    total: rows[0] ? Number(rows[0].total) : 0,
    page: q.page,
    pageSize: q.pageSize,
  };
}
