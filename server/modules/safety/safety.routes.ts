import type { Request, RequestHandler, Response } from 'express';
import type { EntityManager } from '@mikro-orm/postgresql';
import { z } from 'zod';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import type { Principal } from '../../http/principal';
import { conflict, rateLimited } from '../../http/errors';
import { chainCopyKey, checkKeptCopy, recordChainCopy } from './chain-copy';
import { singleFileUpload } from '../../http/upload';
import type { Config } from '../../config';
import { uuidParam } from '../../../shared/schemas/common';
import { confirmSignature, verifyShopChain } from './chain';
import { loadSafetySettings, saveSafetySettings, settingsView } from './settings';
import { addPhoto, approveVersion, createProcedure, deletePhoto, getPhoto, getProcedure, listProcedures, saveDraft } from './procedures.service';
import { renderPlacard } from './placard';
import { acceptHandover, applyLockout, joinLockout, leaveLockout, offerHandover, releaseLockout, verifyLockout } from './lockout.service';
import { getLockout, listLockouts } from './lockout.queries';
import { listTestWindows, openTestWindow, reapplyAfterTest, reverifyAfterTest } from './testing-window.service';
import { openTestWindowSchema, reapplyAfterTestSchema, reverifyAfterTestSchema } from '../../../shared/schemas/safety-testing-window';
import { safetyMachines, safetyPeople } from './safety-lookups';
import { listRequirements, recordPpeCheck, retireRequirement, saveRequirement } from './ppe.service';
import {
  certifyInspection,
  endFireWatch,
  listFireWatches,
  listInspections,
  listTraining,
  recordInspection,
  recordTraining,
  startFireWatch,
} from './records.service';
import { correctSignOff } from './corrections.service';
import { compliance, exportCsv, exportPdf, listSignOffs, timeline } from './safety-audit.service';
import { listSafetyTasks } from './work';
import { listSafetyEvents, refusable } from './safety-events';
import { lockoutAuthorization } from './authorization';
import { listAbsentRemovals, signAbsentStep, startAbsentRemoval } from './absent-removal.service';
import { lockRegister } from './lock-register';
import { preUseCheckView, recordPreUseCheck } from './pre-use-checks.service';
import { preUseCheckSchema } from '../../../shared/schemas/pre-use-checks';
import { machineCodeParam } from '../../../shared/schemas/machines';
import { absentStepSchema, startAbsentRemovalSchema } from '../../../shared/schemas/safety-absent-removal';
import { listSafetyEventsQuery } from '../../../shared/schemas/safety-audit';
import { lockRegisterQuery } from '../../../shared/schemas/safety-lockout';
import {
  approveVersionSchema,
  createProcedureSchema,
  photoParams,
  photoUploadFields,
  procedureContentSchema,
  versionParams,
} from '../../../shared/schemas/safety-procedures';
import {
  acceptHandoverSchema,
  applyLockoutSchema,
  joinLockoutSchema,
  leaveLockoutSchema,
  listLockoutsQuery,
  offerHandoverSchema,
  releaseLockoutSchema,
  verifyLockoutSchema,
} from '../../../shared/schemas/safety-lockout';
import { ppeCheckSchema, ppeRequirementSchema } from '../../../shared/schemas/safety-ppe';
import {
  certifySchema,
  endFireWatchSchema,
  inspectionSchema,
  safetySettingsSchema,
  startFireWatchSchema,
  trainingSchema,
} from '../../../shared/schemas/safety-records';
import { chainHeadCopySchema, correctionSchema, exportSignOffsQuery, listSignOffsQuery } from '../../../shared/schemas/safety-sign-offs';
import { complianceQuery, timelineQuery } from '../../../shared/schemas/safety-audit';
import { PROCEDURE_PHOTO_MAX_BYTES } from '../../../shared/schemas/photos';

const em = () => requestEm() as EntityManager;

const upload = singleFileUpload('photo', PROCEDURE_PHOTO_MAX_BYTES, 'photo');

/** What a signing route's handler receives: every signing body carries the signer's password. */
type SigningInput<B extends { password: string }, P> = { body: B; params: P; query: unknown; principal: Principal };

/** Every signing route: the password is checked first, so a wrong one writes nothing. */
const signed =
  <B extends { password: string }, P>(fn: (input: SigningInput<B, P>) => Promise<unknown>) =>
  async (_req: Request, res: Response, input: SigningInput<B, P>) => {
    await confirmSignature(em(), input.principal, input.body.password);
    res.status(201).json(await fn(input));
  };

const mapQuery = z.object({ machineId: z.uuid().optional() });
const versionQuery = z.object({ version: z.coerce.number().int().min(1).optional() });

export function registerSafetyRoutes(r: ApiRouter, config: Config) {
  // A signature re-asks the password, so wrong passwords are limited per person as at sign-in.
  // Only wrong passwords count (a counter that also counted requests in flight would refuse
  // honest concurrent signatures).
  const failures = new Map<string, number[]>();
  const WINDOW_MS = 15 * 60_000;
  const recent = (userId: string) => (failures.get(userId) ?? []).filter((t) => Date.now() - t < WINDOW_MS);
  const signLimit: RequestHandler = (req, res, next) => {
    const userId = req.principal?.userId ?? 'anonymous';
    if (recent(userId).length >= config.LOGIN_LIMIT_PER_ACCOUNT) {
      return next(rateLimited('Too many wrong passwords at signing. Wait 15 minutes, or sign out and in again with the right password.'));
    }
    res.on('finish', () => {
      if (res.statusCode === 401) failures.set(userId, [...recent(userId), Date.now()]);
    });
    next();
  };
  const signing = { before: [signLimit], idempotent: true };

  // Pickers and settings.
  route(r, 'get', '/safety/machines', { access: 'safety.read' }, async (_req, res, { principal: who }) => void res.json(await safetyMachines(em(), who)));
  route(r, 'get', '/safety/people', { access: 'safety.read' }, async (_req, res, { principal: who }) => void res.json(await safetyPeople(em(), who)));
  route(
    r,
    'get',
    '/safety/settings',
    { access: 'safety.read' },
    async (_req, res, { principal: who }) => void res.json(settingsView((await loadSafetySettings(em(), who.orgId)).settings)),
  );
  route(
    r,
    'put',
    '/safety/settings',
    { access: 'safety.settings.manage', body: safetySettingsSchema },
    async (_req, res, { body, principal: who }) => void res.json(settingsView(await saveSafetySettings(em(), who, body))),
  );
  route(r, 'get', '/safety/tasks', { access: 'safety.read' }, async (_req, res, { principal: who }) => void res.json(await listSafetyTasks(em(), who.orgId)));

  // Energy-control procedures.
  route(r, 'get', '/safety/procedures', { access: 'safety.read' }, async (_req, res, { principal: who }) => void res.json(await listProcedures(em(), who)));
  route(
    r,
    'post',
    '/safety/procedures',
    { access: 'safety.procedures.draft', body: createProcedureSchema },
    async (_req, res, { body, principal: who }) => void res.status(201).json(await createProcedure(em(), who, body)),
  );
  route(
    r,
    'get',
    '/safety/procedures/:id',
    { access: 'safety.read', params: uuidParam, query: versionQuery },
    async (_req, res, { params, query, principal: who }) => void res.json(await getProcedure(em(), who, params.id, query.version)),
  );
  route(
    r,
    'put',
    '/safety/procedures/:id/draft',
    { access: 'safety.procedures.draft', params: uuidParam, body: procedureContentSchema },
    async (_req, res, { params, body, principal: who }) => void res.json(await saveDraft(em(), who, params.id, body)),
  );
  route(
    r,
    'post',
    '/safety/procedures/:id/versions/:version/approve',
    { access: 'safety.procedures.manage', params: versionParams, body: approveVersionSchema, ...signing },
    signed(({ params, body, principal: who }) =>
      refusable(em(), who, 'procedure.approve', { procedureId: params.id }, () =>
        approveVersion(em(), who, params.id, params.version, body.retrainingRequired),
      ),
    ),
  );
  route(
    r,
    'post',
    '/safety/procedures/:id/photos',
    { access: 'safety.procedures.draft', params: uuidParam, before: [upload], body: photoUploadFields },
    async (req, res, { params, body, principal: who }) => {
      res.status(201).json(await addPhoto(em(), who, params.id, req.file, body));
    },
  );
  route(r, 'get', '/safety/procedures/:id/photos/:photoId', { access: 'safety.read', params: photoParams }, async (_req, res, { params }) => {
    const photo = await getPhoto(em(), params.id, params.photoId);
    res.set('Content-Type', photo.mime).set('Cache-Control', 'private, max-age=3600').set('X-Content-Type-Options', 'nosniff').send(photo.data);
  });
  route(
    r,
    'delete',
    '/safety/procedures/:id/photos/:photoId',
    { access: 'safety.procedures.draft', params: photoParams },
    async (_req, res, { params, principal: who }) => {
      await deletePhoto(em(), who, params.id, params.photoId);
      res.status(204).end();
    },
  );
  route(
    r,
    'get',
    '/safety/procedures/:id/placard.pdf',
    { access: 'safety.read', params: uuidParam, query: versionQuery },
    async (_req, res, { params, query }) => {
      const { pdf, fileName } = await renderPlacard(em(), params.id, config.APP_URL, query.version);
      res.set('Content-Type', 'application/pdf').set('Content-Disposition', `inline; filename="${fileName}"`).send(pdf);
    },
  );

  // Lockout sessions.
  route(
    r,
    'get',
    '/safety/lockouts',
    { access: 'safety.read', query: listLockoutsQuery },
    async (_req, res, { query, principal: who }) => void res.json(await listLockouts(em(), who, query)),
  );
  route(
    r,
    'post',
    '/safety/lockouts',
    { access: 'safety.lockout.sign', body: applyLockoutSchema, ...signing },
    signed(({ body, principal: who }) => refusable(em(), who, 'lockout.apply', { procedureId: body.procedureId }, () => applyLockout(em(), who, body))),
  );
  route(
    r,
    'get',
    '/safety/lockouts/:id',
    { access: 'safety.read', params: uuidParam },
    async (_req, res, { params, principal: who }) => void res.json(await getLockout(em(), who, params.id)),
  );
  route(
    r,
    'post',
    '/safety/lockouts/:id/verify',
    { access: 'safety.lockout.sign', params: uuidParam, body: verifyLockoutSchema, ...signing },
    signed(({ params, body, principal: who }) =>
      refusable(em(), who, 'lockout.verify', { lockoutId: params.id }, () => verifyLockout(em(), who, params.id, body)),
    ),
  );
  route(
    r,
    'post',
    '/safety/lockouts/:id/join',
    { access: 'safety.lockout.sign', params: uuidParam, body: joinLockoutSchema, ...signing },
    signed(({ params, body, principal: who }) => refusable(em(), who, 'lockout.join', { lockoutId: params.id }, () => joinLockout(em(), who, params.id, body))),
  );
  route(
    r,
    'post',
    '/safety/lockouts/:id/leave',
    { access: 'safety.lockout.sign', params: uuidParam, body: leaveLockoutSchema, ...signing },
    signed(({ params, principal: who }) => refusable(em(), who, 'lockout.leave', { lockoutId: params.id }, () => leaveLockout(em(), who, params.id))),
  );
  route(
    r,
    'post',
    '/safety/lockouts/:id/handover',
    { access: 'safety.lockout.sign', params: uuidParam, body: offerHandoverSchema, ...signing },
    signed(({ params, body, principal: who }) =>
      refusable(em(), who, 'lockout.handover', { lockoutId: params.id }, () => offerHandover(em(), who, params.id, body)),
    ),
  );
  route(
    r,
    'post',
    '/safety/lockouts/:id/accept-handover',
    { access: 'safety.lockout.sign', params: uuidParam, body: acceptHandoverSchema, ...signing },
    signed(({ params, body, principal: who }) =>
      refusable(em(), who, 'lockout.accept-handover', { lockoutId: params.id }, () => acceptHandover(em(), who, params.id, body)),
    ),
  );
  route(
    r,
    'post',
    '/safety/lockouts/:id/release',
    { access: 'safety.lockout.sign', params: uuidParam, body: releaseLockoutSchema, ...signing },
    signed(({ params, body, principal: who }) =>
      refusable(em(), who, 'lockout.release', { lockoutId: params.id }, () => releaseLockout(em(), who, params.id, body)),
    ),
  );

  // Devices off for testing or positioning and back on (1910.147(f)(1)), each step signed by the holder.
  route(
    r,
    'get',
    '/safety/lockouts/:id/test-windows',
    { access: 'safety.read', params: uuidParam },
    async (_req, res, { params }) => void res.json(await listTestWindows(em(), params.id)),
  );
  route(
    r,
    'post',
    '/safety/lockouts/:id/test-windows',
    { access: 'safety.lockout.sign', params: uuidParam, body: openTestWindowSchema, ...signing },
    signed(({ params, body, principal: who }) =>
      refusable(em(), who, 'lockout.test-window', { lockoutId: params.id }, () => openTestWindow(em(), who, params.id, body)),
    ),
  );
  route(
    r,
    'post',
    '/safety/lockouts/:id/test-windows/reapply',
    { access: 'safety.lockout.sign', params: uuidParam, body: reapplyAfterTestSchema, ...signing },
    signed(({ params, body, principal: who }) =>
      refusable(em(), who, 'lockout.test-reapply', { lockoutId: params.id }, () => reapplyAfterTest(em(), who, params.id, body)),
    ),
  );
  route(
    r,
    'post',
    '/safety/lockouts/:id/test-windows/reverify',
    { access: 'safety.lockout.sign', params: uuidParam, body: reverifyAfterTestSchema, ...signing },
    signed(({ params, body, principal: who }) =>
      refusable(em(), who, 'lockout.test-reverify', { lockoutId: params.id }, () => reverifyAfterTest(em(), who, params.id, body)),
    ),
  );

  // Who may lock out with a procedure, and why not (the lockout form asks before signing).
  route(
    r,
    'get',
    '/safety/procedures/:id/authorization',
    { access: 'safety.read', params: uuidParam },
    async (_req, res, { params, principal: who }) => void res.json(await lockoutAuthorization(em(), who.userId, params.id)),
  );

  // Removing an absent employee's locks, step by step (1910.147(e)(3)).
  route(
    r,
    'get',
    '/safety/lockouts/:id/absent-removals',
    { access: 'safety.read', params: uuidParam },
    async (_req, res, { params }) => void res.json(await listAbsentRemovals(em(), params.id)),
  );
  route(
    r,
    'post',
    '/safety/lockouts/:id/absent-removals',
    { access: 'safety.lockout.absent-removal', params: uuidParam, body: startAbsentRemovalSchema, ...signing },
    signed(({ params, body, principal: who }) =>
      refusable(em(), who, 'lockout.absent-removal', { lockoutId: params.id }, () => startAbsentRemoval(em(), who, params.id, body)),
    ),
  );
  route(
    r,
    'post',
    '/safety/absent-removals/:id/steps',
    { access: 'safety.lockout.absent-removal', params: uuidParam, body: absentStepSchema, ...signing },
    signed(({ params, body, principal: who }) =>
      refusable(em(), who, `lockout.absent-removal.${body.step}`, { subjectId: params.id }, () => signAbsentStep(em(), who, params.id, body)),
    ),
  );

  // The lock register: every lock by number, where it hangs now and where it has been.
  route(
    r,
    'get',
    '/safety/locks',
    { access: 'safety.read', query: lockRegisterQuery },
    async (_req, res, { query, principal: who }) => void res.json(await lockRegister(em(), who, query)),
  );

  // PPE.
  route(
    r,
    'get',
    '/safety/ppe/requirements',
    { access: 'safety.read', query: mapQuery },
    async (_req, res, { query, principal: who }) => void res.json(await listRequirements(em(), who, query.machineId)),
  );
  route(
    r,
    'post',
    '/safety/ppe/requirements',
    { access: 'safety.ppe.manage', body: ppeRequirementSchema },
    async (_req, res, { body, principal: who }) => void res.status(201).json(await saveRequirement(em(), who, body)),
  );
  route(
    r,
    'put',
    '/safety/ppe/requirements/:id',
    { access: 'safety.ppe.manage', params: uuidParam, body: ppeRequirementSchema },
    async (_req, res, { params, body, principal: who }) => void res.json(await saveRequirement(em(), who, body, params.id)),
  );
  route(r, 'delete', '/safety/ppe/requirements/:id', { access: 'safety.ppe.manage', params: uuidParam }, async (_req, res, { params, principal: who }) => {
    await retireRequirement(em(), who, params.id);
    res.status(204).end();
  });
  route(
    r,
    'post',
    '/safety/ppe/checks',
    { access: 'safety.ppe.sign', body: ppeCheckSchema, ...signing },
    signed(({ body, principal: who }) => recordPpeCheck(em(), who, body)),
  );

  // The pre-use check at the start of a shift, signed on the same chain as the PPE check.
  route(r, 'get', '/machines/:code/pre-use-checks', { access: 'machines.read', params: machineCodeParam }, async (_req, res, { params, principal: who }) => {
    res.json(await preUseCheckView(em(), who, params.code));
  });
  route(
    r,
    'post',
    '/machines/:code/pre-use-checks',
    { access: 'machines.pre-use.sign', params: machineCodeParam, body: preUseCheckSchema, ...signing },
    signed(({ params, body, principal: who }) => recordPreUseCheck(em(), who, params.code, body, config.APP_URL)),
  );

  // Periodic inspections, training, hot work.
  route(r, 'get', '/safety/inspections', { access: 'safety.read' }, async (_req, res) => void res.json(await listInspections(em())));
  route(
    r,
    'post',
    '/safety/inspections',
    { access: 'safety.inspection.perform', body: inspectionSchema, ...signing },
    signed(({ body, principal: who }) => recordInspection(em(), who, body)),
  );
  route(
    r,
    'post',
    '/safety/inspections/:id/certify',
    { access: 'safety.inspection.certify', params: uuidParam, body: certifySchema, ...signing },
    signed(({ params, principal: who }) => certifyInspection(em(), who, params.id)),
  );
  route(r, 'get', '/safety/training', { access: 'safety.read' }, async (_req, res) => void res.json(await listTraining(em())));
  route(
    r,
    'post',
    '/safety/training',
    { access: 'safety.training.manage', body: trainingSchema, ...signing },
    signed(({ body, principal: who }) => recordTraining(em(), who, body)),
  );
  route(r, 'get', '/safety/fire-watches', { access: 'safety.read' }, async (_req, res) => void res.json(await listFireWatches(em())));
  route(
    r,
    'post',
    '/safety/fire-watches',
    { access: 'safety.hotwork.sign', body: startFireWatchSchema, ...signing },
    signed(({ body, principal: who }) => startFireWatch(em(), who, body)),
  );
  route(
    r,
    'post',
    '/safety/fire-watches/:id/end',
    { access: 'safety.hotwork.sign', params: uuidParam, body: endFireWatchSchema, ...signing },
    signed(({ params, body, principal: who }) => endFireWatch(em(), who, params.id, body)),
  );

  // The audit.
  route(
    r,
    'get',
    '/safety/sign-offs',
    { access: 'safety.audit', query: listSignOffsQuery },
    async (_req, res, { query, principal: who }) => void res.json(await listSignOffs(em(), who, query)),
  );
  route(
    r,
    'post',
    '/safety/sign-offs/:id/corrections',
    { access: 'safety.correct', params: uuidParam, body: correctionSchema, ...signing },
    signed(({ params, body, principal: who }) => correctSignOff(em(), who, params.id, body.note)),
  );
  route(
    r,
    'get',
    '/safety/events',
    { access: 'safety.audit', query: listSafetyEventsQuery },
    async (_req, res, { query, principal: who }) => void res.json(await listSafetyEvents(em(), who, query)),
  );
  route(
    r,
    'get',
    '/safety/chain/verify',
    { access: 'safety.audit' },
    async (_req, res, { principal: who }) => void res.json(await verifyShopChain(em(), who.orgId)),
  );
  const copyKey = chainCopyKey(config);
  route(r, 'post', '/safety/chain/copies', { access: 'safety.audit' }, async (_req, res, { principal: who }) => {
    const copy = await em().transactional((tx) => recordChainCopy(tx, copyKey, { id: who.orgId, name: who.orgName }, 'export', { madeById: who.userId }));
    if (!copy) throw conflict('No safety signatures yet: there is no chain head to copy.');
    res.status(201).json(copy);
  });
  route(
    r,
    'post',
    '/safety/chain/copies/check',
    { access: 'safety.audit', body: chainHeadCopySchema },
    async (_req, res, { body, principal: who }) => void res.json(await checkKeptCopy(em(), copyKey, who.orgId, body)),
  );
  route(
    r,
    'get',
    '/safety/audit/compliance',
    { access: 'safety.audit', query: complianceQuery },
    async (_req, res, { query, principal: who }) => void res.json(await compliance(em(), who, query.days)),
  );
  route(
    r,
    'get',
    '/safety/audit/timeline',
    { access: 'safety.audit', query: timelineQuery },
    async (_req, res, { query, principal: who }) => void res.json(await timeline(em(), who, query.weeks)),
  );
  route(r, 'get', '/safety/audit/export.csv', { access: 'safety.audit', query: exportSignOffsQuery }, async (_req, res, { query, principal: who }) => {
    const { csv, fileName, verification } = await exportCsv(em(), who, query);
    res
      .set('Content-Type', 'text/csv; charset=utf-8')
      .set('Content-Disposition', `attachment; filename="${fileName}"`)
      .set('X-Chain-Verified', String(verification.ok))
      .send(csv);
  });
  route(r, 'get', '/safety/audit/export.pdf', { access: 'safety.audit', query: exportSignOffsQuery }, async (_req, res, { query, principal: who }) => {
    const { pdf, fileName } = await exportPdf(em(), who, query);
    res.set('Content-Type', 'application/pdf').set('Content-Disposition', `attachment; filename="${fileName}"`).send(pdf);
  });
  // Other safety route files share the wrong-password limit of signing.
  return { signing };
}
