import type { EntityManager } from '@mikro-orm/postgresql';
import { randomUUID } from 'node:crypto';
import { ref } from '@mikro-orm/core';
import { DateTime } from 'luxon';
import { Membership, User } from '../users/user.entity';
import { Machine } from '../machines/machine.entity';
import { EnergyProcedure, ProcedureVersion } from './procedure.entity';
import { FireWatch, PeriodicInspection, TrainingRecord, type IFireWatch, type IPeriodicInspection } from './records.entity';
import { appendSignOff } from './chain';
import { conflict, fieldError, forbidden, notFound } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import type { Principal } from '../../http/principal';
import { loadSafetySettings } from './settings';
import { FIRE_WATCH_RULES, fireWatchUntil, type FireWatchRuleId } from '../../../shared/domain/hot-work';
import {
  TRAINING_KIND_LABELS,
  type EndFireWatchInput,
  type FireWatchRow,
  type InspectionInput,
  type InspectionRow,
  type StartFireWatchInput,
  type TrainingInput,
  type TrainingRow,
} from '../../../shared/schemas/safety-records';
import { clock } from '../../../shared/clock';
import { formatDateTime, type ShopClock } from '../../../shared/locale';

const AUTHORIZED = ['technician', 'safety'];
/** Times in signed summaries read as the shop's clock, with the zone named: a signed record is read outside the shop too. */
const local = (d: Date, shop: ShopClock) => `${formatDateTime(d, shop)} (${shop.timeZone})`;

async function approvedVersion(tx: EntityManager, procedureId: string) {
  const proc = await tx.findOne(EnergyProcedure, procedureId, { populate: ['machine'] });
  if (!proc) throw notFound('Procedure');
  const v = await tx.findOne(ProcedureVersion, { procedure: proc.id, status: 'approved' }, { orderBy: { version: 'desc' } });
  if (!v) throw conflict('This procedure has no approved version yet', [{ path: 'procedureId', message: 'No approved version' }]);
  return { proc, v, machine: proc.machine.getEntity() };
}

async function activeMembers(tx: EntityManager, orgId: string, userIds: string[]) {
  const ms = await tx.find(Membership, { organization: orgId, user: { $in: userIds }, active: true }, { filters: false, populate: ['user'] });
  return new Map(ms.map((m) => [m.user.id, { name: m.user.getEntity().name, role: m.role }]));
}

function notInFuture(date: string, tz: string, path: string) {
  if (DateTime.fromISO(date, { zone: tz }).startOf('day') > DateTime.fromMillis(clock.ms()).setZone(tz).startOf('day'))
    throw fieldError(path, 'The date cannot be in the future');
}

/**
 * The periodic inspection (OSHA 29 CFR 1910.147(c)(6)): performed by an authorized employee
 * other than the ones using the procedure, naming the employees included. The signer is the inspector.
 */
export async function recordInspection(em: EntityManager, who: Principal, input: InspectionInput) {
  return em.transactional(async (tx) => {
    const { proc, v, machine } = await approvedVersion(tx, input.procedureId);
    const { timeZone } = who;
    notInFuture(input.inspectedOn, timeZone, 'inspectedOn');
    const ids = [...new Set(input.employeeIds)];
    if (ids.includes(who.userId)) {
      throw fieldError(
        'employeeIds',
        'You use this procedure in this inspection, so you cannot inspect it: the inspector must be an authorized employee other than the ones using the procedure (1910.147(c)(6)(i)(A))',
      );
    }
    const members = await activeMembers(tx, who.orgId, ids);
    const unknown = ids.filter((id) => !members.has(id));
    if (unknown.length) throw fieldError('employeeIds', 'Some of the employees are not active members of your shop');
    const employees = ids.map((id) => ({ id, name: members.get(id)!.name }));
    const deviationIds = [...new Set(input.deviationEmployeeIds ?? [])];
    const stray = deviationIds.filter((id) => !ids.includes(id));
    if (stray.length) throw fieldError('deviationEmployeeIds', 'Deviations can only be recorded against employees included in the inspection');
    if (deviationIds.length && !input.deviations) throw fieldError('deviations', 'Describe the deviations the named employees are to be retrained on');
    const deviationEmployees = employees.filter((e) => deviationIds.includes(e.id));
    // The sign-off names the record and the record points at its sign-off: the id comes first.
    const inspectionId = randomUUID();
    const signOff = await appendSignOff(tx, who, {
      meaning: 'inspection-performed',
      subjectType: 'periodic-inspection',
      subjectId: inspectionId,
      machineId: machine.id,
      details: {
        summary: `${machine.code} ${v.content.title} v${v.version}, ${input.inspectedOn}: ${employees.map((e) => e.name).join(', ')}`,
        procedureId: proc.id,
        procedureVersion: v.version,
        inspectedOn: input.inspectedOn,
        employees,
        findings: input.findings,
        deviations: input.deviations || null,
        deviationEmployees,
        responsibilitiesReviewed: true,
      },
    });
    const inspection = tx.create(PeriodicInspection, {
      id: inspectionId,
      organization: who.orgId,
      procedure: proc,
      procedureVersion: v.version,
      inspectedOn: input.inspectedOn,
      inspector: who.userId,
      employees,
      findings: input.findings,
      deviations: input.deviations || null,
      deviationEmployees,
      performedSignOff: signOff,
    });
    recordActivity(tx, who, 'safety.inspection-performed', { type: 'PeriodicInspection', id: inspection.id }, { signOffId: signOff.id });
    return { id: inspection.id, signOffId: signOff.id };
  });
}

/** The employer's certification of the inspection (1910.147(c)(6)(ii)), signed by the safety officer. */
export async function certifyInspection(em: EntityManager, who: Principal, id: string) {
  return em.transactional(async (tx) => {
    await tx.execute('select id from safety_inspection where id = ? and organization_id = ? for update', [id, who.orgId]);
    const ins = await tx.findOne(PeriodicInspection, id, { populate: ['procedure.machine', 'inspector'] });
    if (!ins) throw notFound('Inspection');
    if (ins.certifiedAt) throw conflict('This inspection is already certified');
    const machine = ins.procedure.getEntity().machine.getEntity();
    const signOff = await appendSignOff(tx, who, {
      meaning: 'inspection-certified',
      subjectType: 'periodic-inspection',
      subjectId: ins.id,
      machineId: machine.id,
      details: {
        summary: `${machine.code} ${ins.procedure.getEntity().title} v${ins.procedureVersion}: inspected ${ins.inspectedOn} by ${ins.inspector.getEntity().name}; employees ${ins.employees.map((e) => e.name).join(', ')}`,
        procedureId: ins.procedure.id,
        procedureVersion: ins.procedureVersion,
        inspectedOn: ins.inspectedOn,
        inspectorId: ins.inspector.id,
        inspectorName: ins.inspector.getEntity().name,
        employees: ins.employees,
        performedSignOffId: ins.performedSignOff.id,
      },
    });
    ins.certifiedAt = signOff.signedAt;
    ins.certifiedBy = tx.getReference(User, who.userId, { wrapped: true });
    ins.certifySignOff = ref(signOff);
    recordActivity(tx, who, 'safety.inspection-certified', { type: 'PeriodicInspection', id: ins.id }, { signOffId: signOff.id });
    return { id: ins.id, signOffId: signOff.id };
  });
}

function inspectionRow(i: IPeriodicInspection): InspectionRow {
  const proc = i.procedure.getEntity();
  const machine = proc.machine.getEntity();
  return {
    id: i.id,
    procedureId: proc.id,
    procedureTitle: proc.title,
    procedureVersion: i.procedureVersion,
    machineCode: machine.code,
    machineName: machine.name,
    inspectedOn: i.inspectedOn,
    inspectorId: i.inspector.id,
    inspectorName: i.inspector.getEntity().name,
    employees: i.employees,
    findings: i.findings,
    deviations: i.deviations ?? null,
    deviationEmployees: i.deviationEmployees ?? [],
    certifiedAt: i.certifiedAt ? i.certifiedAt.toISOString() : null,
    certifiedByName: i.certifiedBy?.getEntity().name ?? null,
  };
}

export async function listInspections(em: EntityManager): Promise<InspectionRow[]> {
  const rows = await em.find(
    PeriodicInspection,
    {},
    { populate: ['procedure.machine', 'inspector', 'certifiedBy'], orderBy: { inspectedOn: 'desc', createdAt: 'desc' }, limit: 500 },
  );
  return rows.map(inspectionRow);
}

/** The version a person must have been trained on: the newest approved (or since superseded) version that asked for retraining. */
async function requiredVersions(em: EntityManager, procedureIds: string[]) {
  const rows = await em.find(ProcedureVersion, { procedure: { $in: procedureIds }, status: { $in: ['approved', 'superseded'] } });
  const out = new Map<string, { required: number; current: number }>();
  for (const v of rows) {
    const cur = out.get(v.procedure.id) ?? { required: 0, current: 0 };
    if (v.retrainingRequired || v.version === 1) cur.required = Math.max(cur.required, v.version);
    if (v.status === 'approved') cur.current = Math.max(cur.current, v.version);
    out.set(v.procedure.id, cur);
  }
  return out;
}

export async function recordTraining(em: EntityManager, who: Principal, input: TrainingInput) {
  return em.transactional(async (tx) => {
    const { proc, v, machine } = await approvedVersion(tx, input.procedureId);
    const { timeZone } = who;
    notInFuture(input.trainedOn, timeZone, 'trainedOn');
    const members = await activeMembers(tx, who.orgId, [input.userId]);
    const person = members.get(input.userId);
    if (!person) throw fieldError('userId', 'This person is not an active member of your shop');
    if (input.kind === 'authorized' && !AUTHORIZED.includes(person.role)) {
      throw fieldError(
        'kind',
        `${person.name} is not in an authorized-employee role (technician or safety officer); record affected-employee or minor-servicing training instead`,
      );
    }
    const minorTask = input.kind === 'minor-servicing' ? (input.minorTask ?? '') : null;
    if (minorTask !== null && !(v.content.minorTasks ?? []).some((t) => t.key === minorTask)) {
      const named = (v.content.minorTasks ?? []).map((t) => t.key).join(', ');
      throw fieldError(
        'minorTask',
        named ? `Choose one of the procedure's minor-servicing tasks: ${named}` : `Version ${v.version} of this procedure names no minor-servicing task`,
      );
    }
    const recordId = randomUUID();
    const signOff = await appendSignOff(tx, who, {
      meaning: 'training-recorded',
      subjectType: 'training',
      subjectId: recordId,
      machineId: machine.id,
      details: {
        summary: `${person.name}: ${machine.code} ${v.content.title} v${v.version}, ${TRAINING_KIND_LABELS[input.kind].split(' (')[0].toLowerCase()}, ${input.trainedOn}`,
        personId: input.userId,
        personName: person.name,
        procedureId: proc.id,
        procedureVersion: v.version,
        kind: input.kind,
        minorTask,
        trainedOn: input.trainedOn,
      },
      note: input.note || null,
    });
    const record = tx.create(TrainingRecord, {
      id: recordId,
      organization: who.orgId,
      person: input.userId,
      procedure: proc,
      procedureVersion: v.version,
      kind: input.kind,
      minorTask,
      trainedOn: input.trainedOn,
      trainer: who.userId,
      note: input.note || null,
      signOff,
    });
    recordActivity(tx, who, 'safety.training-recorded', { type: 'TrainingRecord', id: record.id }, { signOffId: signOff.id });
    return { id: record.id, signOffId: signOff.id };
  });
}

/** Latest training per person, procedure and kind, with "retrain" where a later version asked for it. */
export async function listTraining(em: EntityManager): Promise<TrainingRow[]> {
  const all = await em.find(TrainingRecord, {}, { populate: ['person', 'procedure.machine', 'trainer'], orderBy: { trainedOn: 'desc', createdAt: 'desc' } });
  const latest = new Map<string, (typeof all)[number]>();
  for (const r of all) {
    const key = `${r.person.id}:${r.procedure.id}:${r.kind}:${r.minorTask ?? ''}`;
    if (!latest.has(key)) latest.set(key, r); // newest first, so the first one seen is the latest
  }
  const req = await requiredVersions(em, [...new Set(all.map((r) => r.procedure.id))]);
  return [...latest.values()]
    .map((r) => {
      const v = req.get(r.procedure.id) ?? { required: 0, current: 0 };
      const proc = r.procedure.getEntity();
      return {
        id: r.id,
        userId: r.person.id,
        personName: r.person.getEntity().name,
        procedureId: proc.id,
        procedureTitle: proc.title,
        machineCode: proc.machine.getEntity().code,
        kind: r.kind,
        minorTask: r.minorTask ?? null,
        trainedOn: r.trainedOn,
        trainedVersion: r.procedureVersion,
        currentVersion: v.current || null,
        status: r.procedureVersion < v.required ? ('retrain' as const) : ('current' as const),
        trainerName: r.trainer.getEntity().name,
      };
    })
    .sort((a, b) => (a.status === b.status ? a.personName.localeCompare(b.personName) : a.status === 'retrain' ? -1 : 1));
}

function fireWatchRow(f: IFireWatch): FireWatchRow {
  const rule = FIRE_WATCH_RULES[f.rule as FireWatchRuleId];
  const machine = f.machine.getEntity();
  return {
    id: f.id,
    machineCode: machine.code,
    machineName: machine.name,
    watcherId: f.watcher.id,
    watcherName: f.watcher.getEntity().name,
    cuttingEndedAt: f.cuttingEndedAt.toISOString(),
    until: f.until.toISOString(),
    rule: f.rule,
    ruleLabel: rule?.label ?? f.rule,
    ruleSource: rule?.source ?? '',
    followUp: rule?.followUpMonitoring?.description ?? null,
    endedAt: f.endedAt ? f.endedAt.toISOString() : null,
    area: f.area ?? null,
  };
}

export async function listFireWatches(em: EntityManager): Promise<FireWatchRow[]> {
  const rows = await em.find(FireWatch, {}, { populate: ['machine', 'watcher'], orderBy: { cuttingEndedAt: 'desc' }, limit: 50 });
  return rows.map(fireWatchRow).sort((a, b) => Number(a.endedAt !== null) - Number(b.endedAt !== null));
}

/** Fire watch after plasma cutting; the rule (and so the minimum time) is the site's choice. */
export async function startFireWatch(em: EntityManager, who: Principal, input: StartFireWatchInput) {
  return em.transactional(async (tx) => {
    const machine = await tx.findOne(Machine, input.machineId);
    if (!machine) throw notFound('Machine');
    const { settings, timeZone } = await loadSafetySettings(tx, who.orgId);
    const now = clock.now();
    const ended = input.cuttingEndedAt ? new Date(input.cuttingEndedAt) : now;
    if (ended.getTime() > now.getTime() + 60_000) throw fieldError('cuttingEndedAt', 'Cutting cannot have ended in the future');
    if (now.getTime() - ended.getTime() > 24 * 3600_000)
      throw fieldError('cuttingEndedAt', 'Cutting ended more than a day ago; a fire watch starts when cutting stops');
    const rule = settings.fireWatchRule;
    const until = fireWatchUntil(ended, rule);
    const fireWatchId = randomUUID();
    const signOff = await appendSignOff(tx, who, {
      meaning: 'fire-watch-started',
      subjectType: 'fire-watch',
      subjectId: fireWatchId,
      machineId: machine.id,
      details: {
        summary: `${machine.code}: cutting ended ${local(ended, { timeZone, locale: who.locale })}, watch until ${local(until, { timeZone, locale: who.locale })} (${FIRE_WATCH_RULES[rule].source})`,
        cuttingEndedAt: ended.toISOString(),
        until: until.toISOString(),
        rule,
        area: input.area || null,
      },
    });
    const fw = tx.create(FireWatch, {
      id: fireWatchId,
      organization: who.orgId,
      machine,
      watcher: who.userId,
      cuttingEndedAt: ended,
      until,
      rule,
      area: input.area || null,
      startSignOff: signOff,
    });
    recordActivity(tx, who, 'safety.fire-watch-started', { type: 'FireWatch', id: fw.id }, { signOffId: signOff.id });
    await tx.flush();
    await tx.populate(fw, ['watcher']);
    return fireWatchRow(fw);
  });
}

export async function endFireWatch(em: EntityManager, who: Principal, id: string, input: EndFireWatchInput) {
  return em.transactional(async (tx) => {
    await tx.execute('select id from safety_fire_watch where id = ? and organization_id = ? for update', [id, who.orgId]);
    const fw = await tx.findOne(FireWatch, id, { populate: ['machine', 'watcher'] });
    if (!fw) throw notFound('Fire watch');
    if (fw.endedAt) throw conflict('This fire watch has already ended');
    if (fw.watcher.id !== who.userId) throw forbidden(`${fw.watcher.getEntity().name} keeps this fire watch; only they can end it`);
    const now = clock.now();
    if (now < fw.until) {
      const mins = Math.ceil((fw.until.getTime() - now.getTime()) / 60_000);
      throw conflict(
        `Keep watching: the fire watch runs until ${formatDateTime(fw.until, who)} (${FIRE_WATCH_RULES[fw.rule as FireWatchRuleId]?.source ?? fw.rule}), ${mins} min to go`,
      );
    }
    const machine = fw.machine.getEntity();
    const signOff = await appendSignOff(tx, who, {
      meaning: 'fire-watch-ended',
      subjectType: 'fire-watch',
      subjectId: fw.id,
      machineId: machine.id,
      details: {
        summary: `${machine.code}: watched from ${local(fw.cuttingEndedAt, who)} to ${local(now, who)}, no fire found`,
        noFireFound: true,
        rule: fw.rule,
      },
      note: input.note || null,
    });
    fw.endedAt = signOff.signedAt;
    fw.endSignOff = ref(signOff);
    recordActivity(tx, who, 'safety.fire-watch-ended', { type: 'FireWatch', id: fw.id }, { signOffId: signOff.id });
    return fireWatchRow(fw);
  });
}
