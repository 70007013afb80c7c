import type { EntityManager } from '@mikro-orm/postgresql';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { inviteUserSchema, listUsersQuery, updateMemberSchema } from '../../../shared/schemas/users';
import { uuidParam } from '../../../shared/schemas/common';
import { inviteMember, listMembers, resendInvitation, updateMember } from './users.service';
import type { Config } from '../../config';

export function registerUserRoutes(r: ApiRouter, config: Config) {
  route(r, 'get', '/users', { access: 'users.read', query: listUsersQuery }, async (_req, res, { query, principal: who }) => {
    res.json(await listMembers(requestEm() as EntityManager, who, query));
  });
  route(r, 'post', '/users', { access: 'users.manage', body: inviteUserSchema }, async (_req, res, { body, principal: who }) => {
    res.status(201).json(await inviteMember(requestEm() as EntityManager, who, body, config.APP_URL));
  });
  route(
    r,
    'patch',
    '/users/:id',
    { access: 'users.manage', params: uuidParam, body: updateMemberSchema },
    async (_req, res, { params, body, principal: who }) => {
      await updateMember(requestEm() as EntityManager, who, params.id, body);
      res.json({ ok: true });
    },
  );
  route(r, 'post', '/users/:id/resend-invitation', { access: 'users.manage', params: uuidParam }, async (_req, res, { params, principal: who }) => {
    await resendInvitation(requestEm() as EntityManager, who, params.id, config.APP_URL);
    res.json({ ok: true });
  });
}
