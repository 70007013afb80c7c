import type { RequestHandler } from 'express';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { badRequest } from '../../http/errors';
import { singleFileUpload } from '../../http/upload';
import type { Config } from '../../config';
import { uuidParam } from '../../../shared/schemas/common';
import { machineCodeParam } from '../../../shared/schemas/machines';
import { faultReportSchema, returnToServiceSchema, takeOutOfServiceSchema, type MachineStatus } from '../../../shared/schemas/machine-state';
import { downtimeCodesSchema, failureCodeInputSchema, failureCodeUpdateSchema } from '../../../shared/schemas/failure-codes';
import { PHOTO_MAX_BYTES } from '../../../shared/schemas/photos';
import { machineByCode } from './machines.service';
import { machineStatus, returnToService, takeOutOfService, type MachineStatusValue } from './machine-state.service';
import { reportFault } from './fault-report.service';
import { assertShopCode, createFailureCode, listFailureCodes, setDowntimeCodes, updateFailureCode } from './failure-codes.service';

const upload = singleFileUpload('photo', PHOTO_MAX_BYTES, 'photo');

/** A fault may come as JSON, or as multipart with the fields in a JSON `data` part and an optional `photo`. */
const receiveFault: RequestHandler = (req, res, next) => {
  if (!req.is('multipart/form-data')) return next();
  upload(req, res, (err?: unknown) => {
    if (err) return next(err);
    try {
      req.body = JSON.parse(String(req.body?.data ?? '{}'));
    } catch {
      return next(badRequest('The fault details are not valid JSON (form field “data”)', [{ path: 'data', message: 'Not valid JSON' }]));
    }
    next();
  });
};

const wire = (s: MachineStatusValue): MachineStatus => ({ state: s.state, since: s.since?.toISOString() ?? null, reason: s.reason });

/** A machine's service state, stopping and returning it, faults reported at it, and the shop's failure codes. */
export function registerMachineStateRoutes(r: ApiRouter, config: Pick<Config, 'APP_URL'>) {
  route(r, 'get', '/machines/:code/status', { access: 'machines.read', params: machineCodeParam }, async (_req, res, { params }) => {
    const em = requestEm();
    const m = await machineByCode(em, params.code);
    res.json(wire(await machineStatus(em, m.id)));
  });
  route(
    r,
    'post',
    '/machines/:code/out-of-service',
    { access: 'machines.state', params: machineCodeParam, body: takeOutOfServiceSchema },
    async (_req, res, { params, body, principal: who }) => {
      const em = requestEm();
      const m = await machineByCode(em, params.code);
      if (body.failureCode) await assertShopCode(em, who.orgId, 'mode', body.failureCode, 'failureCode');
      await takeOutOfService(em, who, { machineId: m.id, reason: body.reason, kind: body.kind, failureCode: body.failureCode });
      res.status(201).json(wire(await machineStatus(em, m.id)));
    },
  );
  route(
    r,
    'post',
    '/machines/:code/return-to-service',
    { access: 'machines.state', params: machineCodeParam, body: returnToServiceSchema },
    async (_req, res, { params, body, principal: who }) => {
      const em = requestEm();
      const m = await machineByCode(em, params.code);
      await returnToService(em, who, { machineId: m.id, note: body.note });
      res.json(wire(await machineStatus(em, m.id)));
    },
  );
  route(
    r,
    'post',
    '/machines/:code/faults',
    { access: 'work-orders.raise', params: machineCodeParam, before: [receiveFault], body: faultReportSchema },
    async (req, res, { params, body, principal: who }) => {
      const photo = req.file ? { name: req.file.originalname, data: req.file.buffer } : undefined;
      res.status(201).json(await reportFault(requestEm(), who, params.code, body, config.APP_URL, photo));
    },
  );
  route(r, 'get', '/failure-codes', { access: 'machines.read' }, async (_req, res, { principal: who }) => {
    res.json(await listFailureCodes(requestEm(), who));
  });
  route(r, 'post', '/failure-codes', { access: 'failure-codes.manage', body: failureCodeInputSchema }, async (_req, res, { body, principal: who }) => {
    res.status(201).json(await createFailureCode(requestEm(), who, body));
  });
  route(
    r,
    'patch',
    '/failure-codes/:id',
    { access: 'failure-codes.manage', params: uuidParam, body: failureCodeUpdateSchema },
    async (_req, res, { params, body, principal: who }) => {
      res.json(await updateFailureCode(requestEm(), who, params.id, body));
    },
  );
  route(
    r,
    'patch',
    '/downtimes/:id',
    { access: 'machines.state', params: uuidParam, body: downtimeCodesSchema },
    async (_req, res, { params, body, principal: who }) => {
      await setDowntimeCodes(requestEm(), who, params.id, body);
      res.json({ ok: true });
    },
  );
}
