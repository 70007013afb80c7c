import type { EntityManager } from '@mikro-orm/postgresql';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { requirePrincipal } from '../../http/principal';
import { inviteUserSchema, listUsersQuery, updateMemberSchema } from '../../../shared/schemas/users';
import { uuidParam } from '../../../shared/schemas/common';
import { inviteMember, listMembers, resendInvitation, updateMember } from './users.service';
import type { Config } from '../../config';

export function registerUserRoutes(r: ApiRouter, config: Config) {
  route(r, 'get', '/users', { access: 'users.read', query: listUsersQuery }, async (req, res) => {
    res.json(await listMembers(requestEm() as EntityManager, requirePrincipal(req), res.locals.query));
  });
  route(r, 'post', '/users', { access: 'users.manage', body: inviteUserSchema }, async (req, res) => {
    res.status(201).json(await inviteMember(requestEm() as EntityManager, requirePrincipal(req), res.locals.body, config.APP_URL));
  });
  route(r, 'patch', '/users/:id', { access: 'users.manage', params: uuidParam, body: updateMemberSchema }, async (req, res) => {
    await updateMember(requestEm() as EntityManager, requirePrincipal(req), res.locals.params.id, res.locals.body);
    res.json({ ok: true });
  });
  route(r, 'post', '/users/:id/resend-invitation', { access: 'users.manage', params: uuidParam }, async (req, res) => {
    await resendInvitation(requestEm() as EntityManager, requirePrincipal(req), res.locals.params.id, config.APP_URL);
    res.json({ ok: true });
  });
}
