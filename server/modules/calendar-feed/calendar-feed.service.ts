import type { EntityManager } from '@mikro-orm/postgresql';
import { createHash, randomBytes } from 'node:crypto';
import ical from 'ical-generator';
import { CalendarFeed } from './calendar-feed.entity';
import { Membership } from '../users/user.entity';
import { Organization } from '../organizations/organization.entity';
import type { Principal } from '../../http/principal';
import { recordActivity } from '../activity-log/activity-log.service';
import { WORK_CAUTION } from '../../../shared/domain/cautions';
import { DUE_STATE_LABELS, type DueState } from '../../../shared/schemas/plans';
import type { CalendarFeedStatus } from '../../../shared/schemas/calendar-feed';
import type { Role } from '../../../shared/permissions';
import { clock } from '../../../shared/clock';

const hash = (token: string) => createHash('sha256').update(token).digest('hex');
const feedUrl = (appUrl: string, token: string) => `${appUrl}/api/calendar/${token}.ics`;
/** Plans not raised yet show up this far ahead. */
const HORIZON_DAYS = 60;

export async function feedStatus(em: EntityManager, who: Principal): Promise<CalendarFeedStatus> {
  const f = await em.findOne(CalendarFeed, { user: who.userId, revokedAt: null }, { orderBy: { createdAt: 'desc' } });
  return { active: !!f, createdAt: f?.createdAt.toISOString() ?? null, lastUsedAt: f?.lastUsedAt?.toISOString() ?? null, url: null };
}

/** Makes a new private URL (revoking any earlier one). The token is shown this once; only its hash is kept. */
export async function createFeed(em: EntityManager, who: Principal, appUrl: string): Promise<CalendarFeedStatus> {
  return em.transactional(async (tx) => {
    await tx.nativeUpdate(CalendarFeed, { user: who.userId, revokedAt: null }, { revokedAt: clock.now() });
    const token = randomBytes(32).toString('base64url');
    const f = tx.create(CalendarFeed, { organization: who.orgId, user: who.userId, tokenHash: hash(token) });
    recordActivity(tx, who, 'calendar-feed.created', { type: 'CalendarFeed', id: f.id });
    return { active: true, createdAt: clock.now().toISOString(), lastUsedAt: null, url: feedUrl(appUrl, token) };
  });
}

export async function revokeFeed(em: EntityManager, who: Principal): Promise<CalendarFeedStatus> {
  await em.transactional(async (tx) => {
    const n = await tx.nativeUpdate(CalendarFeed, { user: who.userId, revokedAt: null }, { revokedAt: clock.now() });
    if (n > 0) recordActivity(tx, who, 'calendar-feed.revoked', { type: 'CalendarFeed', id: null });
  });
  return { active: false, createdAt: null, lastUsedAt: null, url: null };
}

type WorkRow = {
  id: string;
  number: number;
  title: string;
  due_at: Date;
  estimated_minutes: number | null;
  code: string;
  name: string;
  overdue: boolean;
  requires_lockout: boolean;
};
type PlanRow = { id: string; title: string; next_due_at: Date; status: DueState; estimated_minutes: number | null; code: string; name: string };

/**
 * The iCalendar (RFC 5545) text of a feed token, or null when the token is unknown or revoked, or the
 * person no longer works in the shop. Public route: the token is the only credential, so the lookup
 * crosses shops by its hash and then reads only that person's shop.
 */
export async function renderFeed(em: EntityManager, token: string, appUrl: string): Promise<string | null> {
  const f = await em.findOne(CalendarFeed, { tokenHash: hash(token), revokedAt: null }, { filters: false, populate: ['user'] });
  if (!f) return null;
  const orgId = f.organization.id;
  const m = await em.findOne(Membership, { user: f.user.id, organization: orgId, active: true }, { filters: false });
  if (!m) return null;
  const org = await em.findOneOrFail(Organization, orgId, { filters: false });
  const role: Role = m.role;
  const work: WorkRow[] = await em.execute(
    `select w.id, w.number, w.title, w.due_at, w.estimated_minutes, m.code, m.name, w.overdue, w.requires_lockout
       from work_order w join machine m on m.id = w.machine_id
      where w.organization_id = ? and w.status in ('open', 'in-progress', 'on-hold') and w.due_at is not null
        and (w.assignee_id = ? or (w.assignee_id is null and w.responsible_role = ?))
      order by w.due_at limit 500`,
    [orgId, f.user.id, role],
  );
  const plans: PlanRow[] = await em.execute(
    `select p.id, p.title, p.next_due_at, p.status, p.estimated_minutes, m.code, m.name
       from maintenance_plan p join machine m on m.id = p.machine_id
      where p.organization_id = ? and p.active and p.next_due_at is not null and p.next_due_at < now() + interval '${HORIZON_DAYS * 24} hours'
        and (p.responsible_user_id = ? or (p.responsible_user_id is null and p.responsible_role = ?))
        and not exists (select 1 from work_order w where w.plan_id = p.id and w.status in ('open', 'in-progress', 'on-hold'))
      order by p.next_due_at limit 500`,
    [orgId, f.user.id, role],
  );
  await em.nativeUpdate(CalendarFeed, { id: f.id }, { lastUsedAt: clock.now() }, { filters: false });
  const cal = ical({
    name: `Kerfbook — ${f.user.getEntity().name} at ${org.name}`,
    prodId: { company: 'Kerfbook', product: 'due-work', language: 'EN' },
    timezone: org.timeZone,
    ttl: 3600,
  });
  const minutes = (n: number | null) => Math.max(15, n ?? 30) * 60_000;
  for (const w of work) {
    const start = new Date(w.due_at);
    cal.createEvent({
      id: `wo-${w.id}@kerfbook`,
      start,
      end: new Date(start.getTime() + minutes(w.estimated_minutes)),
      summary: `${w.overdue ? '[PAST DUE] ' : ''}WO ${w.number}: ${w.title} (${w.code})`,
      description: `${w.code} ${w.name}${w.requires_lockout ? '\nLockout/tagout required.' : ''}\n\nSafety: ${WORK_CAUTION}`,
      url: `${appUrl}/work-orders/${w.id}`,
    });
  }
  for (const p of plans) {
    const start = new Date(p.next_due_at);
    cal.createEvent({
      id: `plan-${p.id}@kerfbook`,
      start,
      end: new Date(start.getTime() + minutes(p.estimated_minutes)),
      summary: `${DUE_STATE_LABELS[p.status]}: ${p.title} (${p.code})`,
      description: `Forecast from the maintenance plan; a work order is raised when it falls due.\n\nSafety: ${WORK_CAUTION}`,
      url: `${appUrl}/plans/${p.id}`,
    });
  }
  return cal.toString();
}
