import { DateTime } from 'luxon';
import type { EntityManager, MikroORM } from '@mikro-orm/postgresql';
import { Organization } from '../organizations/organization.entity';
import { Machine } from '../machines/machine.entity';
import { EnergyProcedure, ProcedureVersion } from './procedure.entity';
import { PeriodicInspection, PpeCheck, PpeRequirement, SafetyTask, TrainingRecord, type ISafetyTask } from './records.entity';
import { safetySettingsOf } from './settings';
import { inspectionEvaluation, ppeEvaluation } from './due';
import { queueMail } from '../../mail/outbox';
import { renderMail } from '../../mail/templates';
import { loadConfig } from '../../config';
import type { SafetyTaskKind, SafetyTaskRow, TrainingKind } from '../../../shared/schemas/safety-records';
import { TASK_KIND_LABELS } from '../../../shared/schemas/safety-records';
import { clock } from '../../../shared/clock';
import { formatDate, shopLocale } from '../../../shared/locale';

/** Retraining is due this long after a changed procedure is approved (house rule). */
export const RETRAIN_DAYS = 14;
const DAY_MS = 86_400_000;

type Occurrence = {
  kind: SafetyTaskKind;
  key: string;
  title: string;
  machineId: string | null;
  procedureId?: string;
  personId?: string;
  trainingKind?: TrainingKind;
  dueAt: Date | null;
  status: 'due' | 'overdue';
};

/** Everything safety-related that is due or overdue in one shop right now. */
export async function currentSafetyWork(em: EntityManager, orgId: string, now: Date): Promise<Occurrence[]> {
  const org = await em.findOneOrFail(Organization, orgId);
  const settings = safetySettingsOf(org);
  const tz = org.timeZone;
  const out: Occurrence[] = [];

  // Periodic inspections, OSHA 29 CFR 1910.147(c)(6): at least every `inspectionIntervalMonths`.
  const procs = await em.find(EnergyProcedure, {}, { populate: ['machine'] });
  const versions = await em.find(ProcedureVersion, { status: { $in: ['approved', 'superseded'] } }, { orderBy: { version: 'asc' } });
  const inspections = await em.find(PeriodicInspection, { certifiedAt: { $ne: null } }, { orderBy: { inspectedOn: 'asc' } });
  for (const p of procs) {
    const mine = versions.filter((v) => v.procedure.id === p.id);
    const first = mine.find((v) => v.approvedAt)?.approvedAt;
    if (!first || !mine.some((v) => v.status === 'approved')) continue;
    const last = inspections.filter((i) => i.procedure.id === p.id).at(-1);
    const ev = inspectionEvaluation({
      firstApprovedAt: first,
      lastInspectedOn: last?.inspectedOn ?? null,
      months: settings.inspectionIntervalMonths,
      timeZone: tz,
      now,
    });
    if ((ev.status === 'due' || ev.status === 'overdue') && ev.occurrenceKey) {
      const m = p.machine.getEntity();
      out.push({
        kind: 'periodic-inspection',
        key: `${p.id}:${ev.occurrenceKey}`,
        title: `Periodic inspection of ${m.code} “${p.title}” (OSHA 29 CFR 1910.147(c)(6))`,
        machineId: m.id,
        procedureId: p.id,
        dueAt: ev.dueAt,
        status: ev.status,
      });
    }
  }

  // PPE checks per shift or per week.
  const reqs = await em.find(PpeRequirement, { active: true, cadence: { $ne: 'none' } }, { populate: ['machine'] });
  for (const r of reqs) {
    const last = await em.findOne(PpeCheck, { requirement: r.id }, { orderBy: { checkedAt: 'desc' } });
    const ev = ppeEvaluation({ cadence: r.cadence, settings, timeZone: tz, startedAt: r.createdAt, lastCheckAt: last?.checkedAt ?? null, now });
    if (ev && (ev.status === 'due' || ev.status === 'overdue') && ev.occurrenceKey) {
      const m = r.machine.getEntity();
      out.push({
        kind: 'ppe-check',
        key: `${r.id}:${ev.occurrenceKey}`,
        title: `PPE check at ${m.code}: ${r.task}`,
        machineId: m.id,
        dueAt: ev.dueAt,
        status: ev.status,
      });
    }
  }

  // Retraining after a procedure change that asked for it (1910.147(c)(7)(iii)).
  const trainings = await em.find(TrainingRecord, {}, { populate: ['person', 'procedure.machine'], orderBy: { trainedOn: 'desc', createdAt: 'desc' } });
  const seen = new Set<string>();
  for (const t of trainings) {
    const k = `${t.person.id}:${t.procedure.id}:${t.kind}`;
    if (seen.has(k)) continue;
    seen.add(k);
    const needing = versions.filter((v) => v.procedure.id === t.procedure.id && v.version > t.procedureVersion && v.retrainingRequired && v.approvedAt).at(-1);
    if (!needing) continue;
    const dueAt = new Date(needing.approvedAt!.getTime() + RETRAIN_DAYS * DAY_MS);
    const proc = t.procedure.getEntity();
    out.push({
      kind: 'retraining',
      key: `${k}:v${needing.version}`,
      title: `Retrain ${t.person.getEntity().name} on ${proc.machine.getEntity().code} “${proc.title}” version ${needing.version}`,
      machineId: proc.machine.id,
      procedureId: proc.id,
      personId: t.person.id,
      trainingKind: t.kind,
      dueAt,
      status: now > dueAt ? 'overdue' : 'due',
    });
  }
  // Deviations seen at a periodic inspection send the people concerned back to training
  // (1910.147(c)(6)(i)(B), (c)(7)(iii)(B)), due RETRAIN_DAYS after the inspection.
  const withDeviations = (await em.find(PeriodicInspection, {}, { populate: ['procedure.machine'] })).filter((i) => (i.deviationEmployees ?? []).length > 0);
  for (const ins of withDeviations) {
    const proc = ins.procedure.getEntity();
    for (const person of ins.deviationEmployees) {
      const retrained = trainings.some(
        (t) =>
          t.person.id === person.id &&
          t.procedure.id === proc.id &&
          (t.trainedOn > ins.inspectedOn || (t.trainedOn === ins.inspectedOn && t.createdAt > ins.createdAt)),
      );
      if (retrained) continue;
      const dueAt = new Date(DateTime.fromISO(ins.inspectedOn, { zone: tz }).toMillis() + RETRAIN_DAYS * DAY_MS);
      out.push({
        kind: 'retraining',
        key: `${person.id}:${proc.id}:deviation:${ins.id}`,
        title: `Retrain ${person.name} on ${proc.machine.getEntity().code} “${proc.title}”: deviations at the inspection of ${ins.inspectedOn}`,
        machineId: proc.machine.id,
        procedureId: proc.id,
        personId: person.id,
        trainingKind: 'authorized',
        dueAt,
        status: now > dueAt ? 'overdue' : 'due',
      });
    }
  }
  return out;
}

/**
 * The scheduled step: raises each due occurrence once as a safety task (unique key), closes
 * tasks that are no longer due, and mails the safety officers one digest of newly overdue work.
 */
export async function runSafetyDue(orm: MikroORM, now: Date, scope: { orgId?: string } = {}): Promise<Record<string, number>> {
  const orgs = await orm.em.fork().find(Organization, scope.orgId ? { id: scope.orgId } : {}, { orderBy: { createdAt: 'asc' } });
  const totals = { shops: 0, raised: 0, closed: 0, overdue: 0, mailsQueued: 0 };
  const appUrl = loadConfig().APP_URL;
  for (const org of orgs) {
    const em = orm.em.fork();
    em.setFilterParams('org', { orgId: org.id });
    await em.transactional(async (tx) => {
      const current = await currentSafetyWork(tx, org.id, now);
      const open = await tx.find(SafetyTask, { status: { $in: ['due', 'overdue'] } });
      const byKey = new Map(open.map((t) => [`${t.kind}|${t.occurrenceKey}`, t]));
      const currentKeys = new Set(current.map((o) => `${o.kind}|${o.key}`));
      for (const t of open) {
        if (!currentKeys.has(`${t.kind}|${t.occurrenceKey}`)) {
          t.status = 'done';
          t.closedAt = now;
          totals.closed++;
        }
      }
      const newlyOverdue: ISafetyTask[] = [];
      for (const o of current) {
        let t = byKey.get(`${o.kind}|${o.key}`) ?? (await tx.findOne(SafetyTask, { kind: o.kind, occurrenceKey: o.key }));
        if (!t) {
          t = tx.create(SafetyTask, {
            organization: org.id,
            kind: o.kind,
            occurrenceKey: o.key,
            title: o.title,
            machine: o.machineId,
            dueAt: o.dueAt,
            status: o.status,
            raisedAt: now,
          });
          totals.raised++;
        } else if (t.status === 'done') {
          continue; // done and closed once; the same occurrence is not raised again
        } else {
          t.status = o.status;
          t.dueAt = o.dueAt;
        }
        if (o.status === 'overdue') totals.overdue++;
        if (o.status === 'overdue' && !t.overdueMailedAt) newlyOverdue.push(t);
      }
      if (newlyOverdue.length) {
        const officers = await tx.execute<{ email: string; name: string }[]>(
          `select u.email, u.name from membership m join app_user u on u.id = m.user_id where m.organization_id = ? and m.active and m.role = 'safety' order by u.email`,
          [org.id],
        );
        for (const o of officers) {
          queueMail(tx, {
            to: o.email,
            kind: 'safety-overdue',
            organizationId: org.id,
            subject: `Overdue safety work at ${org.name}: ${newlyOverdue.length} item${newlyOverdue.length === 1 ? '' : 's'}`,
            ...renderMail({
              heading: 'Overdue safety work',
              paragraphs: [
                `Hello ${o.name},`,
                `These safety tasks at ${org.name} are overdue:`,
                ...newlyOverdue.map(
                  (t) =>
                    `• ${TASK_KIND_LABELS[t.kind]}: ${t.title}${t.dueAt ? ` — due ${formatDate(t.dueAt, { timeZone: org.timeZone, locale: shopLocale() })}` : ''}`,
                ),
                'Each is listed once here; Kerfbook closes it when the work is signed off.',
              ],
              action: { label: 'Open the safety work list', url: `${appUrl}/safety` },
              caution: true,
            }),
          });
          totals.mailsQueued++;
        }
        for (const t of newlyOverdue) t.overdueMailedAt = now;
      }
    });
    totals.shops++;
  }
  return totals;
}

/**
 * What is due right now, evaluated live (so the list is current between scheduled passes),
 * with the raised time of the stored task where the pass has raised it already.
 */
export async function listSafetyTasks(em: EntityManager, orgId: string, now = clock.now()): Promise<SafetyTaskRow[]> {
  const current = await currentSafetyWork(em, orgId, now);
  const stored = await em.find(SafetyTask, { status: { $in: ['due', 'overdue'] } });
  const ids = [...new Set(current.map((o) => o.machineId).filter((x): x is string => !!x))];
  const machines = ids.length ? await em.find(Machine, { id: { $in: ids } }) : [];
  return current
    .map((o) => {
      const t = stored.find((x) => x.kind === o.kind && x.occurrenceKey === o.key);
      return {
        id: t?.id ?? `${o.kind}:${o.key}`,
        kind: o.kind,
        title: o.title,
        machineCode: machines.find((m) => m.id === o.machineId)?.code ?? null,
        dueAt: o.dueAt ? o.dueAt.toISOString() : null,
        status: o.status,
        raisedAt: (t?.raisedAt ?? now).toISOString(),
        machineId: o.machineId,
        procedureId: o.procedureId ?? null,
        personId: o.personId ?? null,
        trainingKind: o.trainingKind ?? null,
      };
    })
    .sort((a, b) => Number(b.status === 'overdue') - Number(a.status === 'overdue') || (a.dueAt ?? '').localeCompare(b.dueAt ?? ''));
}
