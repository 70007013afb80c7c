import type { EntityManager } from '@mikro-orm/postgresql';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { requirePrincipal } from '../../http/principal';
import { orgSettingsSchema } from '../../../shared/schemas/organization';
import { getShopProfile, updateShopProfile } from './organizations.service';

export function registerOrganizationRoutes(r: ApiRouter) {
  route(r, 'get', '/organization', { access: 'org.settings.manage' }, async (req, res) => {
    res.json(await getShopProfile(requestEm() as EntityManager, requirePrincipal(req)));
  });

  route(r, 'patch', '/organization', { access: 'org.settings.manage', body: orgSettingsSchema }, async (req, res) => {
    res.json(await updateShopProfile(requestEm() as EntityManager, requirePrincipal(req), res.locals.body));
  });
}
