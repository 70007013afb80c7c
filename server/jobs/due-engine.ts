/**
 * The due engine's I/O. The decision is shared/domain/due.ts evaluatePlan (pure); this file reads
 * the plans and readings in bulk, writes each plan's status, raises one work order per due
 * occurrence and escalates past-due work. It is system code that crosses shops on purpose (raw SQL
 * names the rows it touches; each write carries the plan's own organisation).
 *
 * Exactly once: the pass runs under the scheduler's advisory lock, every raise re-checks the plan
 * under a row lock, and the database refuses a second work order for the same (plan, occurrence
 * key) — `on conflict do nothing`.
 */
import { createHash, randomUUID } from 'node:crypto';
import type { EntityManager, MikroORM } from '@mikro-orm/postgresql';
import { evaluatePlan, type Evaluation } from '../../shared/domain/due';
import { registerJobStep } from './scheduler';
import {
  PLAN_COLUMNS,
  inputsAtOf,
  inputsOf,
  loadLatestInputTimes,
  missingBaselines,
  uuidArray,
  loadMeterSeries,
  loadOilSeries,
  needsEvaluation,
  oilMeterId,
  toPlanInput,
  type EnginePlanRow,
  type MeterSeries,
} from './due-engine-inputs';
import { loadPeople, queueEscalations, queueRaisedNotices, workLine, type Person, type WorkRow } from './due-engine-mail';
import { sendDigests } from './due-engine-digest';
import { humanReason, type MeterLabel } from './due-engine-reason';
import { insertActivityRows } from '../modules/activity-log/activity-log.service';
import { executeBound } from '../db';
import { manualPass } from '../modules/job-runs/job-run-context';
import type { MeterBaselines } from '../modules/plans/plan.entity';
import { loadConfig } from '../config';
import { logger } from '../logger';
import { clock } from '../../shared/clock';

const DAY_MS = 86_400_000;
/** Plans read per query; raises written per transaction. */
const PLAN_BATCH = 2000;
const RAISE_BATCH = 1000;
const OPEN_STATES = `('open', 'in-progress', 'on-hold')`;
/** Job run rows are kept this long. */
const RUN_HISTORY_DAYS = 30;

export type OrgStats = {
  plansChecked: number;
  plansEvaluated: number;
  workOrdersRaised: number;
  escalations: number;
  mailsQueued: number;
  errors: { planId?: string; message: string }[];
};
const emptyStats = (): OrgStats => ({ plansChecked: 0, plansEvaluated: 0, workOrdersRaised: 0, escalations: 0, mailsQueued: 0, errors: [] });

type Org = { id: string; name: string; time_zone: string };

export type EngineOptions = {
  /** Only this shop's plans (e.g. right after an oil result); default every shop. */
  orgId?: string;
  /** Only these plans, evaluated whatever their recheck time. */
  planIds?: string[];
  /** Escalate past-due work (full passes). Default true. */
  escalate?: boolean;
  /** Mail notices for raised work. Default true; the demo seed's history replay turns it off. */
  notify?: boolean;
};

class Run {
  readonly stats = new Map<string, OrgStats>();
  private people = new Map<string, Person[]>();
  constructor(
    readonly orgs: Map<string, Org>,
    readonly appUrl: string,
    readonly notify = true,
  ) {}
  of(orgId: string): OrgStats {
    let s = this.stats.get(orgId);
    if (!s) this.stats.set(orgId, (s = emptyStats()));
    return s;
  }
  error(orgId: string, message: string, planId?: string) {
    const s = this.of(orgId);
    if (s.errors.length < 50) s.errors.push({ ...(planId ? { planId } : {}), message: message.slice(0, 500) });
  }
  async peopleOf(em: EntityManager, orgId: string): Promise<Person[]> {
    let p = this.people.get(orgId);
    if (!p) this.people.set(orgId, (p = await loadPeople(em, orgId)));
    return p;
  }
  ctx(orgId: string) {
    const o = this.orgs.get(orgId)!;
    return { orgId, orgName: o.name, timeZone: o.time_zone, appUrl: this.appUrl };
  }
}

type Evaluated = {
  row: EnginePlanRow;
  ev: Evaluation;
  /** evaluationHash of this evaluation. */
  hash: string;
  inputsAt: number | null;
  newBaselines: MeterBaselines | null;
  human: (s: string) => string;
};

/**
 * "Time alone will not change this" (due.ts changesAt is null), stored as a far date: a null
 * recheck time means "evaluate at the next pass" (new, edited, or work still to raise).
 */
export const NO_TIME_BOUNDARY = new Date('9999-12-31T00:00:00.000Z');

const msOf = (d: Date | string | null) => (d === null ? null : new Date(d).getTime());

/** What the plan row stores from an evaluation (status cache, explanation in people's words, next re-check). */
export function statusColumns(ev: Evaluation, human: (s: string) => string = (s) => s) {
  return {
    status: ev.status,
    nextDueAt: ev.dueAt,
    statusReason: human(ev.reason),
    recheckAt: ev.changesAt ?? NO_TIME_BOUNDARY,
    evaluation: {
      triggers: ev.triggers.map((t) => ({ kind: t.kind, status: t.status, dueAt: t.dueAt?.toISOString() ?? null, reason: human(t.reason) })),
      meterDue: ev.dueMeter.map((m) => ({ meterId: m.meterId, dueValue: m.dueValue, current: m.current, forecastAt: m.forecastAt?.toISOString() ?? null })),
    },
  };
}

/**
 * Digest of everything the shown status is made from: the evaluation, the shop's time zone and the
 * names of the plan's meters (reasons are written with them). Stored with the status, so a pass
 * that works out the same again leaves the row alone without rewriting its reasons. Every writer of
 * the status columns stores it (here and plans/plan-evaluation.ts).
 */
export function evaluationHash(ev: Evaluation, timeZone: string, meterNames: string[]): string {
  const ms = (d: Date | null) => (d === null ? '' : String(d.getTime()));
  let text = `${ev.status}|${ms(ev.dueAt)}|${ev.reason}|${timeZone}|${meterNames.join('\u0001')}`;
  for (const t of ev.triggers) text += `|${t.kind}|${t.status}|${ms(t.dueAt)}|${t.reason}`;
  for (const m of ev.dueMeter) text += `|${m.meterId}|${m.dueValue}|${m.current}|${ms(m.forecastAt)}`;
  return createHash('sha1').update(text).digest('base64');
}

/** A due occurrence this evaluation has not raised yet. */
const pendingRaise = (ev: Evaluation) => ev.occurrenceKey !== null && !ev.alreadyRaised;

/**
 * Writes evaluated statuses: a changed status in full, an unchanged one only when its re-check time,
 * input time or baselines moved, and nothing at all when the pass found the same answer again (so
 * `evaluated_at` is the last time a pass wrote the row). A plan completed or re-evaluated by a
 * request meanwhile (its digest moved) keeps its own newer status.
 */
async function writeStatuses(em: EntityManager, items: Evaluated[], now: Date) {
  const changed: Record<string, unknown>[] = [];
  const touched: Record<string, unknown>[] = [];
  for (const { row, ev, hash, inputsAt, newBaselines, human } of items) {
    // Work still to raise: look again at the next pass until the raise has gone through.
    const recheckAt = pendingRaise(ev) ? null : (ev.changesAt ?? NO_TIME_BOUNDARY);
    const seenDone = row.last_done_at ? new Date(row.last_done_at).toISOString() : null;
    const inputsIso = inputsAt === null ? null : new Date(inputsAt).toISOString();
    if (hash !== row.status_hash) {
      const c = statusColumns(ev, human);
      changed.push({
        id: row.id,
        status: c.status,
        next_due_at: c.nextDueAt?.toISOString() ?? null,
        reason: c.statusReason,
        evaluation: c.evaluation,
        hash,
        read_hash: row.status_hash,
        recheck_at: recheckAt?.toISOString() ?? null,
        inputs_at: inputsIso,
        seen_done: seenDone,
        baselines: newBaselines ?? {},
      });
    } else if (msOf(recheckAt) !== msOf(row.recheck_at) || inputsAt !== msOf(row.inputs_at) || newBaselines) {
      touched.push({ id: row.id, read_hash: row.status_hash, recheck_at: recheckAt?.toISOString() ?? null, inputs_at: inputsIso, seen_done: seenDone, baselines: newBaselines ?? {} });
    }
  }
  if (changed.length > 0) {
    await executeBound(
      em,
      `update maintenance_plan p set status = v.status, next_due_at = v.next_due_at, status_reason = v.reason, evaluation = v.evaluation,
              status_hash = v.hash, recheck_at = v.recheck_at, inputs_at = v.inputs_at, evaluated_at = ?, updated_at = now(),
              meter_baselines = v.baselines || p.meter_baselines
         from jsonb_to_recordset(?::jsonb) as v(id uuid, status text, next_due_at timestamptz, reason text, evaluation jsonb, hash text,
              read_hash text, recheck_at timestamptz, inputs_at timestamptz, seen_done timestamptz, baselines jsonb)
        where p.id = v.id and p.last_done_at is not distinct from v.seen_done and p.status_hash is not distinct from v.read_hash`,
      [now, JSON.stringify(changed)],
    );
  }
  if (touched.length > 0) {
    await executeBound(
      em,
      `update maintenance_plan p set recheck_at = v.recheck_at, inputs_at = v.inputs_at, evaluated_at = ?, meter_baselines = v.baselines || p.meter_baselines
         from jsonb_to_recordset(?::jsonb) as v(id uuid, read_hash text, recheck_at timestamptz, inputs_at timestamptz, seen_done timestamptz, baselines jsonb)
        where p.id = v.id and p.last_done_at is not distinct from v.seen_done and p.status_hash is not distinct from v.read_hash`,
      [now, JSON.stringify(touched)],
    );
  }
}


/** The deciding trigger's due point: when this occurrence fell due. */
function occurrenceDueAt(ev: Evaluation, now: Date): Date {
  return ev.triggers.find((t) => t.index === ev.decidedBy)?.dueAt ?? ev.dueAt ?? now;
}

/** Hands out `n` consecutive work order numbers for a shop (row-locked counter). Returns the first. */
export async function allocateNumbers(em: EntityManager, orgId: string, n: number): Promise<number> {
  const [row] = await em.execute<{ last_number: number }[]>(
    `insert into work_order_counter (id, created_at, updated_at, organization_id, last_number) values (?, now(), now(), ?, ?)
       on conflict (organization_id) do update set last_number = work_order_counter.last_number + ?, updated_at = now()
     returning last_number`,
    [randomUUID(), orgId, 1000 + n, n],
  );
  return Number(row.last_number) - n + 1;
}


/** Raises work for one shop's due occurrences, in one transaction per batch. */
async function raiseWork(orm: MikroORM, run: Run, orgId: string, items: Evaluated[], now: Date) {
  for (let i = 0; i < items.length; i += RAISE_BATCH) {
    const batch = items.slice(i, i + RAISE_BATCH);
    try {
      await orm.em.fork().transactional(async (tx) => {
        const ids = batch.map((b) => b.row.id);
        // Re-check under a row lock: a completion or another raise since the evaluation wins.
        const locked: { id: string; last_done_at: Date | null; last_raised_key: string | null; active: boolean }[] = await tx.execute(
          `select id, last_done_at, last_raised_key, active from maintenance_plan where id = any(?::uuid[]) for update`,
          [uuidArray(ids)],
        );
        const byId = new Map(locked.map((l) => [l.id, l]));
        const ok = batch.filter(({ row }) => {
          const l = byId.get(row.id);
          return l && l.active && msOf(l.last_done_at) === msOf(row.last_done_at) && l.last_raised_key === row.last_raised_key;
        });
        if (ok.length === 0) return;
        const first = await allocateNumbers(tx, orgId, ok.length);
        const records = ok.map(({ row, ev, human }, k) => {
          const decider = row.triggers[ev.decidedBy];
          return {
            id: randomUUID(),
            number: first + k,
            plan_id: row.id,
            occurrence_key: ev.occurrenceKey as string,
            kind: decider && (decider.kind === 'condition' || decider.kind === 'oil-analysis') ? 'condition' : 'scheduled',
            reason: human(ev.reason),
            due_at: occurrenceDueAt(ev, now).toISOString(),
            // The notice step tells people after the raising (one mail per person per pass); a replay without notices marks it told.
            notified_at: run.notify ? null : now.toISOString(),
            recheck_at: (ev.changesAt ?? NO_TIME_BOUNDARY).toISOString(),
          };
        });
        // What the work copies from its plan (title, instructions, checklist with empty results, parts,
        // responsibility) is copied inside PostgreSQL, from the row locked above.
        const inserted = await executeBound<{ id: string; plan_id: string }>(
          tx,
          `insert into work_order (id, created_at, updated_at, organization_id, number, machine_id, plan_id, occurrence_key, kind, title,
                  instructions, reason, status, due_at, overdue, assignee_id, responsible_role, requires_lockout, safety_critical,
                  checklist, planned_parts, estimated_minutes, labour_minutes, notes, notified_at)
           select x.id, now(), now(), p.organization_id, x.number, p.machine_id, p.id, x.occurrence_key, x.kind, p.title,
                  coalesce(p.instructions, ''), x.reason, 'open', x.due_at, false, p.responsible_user_id, p.responsible_role, p.requires_lockout,
                  p.safety_critical,
                  coalesce((select jsonb_agg(c || '{"result": null, "value": null, "note": null}'::jsonb order by n)
                              from jsonb_array_elements(p.checklist) with ordinality as t(c, n)), '[]'::jsonb),
                  coalesce(p.parts, '[]'::jsonb), p.estimated_minutes, 0, '', x.notified_at
             from jsonb_to_recordset(?::jsonb) as x(id uuid, number int, plan_id uuid, occurrence_key text, kind text, reason text,
                  due_at timestamptz, notified_at timestamptz)
             join maintenance_plan p on p.id = x.plan_id and p.organization_id = ?
           on conflict (plan_id, occurrence_key) do nothing
           returning id, plan_id`,
          [JSON.stringify(records.map(({ recheck_at: _, ...r }) => r)), orgId],
        );
        if (inserted.length === 0) return;
        const insertedIds = new Set(inserted.map((r) => r.id));
        const raised = records.filter((r) => insertedIds.has(r.id));
        await executeBound(
          tx,
          `update maintenance_plan p set last_raised_key = v.key, recheck_at = v.recheck_at, updated_at = now()
             from jsonb_to_recordset(?::jsonb) as v(id uuid, key text, recheck_at timestamptz) where p.id = v.id`,
          [JSON.stringify(raised.map((r) => ({ id: r.plan_id, key: r.occurrence_key, recheck_at: r.recheck_at })))],
        );
        await insertActivityRows(
          tx,
          orgId,
          raised.map((r) => ({ action: 'work-order.raised', entityType: 'WorkOrder', entityId: r.id, details: { number: r.number, planId: r.plan_id, occurrenceKey: r.occurrence_key } })),
        );
        run.of(orgId).workOrdersRaised += raised.length;
      });
    } catch (err) {
      logger.error({ err, orgId }, 'raising work failed');
      for (const b of batch) run.error(orgId, `raising work failed: ${err instanceof Error ? err.message : String(err)}`, b.row.id);
    }
  }
}

const NOTIFY_CHUNK = 50_000;

/**
 * Tells the people responsible about raised work nobody has been told of yet: one mail per person
 * per shop (per 50,000 work orders), after the raising, so a pass that raises a backlog sends one
 * notice, not one per batch. Work raised by a pass that stopped before this step is told next time.
 */
async function notifyRaised(orm: MikroORM, run: Run, now: Date) {
  for (const org of run.orgs.keys()) {
    for (let round = 0; round < 100; round++) {
      if ((await notifyChunk(orm, run, org, now)) < NOTIFY_CHUNK) break;
    }
  }
}

async function notifyChunk(orm: MikroORM, run: Run, orgId: string, now: Date): Promise<number> {
  try {
    return await orm.em.fork().transactional(async (tx) => {
      const rows: (WorkRow & { status: string; overdue: boolean; reason: string | null })[] = await tx.execute(
        `select w.id, w.number, w.title, w.due_at, w.status, w.overdue, w.reason, w.safety_critical, w.requires_lockout, w.assignee_id,
                w.responsible_role, m.code, m.name
           from work_order w join machine m on m.id = w.machine_id
          where w.organization_id = ? and w.notified_at is null and w.plan_id is not null
          order by w.number limit ${NOTIFY_CHUNK} for update of w skip locked`,
        [orgId],
      );
      if (rows.length === 0) return 0;
      await executeBound(tx, `update work_order set notified_at = ? where id = any(?::uuid[])`, [now, uuidArray(rows.map((r) => r.id))]);
      const open = rows.filter((r) => r.status === 'open' || r.status === 'in-progress' || r.status === 'on-hold');
      const lines = open.map((r) => ({ ...workLine(r, r.overdue), reason: r.reason }));
      run.of(orgId).mailsQueued += lines.length ? queueRaisedNotices(tx, run.ctx(orgId), lines, await run.peopleOf(tx, orgId)) : 0;
      return rows.length;
    });
  } catch (err) {
    logger.error({ err, orgId }, 'notices of raised work failed');
    run.error(orgId, `notices of raised work failed: ${err instanceof Error ? err.message : String(err)}`);
    return 0;
  }
}

/** Marks past-due open work as overdue once and tells the people who must know (in chunks, until none is left). */
async function escalate(orm: MikroORM, run: Run, now: Date, orgId?: string) {
  for (let round = 0; round < 100; round++) {
    if ((await escalateChunk(orm, run, now, orgId)) < ESCALATE_CHUNK) return;
  }
}

// Each chunk mails its lines in the transaction that marks them, so a chunk is one mail per person:
// large enough that a shop's whole backlog escalates in one (a bound on memory, not a batch size).
const ESCALATE_CHUNK = 50_000;


async function escalateChunk(orm: MikroORM, run: Run, now: Date, orgId?: string): Promise<number> {
  const em = orm.em.fork();
  const rows: (WorkRow & { organization_id: string })[] = await em.execute(
    `select w.id, w.organization_id, w.number, w.title, w.due_at, w.safety_critical, w.requires_lockout, w.assignee_id, w.responsible_role, m.code, m.name
       from work_order w join machine m on m.id = w.machine_id left join maintenance_plan p on p.id = w.plan_id
      where w.status in ${OPEN_STATES} and w.escalated_at is null ${orgId ? 'and w.organization_id = ?' : ''}
        and ((p.id is not null and p.status = 'overdue' and w.occurrence_key = p.last_raised_key)
          or (w.plan_id is null and w.due_at is not null and w.due_at < ?))
      order by w.organization_id, w.number limit ${ESCALATE_CHUNK}`,
    [...(orgId ? [orgId] : []), new Date(now.getTime() - DAY_MS)],
  );
  const byOrg = new Map<string, typeof rows>();
  for (const r of rows) {
    let l = byOrg.get(r.organization_id);
    if (!l) byOrg.set(r.organization_id, (l = []));
    l.push(r);
  }
  for (const [org, list] of byOrg) {
    if (!run.orgs.has(org)) continue;
    try {
      await orm.em.fork().transactional(async (tx) => {
        const done = await executeBound<{ id: string }>(
          tx,
          `update work_order set overdue = true, escalated_at = ?, updated_at = now() where id = any(?::uuid[]) and escalated_at is null returning id`,
          [now, uuidArray(list.map((l) => l.id))],
        );
        const ids = new Set(done.map((d) => d.id));
        const lines = list.filter((l) => ids.has(l.id)).map((l) => workLine(l, true));
        if (lines.length === 0) return;
        await insertActivityRows(tx, org, lines.map((l) => ({ action: 'work-order.escalated', entityType: 'WorkOrder', entityId: l.id, details: { number: l.number } })));
        const mails = queueEscalations(tx, run.ctx(org), lines, await run.peopleOf(tx, org));
        const s = run.of(org);
        s.escalations += lines.length;
        s.mailsQueued += mails;
      });
    } catch (err) {
      logger.error({ err, org }, 'escalation failed');
      run.error(org, `escalation failed: ${err instanceof Error ? err.message : String(err)}`);
      return 0; // stop: the same rows would fail again in this pass
    }
  }
  return rows.length;
}

/** At most one write in flight; its failure is rethrown by the next `wait`. */
class WriteQueue {
  private inFlight: Promise<void> | null = null;
  private failure: { error: unknown } | null = null;
  start(work: () => Promise<void>) {
    this.inFlight = work().catch((error: unknown) => {
      this.failure = { error };
    });
  }
  async wait() {
    if (this.inFlight) await this.inFlight;
    this.inFlight = null;
    const failed = this.failure;
    this.failure = null;
    if (failed) throw failed.error;
  }
}

/**
 * Evaluates plans and raises what is due. Full pass by default; with `planIds` only those plans
 * (used right after a completion or an oil result). Returns per-shop counts.
 */
export async function runDueEngine(orm: MikroORM, now: Date, opts: EngineOptions = {}): Promise<Map<string, OrgStats>> {
  const em = orm.em.fork();
  const orgRows: Org[] = await em.execute(`select id, name, time_zone from organization ${opts.orgId ? 'where id = ?' : ''}`, opts.orgId ? [opts.orgId] : []);
  const run = new Run(new Map(orgRows.map((o) => [o.id, o])), loadConfig().APP_URL, opts.notify !== false);
  for (const o of orgRows) run.of(o.id);

  const writes = new WriteQueue();
  try {
    await evaluateAll(orm, em, run, now, opts, writes);
  } finally {
    // Whatever stopped the loop, the batch still being written finishes (and reports) before the pass ends.
    await writes.wait().catch((err: unknown) => {
      logger.error({ err }, 'writing plan statuses failed');
      for (const org of run.orgs.keys()) run.error(org, `writing plan statuses failed: ${err instanceof Error ? err.message : String(err)}`);
    });
  }
  if (run.notify) await notifyRaised(orm, run, now);
  if (opts.escalate !== false) await escalate(orm, run, now, opts.orgId);
  return run.stats;
}

/** Reads the plans in batches, evaluates each and hands the writes of each batch to `writes`. */
async function evaluateAll(orm: MikroORM, em: EntityManager, run: Run, now: Date, opts: EngineOptions, writes: WriteQueue) {
  const nowMs = now.getTime();
  const latest = await loadLatestInputTimes(em, now);
  const series = new Map<string, MeterSeries>();
  const labels = new Map<string, MeterLabel>();
  let lastId = '00000000-0000-0000-0000-000000000000';
  for (;;) {
    const params: unknown[] = [lastId];
    let where = 'active and id > ?';
    if (opts.orgId) {
      where += ' and organization_id = ?';
      params.push(opts.orgId);
    }
    if (opts.planIds) {
      where += ' and id = any(?::uuid[])';
      params.push(uuidArray(opts.planIds));
    }
    const rows: EnginePlanRow[] = await em.execute(`select ${PLAN_COLUMNS} from maintenance_plan where ${where} order by id limit ${PLAN_BATCH}`, params);
    if (rows.length === 0) break;
    lastId = rows[rows.length - 1].id;
    for (const r of rows) run.of(r.organization_id).plansChecked++;
    const todo = opts.planIds ? rows : rows.filter((r) => needsEvaluation(r, nowMs, latest));
    if (todo.length > 0) {
      const needMeters = new Set<string>();
      const needOil = new Set<string>();
      for (const r of todo) {
        const ins = inputsOf(r);
        for (const m of ins.meters) if (!series.has(m)) needMeters.add(m);
        for (const o of ins.oil) if (!series.has(oilMeterId(o))) needOil.add(o);
      }
      for (const [k, v] of await loadMeterSeries(em, [...needMeters], now)) series.set(k, v);
      for (const [k, v] of await loadOilSeries(em, [...needOil], now)) series.set(k, v);
      const unlabelled = [...new Set(todo.flatMap((r) => inputsOf(r).meters))].filter((m) => !labels.has(m));
      if (unlabelled.length) {
        const rows: { id: string; name: string; unit: string }[] = await em.execute(`select id, name, unit from meter where id = any(?::uuid[])`, [uuidArray(unlabelled)]);
        for (const r of rows) labels.set(r.id, { name: r.name, unit: r.unit });
      }

      const evaluated: Evaluated[] = [];
      for (const row of todo) {
        const org = run.orgs.get(row.organization_id);
        if (!org) continue;
        run.of(row.organization_id).plansEvaluated++;
        try {
          const newBaselines = missingBaselines(row, series);
          if (newBaselines) row.meter_baselines = { ...row.meter_baselines, ...newBaselines };
          const ev = evaluatePlan(toPlanInput(row, now, org.time_zone, series));
          const names = inputsOf(row).meters.map((id) => labels.get(id)?.name ?? '');
          evaluated.push({
            row,
            ev,
            hash: evaluationHash(ev, org.time_zone, names),
            inputsAt: inputsAtOf(row, latest),
            newBaselines,
            human: (s) => humanReason(s, (id) => labels.get(id), org.time_zone),
          });
        } catch (err) {
          run.error(row.organization_id, err instanceof Error ? err.message : String(err), row.id);
        }
      }
      // Writing one batch overlaps with reading and evaluating the next (PostgreSQL works while this
      // process computes); writes stay in order, one batch at a time.
      await writes.wait();
      writes.start(async () => {
        await writeStatuses(em.fork(), evaluated, now);
        const toRaise = new Map<string, Evaluated[]>();
        for (const e of evaluated) {
          if (!pendingRaise(e.ev)) continue;
          let l = toRaise.get(e.row.organization_id);
          if (!l) toRaise.set(e.row.organization_id, (l = []));
          l.push(e);
        }
        for (const [org, list] of toRaise) await raiseWork(orm, run, org, list, now);
      });
    }
    if (rows.length < PLAN_BATCH) break;
  }
  await writes.wait();
}

/** Writes one job run row per shop for a pass. */
async function recordRuns(orm: MikroORM, passId: string, startedAt: Date, stats: Map<string, OrgStats>) {
  const manual = manualPass.getStore();
  const finishedAt = clock.now();
  const rows = [...stats].map(([orgId, s]) => ({
    id: randomUUID(),
    organization_id: orgId,
    pass_id: passId,
    trigger: manual && manual.orgId === orgId ? 'manual' : 'schedule',
    triggered_by_id: manual && manual.orgId === orgId ? manual.userId : null,
    plans_checked: s.plansChecked,
    plans_evaluated: s.plansEvaluated,
    work_orders_raised: s.workOrdersRaised,
    escalations: s.escalations,
    mails_queued: s.mailsQueued,
    errors: s.errors,
  }));
  if (rows.length === 0) return;
  await orm.em.fork().execute(
    `insert into job_run (id, created_at, updated_at, organization_id, pass_id, trigger, triggered_by_id, started_at, finished_at,
            plans_checked, plans_evaluated, work_orders_raised, escalations, mails_queued, errors)
     select x.id, now(), now(), x.organization_id, x.pass_id, x.trigger, x.triggered_by_id, ?, ?, x.plans_checked, x.plans_evaluated,
            x.work_orders_raised, x.escalations, x.mails_queued, x.errors
       from jsonb_to_recordset(?::jsonb) as x(id uuid, organization_id uuid, pass_id uuid, trigger text, triggered_by_id uuid, plans_checked int,
            plans_evaluated int, work_orders_raised int, escalations int, mails_queued int, errors jsonb)`,
    [startedAt, finishedAt, JSON.stringify(rows)],
  );
  await orm.em.fork().execute(`delete from job_run where started_at < ?`, [new Date(startedAt.getTime() - RUN_HISTORY_DAYS * DAY_MS)]);
}

/** The scheduled step: evaluate every plan, raise, escalate, send daily summaries, record the run. */
export async function runMaintenancePass(orm: MikroORM, now: Date): Promise<Record<string, number>> {
  const passId = randomUUID();
  const startedAt = clock.now();
  let stats = new Map<string, OrgStats>();
  let failure: unknown = null;
  try {
    stats = await runDueEngine(orm, now);
    const digests = await sendDigests(orm, now);
    for (const [org, n] of digests) {
      const s = stats.get(org);
      if (s) s.mailsQueued += n;
    }
  } catch (err) {
    failure = err;
    const orgs: { id: string }[] = await orm.em.fork().execute(`select id from organization`);
    for (const o of orgs) {
      const s = stats.get(o.id) ?? emptyStats();
      s.errors.push({ message: `pass failed: ${err instanceof Error ? err.message : String(err)}` });
      stats.set(o.id, s);
    }
  }
  await recordRuns(orm, passId, startedAt, stats);
  if (failure) throw failure;
  const total = emptyStats();
  for (const s of stats.values()) {
    total.plansChecked += s.plansChecked;
    total.plansEvaluated += s.plansEvaluated;
    total.workOrdersRaised += s.workOrdersRaised;
    total.escalations += s.escalations;
    total.mailsQueued += s.mailsQueued;
    total.errors.push(...s.errors);
  }
  return {
    plansChecked: total.plansChecked,
    plansEvaluated: total.plansEvaluated,
    workOrdersRaised: total.workOrdersRaised,
    escalations: total.escalations,
    mailsQueued: total.mailsQueued,
    errors: total.errors.length,
  };
}

registerJobStep({ name: 'due-engine', run: runMaintenancePass });
