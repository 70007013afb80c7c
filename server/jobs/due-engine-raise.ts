/**
 * The due engine's raising: one work order per due occurrence, written by the work-orders module's
 * `raiseWorkOrders` (batch form), then one notice per person per pass.
 *
 * Exactly once: the pass runs under the scheduler's advisory lock, every raise re-checks the plan
 * under a row lock, and the database refuses a second work order for the same (plan, occurrence key).
 */
import type { MikroORM } from '@mikro-orm/postgresql';
import type { Evaluation } from '../../shared/domain/due';
import { executeBound, uuidArray } from '../db';
import { NO_TIME_BOUNDARY } from '../modules/plans/plan-status';
import { announceUntoldWork, raiseWorkOrders, type NewWorkOrder } from '../modules/work-orders/raise-work-orders';
import { logger } from '../logger';
import { errorText, type Evaluated, type Run } from './due-engine-run';

/** Raises written per transaction. */
const RAISE_BATCH = 1000;

const msOf = (d: Date | string | null) => (d === null ? null : new Date(d).getTime());

/** The deciding trigger's due point: when this occurrence fell due. */
function occurrenceDueAt(ev: Evaluation, now: Date): Date {
  return ev.triggers.find((t) => t.index === ev.decidedBy)?.dueAt ?? ev.dueAt ?? now;
}

/** Raises work for one shop's due occurrences, in one transaction per batch. */
export async function raiseWork(orm: MikroORM, run: Run, orgId: string, items: Evaluated[], now: Date) {
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
        const work: NewWorkOrder[] = ok.map(({ row, ev, human }) => {
          const decider = row.triggers[ev.decidedBy];
          return {
            plan: {
              planId: row.id,
              occurrenceKey: ev.occurrenceKey as string,
              kind: decider && (decider.kind === 'condition' || decider.kind === 'oil-analysis') ? 'condition' : 'scheduled',
              reason: human(ev.reason),
              dueAt: occurrenceDueAt(ev, now),
            },
          };
        });
        // The notice step tells people after the raising (one mail per person per pass); a replay without notices marks it told.
        const raised = await raiseWorkOrders(tx, orgId, null, work, run.notify ? { mode: 'by-pass' } : { mode: 'never', at: now });
        if (raised.length === 0) return;
        const recheckOf = new Map(ok.map(({ row, ev }) => [row.id, (ev.changesAt ?? NO_TIME_BOUNDARY).toISOString()]));
        await executeBound(
          tx,
          `update maintenance_plan p set last_raised_key = v.key, recheck_at = v.recheck_at, updated_at = now()
             from jsonb_to_recordset(?::jsonb) as v(id uuid, key text, recheck_at timestamptz) where p.id = v.id`,
          [JSON.stringify(raised.map((r) => ({ id: r.planId, key: r.occurrenceKey, recheck_at: recheckOf.get(r.planId!) })))],
        );
        run.of(orgId).workOrdersRaised += raised.length;
      });
    } catch (err) {
      logger.error({ err, orgId }, 'raising work failed');
      for (const b of batch) run.error(orgId, `raising work failed: ${errorText(err)}`, b.row.id);
    }
  }
}

const NOTIFY_CHUNK = 50_000;

/**
 * Tells the people responsible about raised work nobody has been told of yet: one mail per person
 * per shop (per 50,000 work orders), after the raising, so a pass that raises a backlog sends one
 * notice, not one per batch. Work raised by a pass that stopped before this step is told next time.
 */
export async function notifyRaised(orm: MikroORM, run: Run, now: Date) {
  for (const org of run.orgs.keys()) {
    for (let round = 0; round < 100; round++) {
      if ((await notifyChunk(orm, run, org, now)) < NOTIFY_CHUNK) break;
    }
  }
}

async function notifyChunk(orm: MikroORM, run: Run, orgId: string, now: Date): Promise<number> {
  try {
    return await orm.em.fork().transactional(async (tx) => {
      const told = await announceUntoldWork(tx, run.ctx(orgId), () => run.peopleOf(tx, orgId), now, NOTIFY_CHUNK);
      run.of(orgId).mailsQueued += told.mails;
      return told.handled;
    });
  } catch (err) {
    logger.error({ err, orgId }, 'notices of raised work failed');
    run.error(orgId, `notices of raised work failed: ${errorText(err)}`);
    return 0;
  }
}
