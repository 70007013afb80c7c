/**
 * Who may apply a lock with a procedure: a person with a current "authorized" training record on
 * the procedure's approved text (OSHA 29 CFR 1910.147(c)(7)(i)(A)); a role that could lock out is not
 * enough on its own. Current means: trained on the newest version that asked for retraining, and
 * not sent back to training by deviations a later periodic inspection recorded ((c)(6)(i)(B),
 * (c)(7)(iii)(B)). Minor-servicing training is per named task of the procedure ((a)(2)(ii) note).
 */
import type { EntityManager } from '@mikro-orm/postgresql';
import { EnergyProcedure, ProcedureVersion } from './procedure.entity';
import { PeriodicInspection, TrainingRecord } from './records.entity';
import { User } from '../users/user.entity';
import { forbidden } from '../../http/errors';
import type { LockoutAuthorization } from '../../../shared/schemas/safety-records';

/** The newest version a person must have been trained on, and the current approved version. */
export async function versionsToTrainOn(em: EntityManager, procedureId: string) {
  const rows = await em.find(ProcedureVersion, { procedure: procedureId, status: { $in: ['approved', 'superseded'] } });
  let required = 0;
  let current = 0;
  for (const v of rows) {
    if (v.retrainingRequired || v.version === 1) required = Math.max(required, v.version);
    if (v.status === 'approved') current = Math.max(current, v.version);
  }
  return { required, current, approved: rows.find((v) => v.status === 'approved') ?? null };
}

/** Deviations recorded about this person at a periodic inspection after the given training date. */
async function deviationsSince(em: EntityManager, procedureId: string, userId: string, trainedOn: string) {
  const rows = await em.find(PeriodicInspection, { procedure: procedureId, inspectedOn: { $gte: trainedOn } }, { orderBy: { inspectedOn: 'desc' } });
  return rows.filter((i) => i.inspectedOn >= trainedOn && (i.deviationEmployees ?? []).some((e) => e.id === userId));
}

export async function lockoutAuthorization(em: EntityManager, userId: string, procedureId: string): Promise<LockoutAuthorization> {
  const proc = await em.findOne(EnergyProcedure, procedureId, { populate: ['machine'] });
  const person = await em.findOne(User, userId, { filters: false });
  const name = person?.name ?? 'This person';
  if (!proc) return { authorized: false, reason: 'Procedure not found', currentVersion: null, trainedVersion: null, minorTasks: [] };
  const label = `${proc.machine.getEntity().code} “${proc.title}”`;
  const { required, current, approved } = await versionsToTrainOn(em, proc.id);
  const trainings = await em.find(TrainingRecord, { person: userId, procedure: proc.id }, { orderBy: { trainedOn: 'desc', createdAt: 'desc' } });
  const minorTasks = [
    ...new Set(
      trainings
        .filter((t) => t.kind === 'minor-servicing' && t.minorTask && t.procedureVersion >= required)
        .map((t) => t.minorTask!)
        .filter((k) => (approved?.content.minorTasks ?? []).some((m) => m.key === k)),
    ),
  ];
  const base = { currentVersion: current || null, minorTasks };
  if (!current) return { ...base, authorized: false, reason: `${label} has no approved version yet`, trainedVersion: null };
  const authorized = trainings.filter((t) => t.kind === 'authorized');
  const newest = authorized.reduce<(typeof authorized)[number] | null>((a, t) => (!a || t.procedureVersion > a.procedureVersion ? t : a), null);
  if (!newest) {
    return {
      ...base,
      authorized: false,
      trainedVersion: null,
      reason: `${name} has no authorized-employee training on ${label}; a role alone does not allow applying locks (OSHA 29 CFR 1910.147(c)(7)(i)(A))`,
    };
  }
  if (newest.procedureVersion < required) {
    return {
      ...base,
      authorized: false,
      trainedVersion: newest.procedureVersion,
      reason: `${name} was trained on version ${newest.procedureVersion} of ${label}; version ${required} changed it and needs retraining first (OSHA 29 CFR 1910.147(c)(7)(iii)(A))`,
    };
  }
  const latestDate = authorized.filter((t) => t.procedureVersion >= required).reduce((d, t) => (t.trainedOn > d ? t.trainedOn : d), '');
  const deviations = await deviationsSince(em, proc.id, userId, latestDate);
  // Training on the same day as the inspection counts as retraining only when recorded after it.
  const after = deviations.filter((i) => !authorized.some((t) => t.trainedOn > i.inspectedOn || (t.trainedOn === i.inspectedOn && t.createdAt > i.createdAt)));
  if (after.length) {
    return {
      ...base,
      authorized: false,
      trainedVersion: newest.procedureVersion,
      reason: `The periodic inspection of ${label} on ${after[0].inspectedOn} recorded deviations by ${name}; retraining comes first (OSHA 29 CFR 1910.147(c)(6)(i)(B), (c)(7)(iii)(B))`,
    };
  }
  return { ...base, authorized: true, trainedVersion: newest.procedureVersion, reason: null };
}

/** Refuses (403, with the reason) unless the person is currently authorized on the procedure. */
export async function requireAuthorized(em: EntityManager, userId: string, procedureId: string): Promise<void> {
  const a = await lockoutAuthorization(em, userId, procedureId);
  if (!a.authorized) throw forbidden(a.reason ?? 'Not authorized on this procedure');
}
