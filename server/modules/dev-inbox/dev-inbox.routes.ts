import type { EntityManager } from '@mikro-orm/postgresql';
import { route, type ApiRouter } from '../../http/route';
import { type Principal } from '../../http/principal';
import { requestEm } from '../../db';
import { can } from '../../../shared/permissions';
import { notFound } from '../../http/errors';
import type { CapturedMail, FakeSmtp } from '../../mail/fake-smtp';

/** Mail that only its addressee may read, even in development: the link signs them in. */
const PERSONAL_KINDS = new Set(['password-reset']);

const bare = (id: string) => id.replace(/^<|>$/g, '');

/**
 * Which captured mails an admin may read: those queued for their own shop (the outbox row found
 * by Message-ID) to its members, except personal links. Mail the outbox did not queue is never
 * a shop's mail.
 */
async function shopMail(em: EntityManager, who: Principal, mails: CapturedMail[]): Promise<Set<number>> {
  const ids = [...new Set(mails.flatMap((m) => (m.messageId ? [bare(m.messageId)] : [])))];
  if (!ids.length) return new Set();
  const rows: { message_id: string; kind: string }[] = await em.getConnection().execute(
    `select o.message_id, o.kind from outbox_mail o
      where o.organization_id = ? and trim(both '<>' from o.message_id) in (${ids.map(() => '?').join(', ')})`,
    [who.orgId, ...ids],
  );
  const kindById = new Map(rows.map((r) => [bare(r.message_id), r.kind]));
  const recipients = [...new Set(mails.flatMap((m) => m.to))];
  const members: { email: string }[] = recipients.length
    ? await em.getConnection().execute(
        `select lower(u.email) as email from membership m join app_user u on u.id = m.user_id
          where m.organization_id = ? and lower(u.email) in (${recipients.map(() => '?').join(', ')})`,
        [who.orgId, ...recipients],
      )
    : [];
  const memberEmails = new Set(members.map((m) => m.email));
  const visible = new Set<number>();
  for (const m of mails) {
    const kind = m.messageId ? kindById.get(bare(m.messageId)) : undefined;
    if (kind && !PERSONAL_KINDS.has(kind) && m.to.length > 0 && m.to.every((a) => memberEmails.has(a))) visible.add(m.id);
  }
  return visible;
}

/**
 * The dev inbox: mails captured by the local fake SMTP server (never in production). Everyone
 * reads the mail addressed to them; an admin also reads the mail their shop sent to its members.
 */
export function registerDevInboxRoutes(r: ApiRouter, smtp: FakeSmtp | null, production: boolean) {
  route(r, 'get', '/dev/inbox', { access: 'mail.inbox.own' }, async (_req, res, { principal: who }) => {
    if (!smtp || production) throw notFound('Dev inbox (mail capture is off)');
    const mine = who.email.toLowerCase();
    const mails = [...smtp.mails];
    const admin = can(who.role, 'mail.inbox.shop');
    const shop = admin ? await shopMail(requestEm(), who, mails) : new Set<number>();
    res.json({ mails: mails.filter((m) => m.to.includes(mine) || shop.has(m.id)), scope: admin ? 'shop' : 'own' });
  });
}
