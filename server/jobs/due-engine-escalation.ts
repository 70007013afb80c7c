/** The due engine's escalation: past-due open work is marked overdue once, and the people who must know are told. */
import type { MikroORM } from '@mikro-orm/postgresql';
import { executeBound, uuidArray } from '../db';
import { insertActivityRows } from '../modules/activity-log/activity-log.service';
import { queueEscalations, workLine, type WorkRow } from '../modules/work-orders/work-order-mail';
import { logger } from '../logger';
import { errorText, type Run } from './due-engine-run';

const DAY_MS = 86_400_000;
const OPEN_STATES = `('open', 'in-progress', 'on-hold')`;

// Each chunk mails its lines in the transaction that marks them, so a chunk is one mail per person:
// large enough that a shop's whole backlog escalates in one (a bound on memory, not a batch size).
const ESCALATE_CHUNK = 50_000;

/** Marks past-due open work as overdue once and tells the people who must know (in chunks, until none is left). */
export async function escalate(orm: MikroORM, run: Run, now: Date, orgId?: string) {
  for (let round = 0; round < 100; round++) {
    if ((await escalateChunk(orm, run, now, orgId)) < ESCALATE_CHUNK) return;
  }
}

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
        await insertActivityRows(
          tx,
          org,
          lines.map((l) => ({ action: 'work-order.escalated', entityType: 'WorkOrder', entityId: l.id, details: { number: l.number } })),
        );
        const mails = queueEscalations(tx, run.ctx(org), lines, await run.peopleOf(tx, org));
        const s = run.of(org);
        s.escalations += lines.length;
        s.mailsQueued += mails;
      });
    } catch (err) {
      logger.error({ err, org }, 'escalation failed');
      run.error(org, `escalation failed: ${errorText(err)}`);
      return 0; // stop: the same rows would fail again in this pass
    }
  }
  return rows.length;
}
