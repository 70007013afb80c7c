/** Who hears about maintenance work, and the words of those mails. Every one carries the work caution. */
import type { EntityManager } from '@mikro-orm/postgresql';
import { formatDate, formatDateTime, shopLocale, type ShopClock } from '../../../shared/locale';
import type { Role } from '../../../shared/permissions';
import type { NotifyMode } from '../../../shared/schemas/work-orders';
import { queueMail } from '../../mail/outbox';
import { renderMail, type MailLine } from '../../mail/templates';

export type Person = { userId: string; email: string; name: string; role: Role; mode: NotifyMode };

/** Active members of a shop who can sign in, with their notice preference (default: each notice). */
export async function loadPeople(em: EntityManager, orgId: string): Promise<Person[]> {
  const rows: { user_id: string; email: string; name: string; role: Role; mode: NotifyMode | null }[] = await em.execute(
    `select u.id as user_id, u.email, u.name, m.role, np.mode
       from membership m join app_user u on u.id = m.user_id
       left join notify_preference np on np.user_id = u.id and np.organization_id = m.organization_id
      where m.organization_id = ? and m.active and u.password_hash is not null`,
    [orgId],
  );
  return rows.map((r) => ({ userId: r.user_id, email: r.email, name: r.name, role: r.role, mode: r.mode ?? 'immediate' }));
}

export type WorkLine = {
  id: string;
  number: number;
  title: string;
  machineCode: string;
  machineName: string;
  dueAt: Date | null;
  overdue: boolean;
  safetyCritical: boolean;
  requiresLockout: boolean;
  assigneeId: string | null;
  responsibleRole: Role | null;
  reason?: string | null;
};

/** A work order as the notice, escalation and digest steps read it (joined with its machine's code and name). */
export type WorkRow = {
  id: string;
  number: number;
  title: string;
  due_at: Date | null;
  safety_critical: boolean;
  requires_lockout: boolean;
  assignee_id: string | null;
  responsible_role: Role | null;
  code: string;
  name: string;
};

export function workLine(r: WorkRow, overdue: boolean): WorkLine {
  return {
    id: r.id,
    number: r.number,
    title: r.title,
    machineCode: r.code,
    machineName: r.name,
    dueAt: r.due_at ? new Date(r.due_at) : null,
    overdue,
    safetyCritical: r.safety_critical,
    requiresLockout: r.requires_lockout,
    assigneeId: r.assignee_id,
    responsibleRole: r.responsible_role,
  };
}

/** The person named on the work, or else everyone holding its responsible role. */
export function responsibleFor(w: Pick<WorkLine, 'assigneeId' | 'responsibleRole'>, people: Person[]): Person[] {
  if (w.assigneeId) return people.filter((p) => p.userId === w.assigneeId);
  if (w.responsibleRole) return people.filter((p) => p.role === w.responsibleRole);
  return [];
}

export const workLink = (appUrl: string, id: string) => `${appUrl}/work-orders/${id}`;

function lineText(w: WorkLine, shop: ShopClock): string {
  const flags = [w.overdue ? 'PAST DUE' : null, w.safetyCritical ? 'safety work' : null, w.requiresLockout ? 'lockout required' : null].filter(Boolean);
  return `WO ${w.number} · ${w.machineCode} ${w.machineName} — ${w.title} (${w.dueAt ? `due ${formatDateTime(w.dueAt, shop, { weekday: true })}` : 'no due date'}${flags.length ? `; ${flags.join(', ')}` : ''})`;
}

/** A mail lists this many lines at most; the rest is a count and a link to the list. */
export const MAX_LINES = 30;

/** Each listed work order links to its own page, so nobody has to find it again in a list. */
function listText(lines: WorkLine[], ctx: Ctx): (string | MailLine)[] {
  const shop = shopClock(ctx);
  const shown: (string | MailLine)[] = lines.slice(0, MAX_LINES).map((w) => ({ text: lineText(w, shop), url: workLink(ctx.appUrl, w.id) }));
  return lines.length > MAX_LINES ? [...shown, `… and ${lines.length - MAX_LINES} more: see the list in Kerfbook.`] : shown;
}

/** Groups work lines per recipient so one pass sends each person at most one mail of a kind. */
export function groupByPerson(lines: WorkLine[], pick: (w: WorkLine) => Person[]): Map<string, { person: Person; lines: WorkLine[] }> {
  const out = new Map<string, { person: Person; lines: WorkLine[]; ids: Set<string> }>();
  for (const w of lines) {
    for (const p of pick(w)) {
      let g = out.get(p.userId);
      if (!g) out.set(p.userId, (g = { person: p, lines: [], ids: new Set() }));
      if (!g.ids.has(w.id)) {
        g.ids.add(w.id);
        g.lines.push(w);
      }
    }
  }
  return out;
}

type Ctx = { orgId: string; orgName: string; timeZone: string; appUrl: string };

/** Mail reads times and dates as the shop's screens do (shared/locale.ts). */
const shopClock = (ctx: Ctx): ShopClock => ({ timeZone: ctx.timeZone, locale: shopLocale() });

/** "New work for you": one mail per person per pass. Returns the number of mails queued. */
export function queueRaisedNotices(em: EntityManager, ctx: Ctx, lines: WorkLine[], people: Person[]): number {
  const groups = groupByPerson(lines, (w) => responsibleFor(w, people).filter((p) => p.mode === 'immediate'));
  for (const { person, lines: mine } of groups.values()) {
    const one = mine.length === 1 ? mine[0] : null;
    queueMail(em, {
      to: person.email,
      kind: 'work-raised',
      organizationId: ctx.orgId,
      subject: one ? `New work: WO ${one.number} ${one.title} on ${one.machineCode}` : `${mine.length} new work orders for you at ${ctx.orgName}`,
      ...renderMail({
        heading: one ? `WO ${one.number}: ${one.title}` : `${mine.length} new work orders`,
        paragraphs: [
          `Hello ${person.name},`,
          one ? `Kerfbook raised this work for you${one.reason ? ` because ${one.reason}` : ''}.` : 'Kerfbook raised this work for you:',
          ...listText(mine, ctx),
          'You can change how often Kerfbook mails you under My notices.',
        ],
        action: one
          ? { label: `Open WO ${one.number}`, url: workLink(ctx.appUrl, one.id) }
          : { label: 'Open my work', url: `${ctx.appUrl}/work-orders?assignee=me` },
        caution: true,
      }),
    });
  }
  return groups.size;
}

/** "Work assigned to you": told at once to someone who takes notices as they happen. Returns the number of mails queued. */
export function queueAssignedNotice(em: EntityManager, ctx: Ctx, line: WorkLine, person: Person, byName: string): number {
  if (person.mode !== 'immediate') return 0;
  queueMail(em, {
    to: person.email,
    kind: 'work-assigned',
    organizationId: ctx.orgId,
    subject: `Assigned to you: WO ${line.number} ${line.title} on ${line.machineCode}`,
    ...renderMail({
      heading: `WO ${line.number}: ${line.title}`,
      paragraphs: [
        `Hello ${person.name},`,
        `${byName} assigned this work to you.`,
        ...listText([line], ctx),
        'You can change how often Kerfbook mails you under My notices.',
      ],
      action: { label: `Open WO ${line.number}`, url: workLink(ctx.appUrl, line.id) },
      caution: true,
    }),
  });
  return 1;
}

/**
 * Past-due work: admins always hear of it; for safety work the safety officers too, and the people
 * responsible get a notice whatever their preference. Returns the number of mails queued.
 */
export function queueEscalations(em: EntityManager, ctx: Ctx, lines: WorkLine[], people: Person[]): number {
  let queued = 0;
  const supervisors = groupByPerson(lines, (w) => people.filter((p) => p.role === 'admin' || (w.safetyCritical && p.role === 'safety')));
  for (const { person, lines: mine } of supervisors.values()) {
    const safety = mine.some((w) => w.safetyCritical);
    queueMail(em, {
      to: person.email,
      kind: 'work-escalated',
      organizationId: ctx.orgId,
      subject: `${safety ? 'Safety work past due' : 'Work past due'}: ${mine.length === 1 ? `WO ${mine[0].number} ${mine[0].title}` : `${mine.length} work orders`}`,
      ...renderMail({
        heading: safety ? 'Safety work is past due' : 'Work is past due',
        paragraphs: [
          `Hello ${person.name},`,
          'This work is past its due point and not signed off yet:',
          ...listText(mine, ctx),
          'Please see that it is done or re-planned.',
        ],
        action: { label: 'Open past-due work', url: `${ctx.appUrl}/work-orders?due=overdue` },
        caution: true,
      }),
    });
    queued++;
  }
  const doers = groupByPerson(lines, (w) => responsibleFor(w, people).filter((p) => (w.safetyCritical ? true : p.mode === 'immediate')));
  for (const { person, lines: mine } of doers.values()) {
    const safety = mine.some((w) => w.safetyCritical);
    queueMail(em, {
      to: person.email,
      kind: safety ? 'work-overdue-safety' : 'work-overdue',
      organizationId: ctx.orgId,
      subject: `${safety ? 'Safety work past due' : 'Past due'}: ${mine.length === 1 ? `WO ${mine[0].number} ${mine[0].title}` : `${mine.length} of your work orders`}`,
      ...renderMail({
        heading: safety ? 'Your safety work is past due' : 'Your work is past due',
        paragraphs: [
          `Hello ${person.name},`,
          ...listText(mine, ctx),
          safety ? 'Notices about past-due safety work are always sent, whatever your notice setting.' : 'Your admin has been told as well.',
        ],
        action:
          mine.length === 1
            ? { label: `Open WO ${mine[0].number}`, url: workLink(ctx.appUrl, mine[0].id) }
            : { label: 'Open my work', url: `${ctx.appUrl}/work-orders?assignee=me` },
        caution: true,
      }),
    });
    queued++;
  }
  return queued;
}

/** The morning summary of one person's open work. */
export function queueDigest(em: EntityManager, ctx: Ctx, person: Person, lines: WorkLine[], localDate: string): void {
  const overdue = lines.filter((l) => l.overdue).length;
  queueMail(em, {
    to: person.email,
    kind: 'work-digest',
    organizationId: ctx.orgId,
    subject: `Your work for ${formatDate(localDate, shopClock(ctx))}: ${lines.length} open${overdue ? `, ${overdue} past due` : ''}`,
    ...renderMail({
      heading: `Open work for ${person.name}`,
      paragraphs: [`Summary for ${formatDate(localDate, shopClock(ctx))} at ${ctx.orgName}.`, ...listText(lines, ctx)],
      action: { label: 'Open my work', url: `${ctx.appUrl}/work-orders?assignee=me` },
      caution: true,
    }),
  });
}
