import type { Request, RequestHandler, Response } from 'express';
import type { EntityManager } from '@mikro-orm/postgresql';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import type { Principal } from '../../http/principal';
import { uuidParam } from '../../../shared/schemas/common';
import { confirmSignature } from './chain';
import { refusable, type EventContext } from './safety-events';
import {
  acknowledgeOutside,
  applyOutsideLocks,
  informOfRestrictions,
  listOutsideParties,
  outsidePartyContext,
  registerOutsideParty,
  removeOutsideLocks,
} from './outside-personnel.service';
import {
  acknowledgeOutsideSchema,
  informOutsideSchema,
  outsideLocksAppliedSchema,
  outsideLocksRemovedSchema,
  registerOutsidePartySchema,
} from '../../../shared/schemas/safety-outside-personnel';

const em = () => requestEm() as EntityManager;

type Signing<B extends { password: string }> = { body: B; params: { id: string }; query: unknown; principal: Principal };
/** The password is checked first, so a wrong one writes nothing; a refusal is recorded in the safety audit. */
const signed =
  <B extends { password: string }>(action: string, ctx: (id: string) => Promise<EventContext>, fn: (who: Principal, id: string, body: B) => Promise<unknown>) =>
  async (_req: Request, res: Response, { body, params, principal }: Signing<B>) => {
    await confirmSignature(em(), principal, body.password);
    res.status(201).json(await refusable(em(), principal, action, await ctx(params.id), () => fn(principal, params.id, body)));
  };

/** Outside personnel on a lockout (1910.147(f)(2)); `before` carries the signing routes' wrong-password limit. */
export function registerOutsidePersonnelRoutes(r: ApiRouter, signing: { before: RequestHandler[]; idempotent: boolean }) {
  route(
    r,
    'get',
    '/safety/lockouts/:id/outside-parties',
    { access: 'safety.read', params: uuidParam },
    async (_req, res, { params }) => void res.json(await listOutsideParties(em(), params.id)),
  );
  route(
    r,
    'post',
    '/safety/lockouts/:id/outside-parties',
    { access: 'safety.lockout.sign', params: uuidParam, body: registerOutsidePartySchema, ...signing },
    signed(
      'lockout.outside.register',
      async (id) => ({ lockoutId: id }),
      (who, id, body) => registerOutsideParty(em(), who, id, body),
    ),
  );
  const party = (id: string) => outsidePartyContext(em(), id);
  route(
    r,
    'post',
    '/safety/outside-parties/:id/acknowledge',
    { access: 'safety.lockout.sign', params: uuidParam, body: acknowledgeOutsideSchema, ...signing },
    signed('lockout.outside.acknowledge', party, (who, id, body) => acknowledgeOutside(em(), who, id, body)),
  );
  route(
    r,
    'post',
    '/safety/outside-parties/:id/inform',
    { access: 'safety.lockout.sign', params: uuidParam, body: informOutsideSchema, ...signing },
    signed('lockout.outside.inform', party, (who, id, body) => informOfRestrictions(em(), who, id, body)),
  );
  route(
    r,
    'post',
    '/safety/outside-parties/:id/locks-on',
    { access: 'safety.lockout.sign', params: uuidParam, body: outsideLocksAppliedSchema, ...signing },
    signed('lockout.outside.locks-on', party, (who, id) => applyOutsideLocks(em(), who, id)),
  );
  route(
    r,
    'post',
    '/safety/outside-parties/:id/locks-off',
    { access: 'safety.lockout.sign', params: uuidParam, body: outsideLocksRemovedSchema, ...signing },
    signed('lockout.outside.locks-off', party, (who, id, body) => removeOutsideLocks(em(), who, id, body)),
  );
}
