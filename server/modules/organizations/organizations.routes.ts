import type { EntityManager } from '@mikro-orm/postgresql';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { orgSettingsSchema } from '../../../shared/schemas/organization';
import { getShopProfile, updateShopProfile } from './organizations.service';

export function registerOrganizationRoutes(r: ApiRouter) {
  route(r, 'get', '/organization', { access: 'org.settings.manage' }, async (_req, res, { principal: who }) => {
    res.json(await getShopProfile(requestEm() as EntityManager, who));
  });

  route(r, 'patch', '/organization', { access: 'org.settings.manage', body: orgSettingsSchema }, async (_req, res, { body, principal: who }) => {
    res.json(await updateShopProfile(requestEm() as EntityManager, who, body));
  });
}
