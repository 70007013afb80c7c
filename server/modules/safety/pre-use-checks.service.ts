/**
 * The signed pre-use check at the start of a shift. The signature goes on the shop's safety
 * chain like the PPE check; a failed line raises the repair through the fault-report path, and
 * a failed safety-critical line also takes the machine out of service there, in one transaction.
 */
import { randomUUID } from 'node:crypto';
import type { EntityManager } from '@mikro-orm/postgresql';
import { PreUseCheck, type IPreUseCheck } from './pre-use-check.entity';
import { Meter } from '../meters/meter.entity';
import { appendSignOff } from './chain';
import { machineByCode } from '../machines/machines.service';
import { machineStatus, machineStatuses } from '../machines/machine-state.service';
import { reportFault } from '../machines/fault-report.service';
import { recordActivity } from '../activity-log/activity-log.service';
import { badRequest, conflict, fieldError } from '../../http/errors';
import type { Principal } from '../../http/principal';
import { clock } from '../../../shared/clock';
import { MACHINE_KIND_LABELS, type MachineKind } from '../../../shared/schemas/machines';
import { evaluatePreUse, missedPreUseCheck, PRE_USE_LINES, PreUseAnswerError, preUseLinesFor, type PreUseLine } from '../../../shared/domain/pre-use-checks';
import type { PreUseCheckInput, PreUseCheckResult, PreUseCheckRow, PreUseCheckView } from '../../../shared/schemas/pre-use-checks';

function toRow(c: IPreUseCheck, machineCode: string, byName: string): PreUseCheckRow {
  return {
    id: c.id,
    machineCode,
    checkedAt: c.checkedAt.toISOString(),
    checkedBy: byName,
    pass: c.pass,
    safetyCriticalFailed: c.safetyCriticalFailed,
    lines: c.lines,
    signOffId: c.signOff.id,
    workOrderId: c.workOrderId ?? null,
    workOrderNumber: c.workOrderNumber ?? null,
  };
}

/** The lines for a machine; a reading's limits come from the machine's own condition meter in that unit, where it has limits. */
async function linesOf(em: EntityManager, machine: { id: string; kind: MachineKind }): Promise<PreUseLine[] | null> {
  const base = PRE_USE_LINES[machine.kind];
  if (!base) return null;
  const units = base.filter((l) => l.reading).map((l) => l.reading!.unit);
  const meters = units.length ? await em.find(Meter, { machine: machine.id, kind: 'condition', unit: { $in: units } }) : [];
  const limits: Record<string, { min: number | null; max: number | null; source: string }> = {};
  for (const l of base) {
    const m = meters.find((x) => x.unit === l.reading?.unit && (x.lowerLimit != null || x.upperLimit != null));
    if (m) limits[l.code] = { min: m.lowerLimit ?? null, max: m.upperLimit ?? null, source: `Limits of meter “${m.name}”` };
  }
  return preUseLinesFor(machine.kind, limits);
}

function noListError(code: string, kind: MachineKind) {
  return badRequest(`${code} is a ${MACHINE_KIND_LABELS[kind].toLowerCase()}; that kind of machine has no pre-use check`, [
    { path: 'code', message: `No pre-use check for a ${MACHINE_KIND_LABELS[kind].toLowerCase()}` },
  ]);
}

/**
 * The open repair raised by an earlier failed pre-use check of this machine whose failed lines
 * include every line failed now, if any (newest first): the new check is linked to it.
 */
async function openRepairFor(tx: EntityManager, machineId: string, failedCodes: string[]) {
  const rows = await tx.execute<{ work_order_id: string; work_order_number: number; lines: { code: string; ok: boolean }[] }[]>(
    `select c.work_order_id, c.work_order_number, c.lines
       from machine_pre_use_check c join work_order w on w.id = c.work_order_id
      where c.machine_id = ? and w.status not in ('done', 'cancelled')
      order by c.checked_at desc limit 20`,
    [machineId],
  );
  const covering = rows.find((r) => failedCodes.every((code) => r.lines.some((l) => l.code === code && !l.ok)));
  return covering ? { workOrderId: covering.work_order_id, workOrderNumber: covering.work_order_number } : null;
}

export async function recordPreUseCheck(em: EntityManager, who: Principal, code: string, input: PreUseCheckInput, appUrl: string): Promise<PreUseCheckResult> {
  return em.transactional(async (tx) => {
    const machine = await machineByCode(tx, code);
    const lines = await linesOf(tx, machine);
    if (!lines) throw noListError(machine.code, machine.kind);
    if (!machine.active)
      throw conflict(`Machine ${machine.code} is deactivated; it takes no pre-use check`, [{ path: 'code', message: `${machine.code} is deactivated` }]);
    let result;
    try {
      result = evaluatePreUse(lines, input.answers);
    } catch (e) {
      if (e instanceof PreUseAnswerError) throw fieldError(e.field, e.message);
      throw e;
    }
    // The sign-off names the check and the check points at its sign-off: the id comes first.
    const checkId = randomUUID();
    const failedText = result.failed.map((f) => `${f.label}: ${f.problem}`).join('; ');
    const signOff = await appendSignOff(tx, who, {
      meaning: 'pre-use-check-done',
      subjectType: 'pre-use-check',
      subjectId: checkId,
      machineId: machine.id,
      details: {
        summary: `${machine.code} pre-use check: ${result.pass ? 'all lines OK' : `failed ${failedText}`}`,
        lines: result.lines.map((l) => ({ code: l.code, ok: l.ok, value: l.value, safetyCritical: l.safetyCritical })),
        safetyCriticalFailed: result.safetyCriticalFailed,
      },
    });
    let repair: { workOrderId: string; workOrderNumber: number } | null = null;
    // The same worn line found again next shift belongs to the repair already raised for it, not a new one.
    if (!result.pass && !result.safetyCriticalFailed)
      repair = await openRepairFor(
        tx,
        machine.id,
        result.failed.map((f) => f.code),
      );
    if (!result.pass && !repair) {
      // The fault-report path raises the repair and, for a safety-critical failure, stops the machine linked to it.
      const critical = result.failed.filter((f) => f.safetyCritical).map((f) => f.label);
      const raised = await reportFault(
        tx,
        who,
        machine.code,
        {
          description: `Pre-use check failed${critical.length ? ` (safety-critical: ${critical.join(', ')})` : ''}\n${result.failed.map((f) => `- ${f.label}: ${f.problem}`).join('\n')}`,
          takeOutOfService: result.safetyCriticalFailed,
          failureCode: null,
        },
        appUrl,
      );
      repair = { workOrderId: raised.workOrderId, workOrderNumber: raised.workOrderNumber };
    }
    const check = tx.create(PreUseCheck, {
      id: checkId,
      organization: who.orgId,
      machine: machine.id,
      person: who.userId,
      checkedAt: signOff.signedAt,
      lines: result.lines,
      pass: result.pass,
      safetyCriticalFailed: result.safetyCriticalFailed,
      signOff,
      workOrderId: repair?.workOrderId ?? null,
      workOrderNumber: repair?.workOrderNumber ?? null,
    });
    recordActivity(
      tx,
      who,
      'machine.pre-use-check',
      { type: 'Machine', id: machine.id },
      { code: machine.code, pass: result.pass, failed: result.failed.map((f) => f.code), signOffId: signOff.id, workOrderId: repair?.workOrderId ?? null },
    );
    await tx.flush();
    const status = await machineStatus(tx, machine.id);
    return { ...toRow(check, machine.code, who.name), status: { state: status.state, since: status.since?.toISOString() ?? null, reason: status.reason } };
  });
}

/** The check screen: the machine's lines, whether today's check is still to do, and its latest checks. */
export async function preUseCheckView(em: EntityManager, who: Principal, code: string): Promise<PreUseCheckView> {
  const machine = await machineByCode(em, code);
  const lines = await linesOf(em, machine);
  const history = await em.find(PreUseCheck, { machine: machine.id }, { orderBy: { checkedAt: 'desc' }, limit: 20, populate: ['person'] });
  const status = await machineStatus(em, machine.id);
  const notSinceDayStart = missedPreUseCheck({ needsCheck: true, lastCheckAt: history[0]?.checkedAt ?? null, now: clock.now(), timeZone: who.timeZone });
  return {
    machineCode: machine.code,
    machineName: machine.name,
    lines,
    dueToday: !!lines && machine.active && status.state === 'in-service' && notSinceDayStart,
    checkedToday: !notSinceDayStart,
    status: { state: status.state, since: status.since?.toISOString() ?? null, reason: status.reason },
    history: history.map((c) => toRow(c, machine.code, (c.person.getEntity() as { name: string }).name)),
  };
}

/**
 * For the compliance summary: per machine (active, top-level), whether it has a list, its
 * latest check, and whether it missed today's (in service with a list, nothing since the shop's
 * day began in the shop's zone).
 */
export async function preUseCompliance(
  em: EntityManager,
  timeZone: string,
  machines: { id: string; kind: MachineKind }[],
): Promise<Map<string, { needed: boolean; lastAt: Date | null; missed: boolean }>> {
  const ids = machines.map((m) => m.id);
  const out = new Map<string, { needed: boolean; lastAt: Date | null; missed: boolean }>();
  if (!ids.length) return out;
  const statuses = await machineStatuses(em, ids);
  const last = await em
    .getConnection()
    .execute<{ machine_id: string; at: Date }[]>(
      `select machine_id, max(checked_at) as at from machine_pre_use_check where machine_id in (${ids.map(() => '?').join(',')}) group by machine_id`,
      ids,
    );
  const lastBy = new Map(last.map((l) => [l.machine_id, new Date(l.at)]));
  const now = clock.now();
  for (const m of machines) {
    const needed = !!PRE_USE_LINES[m.kind] && statuses.get(m.id)?.state === 'in-service';
    const lastAt = lastBy.get(m.id) ?? null;
    out.set(m.id, { needed, lastAt, missed: missedPreUseCheck({ needsCheck: needed, lastCheckAt: lastAt, now, timeZone }) });
  }
  return out;
}
