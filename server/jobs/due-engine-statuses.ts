/** The due engine's status writes: each evaluated plan's status cache, in two set-based statements per batch. */
import type { EntityManager } from '@mikro-orm/postgresql';
import { executeBound } from '../db';
import { NO_TIME_BOUNDARY, pendingRaise, statusColumns } from '../modules/plans/plan-status';
import type { Evaluated } from './due-engine-run';

const msOf = (d: Date | string | null) => (d === null ? null : new Date(d).getTime());

/**
 * Writes evaluated statuses: a changed status in full, an unchanged one only when its re-check time,
 * input time or baselines moved, and nothing at all when the pass found the same answer again (so
 * `evaluated_at` is the last time a pass wrote the row). A plan completed or re-evaluated by a
 * request meanwhile (its digest moved) keeps its own newer status.
 */
export async function writeStatuses(em: EntityManager, items: Evaluated[], now: Date) {
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
      touched.push({
        id: row.id,
        read_hash: row.status_hash,
        recheck_at: recheckAt?.toISOString() ?? null,
        inputs_at: inputsIso,
        seen_done: seenDone,
        baselines: newBaselines ?? {},
      });
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
