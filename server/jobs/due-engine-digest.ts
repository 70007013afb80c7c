/** The daily summary mail: once per local day, after the person's chosen hour, for people who asked for it. */
import type { MikroORM } from '@mikro-orm/postgresql';
import { DateTime } from 'luxon';
import type { Role } from '../../shared/permissions';
import { queueDigest, workLine, type WorkRow } from '../modules/work-orders/work-order-mail';
import { logger } from '../logger';

type Due = {
  id: string;
  organization_id: string;
  user_id: string;
  digest_hour: number;
  last_digest_date: string | null;
  email: string;
  name: string;
  role: Role;
  time_zone: string;
  org_name: string;
};

/** Sends the summaries due at `now` (links start with `appUrl`), in every shop or in `orgId`'s; returns mails queued per shop. */
export async function sendDigests(orm: MikroORM, now: Date, appUrl: string, orgId?: string): Promise<Map<string, number>> {
  const out = new Map<string, number>();
  const candidates: Due[] = await orm.em.fork().execute(
    `select np.id, np.organization_id, np.user_id, np.digest_hour, np.last_digest_date, u.email, u.name, m.role, o.time_zone, o.name as org_name
       from notify_preference np
       join membership m on m.user_id = np.user_id and m.organization_id = np.organization_id and m.active
       join app_user u on u.id = np.user_id
       join organization o on o.id = np.organization_id
      where np.mode = 'daily' ${orgId ? 'and np.organization_id = ?' : ''}`,
    orgId ? [orgId] : [],
  );
  for (const c of candidates) {
    const local = DateTime.fromJSDate(now, { zone: c.time_zone });
    const date = local.toISODate()!;
    if (local.hour < c.digest_hour || c.last_digest_date === date) continue;
    try {
      const sent = await orm.em.fork().transactional(async (tx) => {
        // Claim today's summary first: a second pass (or instance) finds it taken.
        const claimed: { id: string }[] = await tx.execute(
          `update notify_preference set last_digest_date = ?, updated_at = now() where id = ? and last_digest_date is distinct from ? returning id`,
          [date, c.id, date],
        );
        if (claimed.length === 0) return 0;
        const rows: (WorkRow & { overdue: boolean })[] = await tx.execute(
          `select w.id, w.number, w.title, w.due_at, w.overdue, w.safety_critical, w.requires_lockout, w.assignee_id, w.responsible_role, m.code, m.name
               from work_order w join machine m on m.id = w.machine_id
              where w.organization_id = ? and w.status in ('open', 'in-progress', 'on-hold')
                and (w.assignee_id = ? or (w.assignee_id is null and w.responsible_role = ?))
              order by w.overdue desc, w.due_at nulls last, w.number limit 100`,
          [c.organization_id, c.user_id, c.role],
        );
        if (rows.length === 0) return 0;
        const lines = rows.map((r) => workLine(r, r.overdue));
        queueDigest(
          tx,
          { orgId: c.organization_id, orgName: c.org_name, timeZone: c.time_zone, appUrl },
          { userId: c.user_id, email: c.email, name: c.name, role: c.role, mode: 'daily' },
          lines,
          date,
        );
        return 1;
      });
      if (sent) out.set(c.organization_id, (out.get(c.organization_id) ?? 0) + sent);
    } catch (err) {
      logger.error({ err, user: c.user_id }, 'daily summary failed');
    }
  }
  return out;
}
