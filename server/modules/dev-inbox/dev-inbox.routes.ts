import { route, type ApiRouter } from '../../http/route';
import { can } from '../../../shared/permissions';
import { notFound } from '../../http/errors';
import type { FakeSmtp } from '../../mail/fake-smtp';

/** The dev inbox: mails captured by the local fake SMTP server. Admins see all, others their own. */
export function registerDevInboxRoutes(r: ApiRouter, smtp: FakeSmtp | null) {
  route(r, 'get', '/dev/inbox', { access: 'mail.inbox.own' }, (_req, res, { principal: who }) => {
    if (!smtp) throw notFound('Dev inbox (mail capture is off)');
    const all = can(who.role, 'mail.inbox.all');
    res.json({ mails: smtp.mails.filter((m) => all || m.to.includes(who.email.toLowerCase())), scope: all ? 'all' : 'own' });
  });
}
