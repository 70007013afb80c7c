import type { EntityManager } from '@mikro-orm/postgresql';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { orgSettingsSchema } from '../../../shared/schemas/organization';
import { Organization } from './organization.entity';
import { recordAudit } from '../audit/audit';

export function registerOrganizationRoutes(r: ApiRouter) {
  route(r, 'get', '/organization', { access: 'org.settings.manage' }, async (_req, res, { principal: who }) => {
    const org = await (requestEm() as EntityManager).findOneOrFail(Organization, who.orgId);
    res.json({ id: org.id, name: org.name, timeZone: org.timeZone });
  });

  route(r, 'patch', '/organization', { access: 'org.settings.manage', body: orgSettingsSchema }, async (_req, res, { body, principal: who }) => {
    const em = requestEm() as EntityManager;
    const org = await em.findOneOrFail(Organization, who.orgId);
    const before = { name: org.name, timeZone: org.timeZone };
    org.name = body.name;
    org.timeZone = body.timeZone;
    recordAudit(em, who, 'organization.updated', { type: 'Organization', id: org.id }, { before, after: body });
    await em.flush();
    res.json({ id: org.id, name: org.name, timeZone: org.timeZone });
  });
}
