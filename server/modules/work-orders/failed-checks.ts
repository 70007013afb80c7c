/**
 * A safety-critical checklist line that fails stops the sign-off until something is done about it:
 * the technician raises repair work (the machine is out of service until that repair is signed
 * off), or the safety officer signs a justified deviation with their password into the safety chain.
 */
import type { EntityManager } from '@mikro-orm/postgresql';
import type { Principal } from '../../http/principal';
import { conflict, notFound } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import { raiseWorkOrders } from './raise-work-orders';
import { OPEN, findWorkOrder } from './work-orders.queries';
import { takeOutOfService } from '../machines/machine-state.service';
import { appendSignOff } from '../safety/chain';
import { Machine } from '../machines/machine.entity';
import type { ChecklistLine, DeviationInput } from '../../../shared/schemas/work-orders';
import { clock } from '../../../shared/clock';

/** Failed safety-critical lines with nothing done about them yet: each one blocks the sign-off. */
export const unhandledSafetyFailures = (lines: ChecklistLine[]) => lines.filter((l) => l.safetyCritical && l.result === 'fail' && !l.followUp);

async function failedLine(tx: EntityManager, id: string, key: string) {
  const wo = await findWorkOrder(tx, id, true);
  if (!OPEN.includes(wo.status)) throw conflict(`WO ${wo.number} is closed; its checks cannot be followed up here any more`);
  const index = wo.checklist.findIndex((l) => l.key === key);
  if (index < 0) throw notFound(`Checklist line “${key}”`);
  const line = wo.checklist[index];
  if (!line.safetyCritical || line.result !== 'fail')
    throw conflict(`“${line.label}” is not a failed safety-critical check`, [
      { path: `checklist.${index}`, message: 'Only a failed safety-critical check is followed up' },
    ]);
  if (line.followUp)
    throw conflict(`“${line.label}” was already followed up (${line.followUp.kind === 'repair' ? `repair WO ${line.followUp.number}` : 'deviation signed'})`, [
      { path: `checklist.${index}`, message: 'Already followed up' },
    ]);
  return { wo, index, line };
}

/** Raises the repair and takes the machine out of service until it is signed off. */
export async function raiseRepairForFailedCheck(em: EntityManager, who: Principal, id: string, key: string, appUrl: string) {
  return em.transactional(async (tx) => {
    const { wo, index, line } = await failedLine(tx, id, key);
    const machine = await tx.findOneOrFail(Machine, { id: wo.machine.id });
    const title = `Repair: “${line.label}” failed on ${machine.code}`.slice(0, 160);
    const [repair] = await raiseWorkOrders(
      tx,
      who.orgId,
      who,
      [
        {
          standalone: {
            machineId: machine.id,
            kind: 'corrective',
            title,
            instructions: `The safety-critical check “${line.label}” failed in WO ${wo.number}${line.note ? ` (${line.note})` : ''}. The machine stays out of service until this repair is signed off.`,
            reason: `Failed safety check in WO ${wo.number}`,
            dueAt: clock.now(),
            assigneeId: null,
            responsibleRole: 'technician',
            requiresLockout: wo.requiresLockout,
            safetyCritical: true,
            raisedById: who.userId,
            auditDetails: { title, fromWorkOrder: wo.number, check: line.key },
          },
        },
      ],
      { mode: 'now', appUrl, reason: `${who.name} found a failed safety check`, skipUserId: who.userId },
    );
    await takeOutOfService(tx, who, {
      machineId: machine.id,
      kind: 'failure',
      reason: `Failed safety check: ${line.label} (WO ${wo.number})`,
      workOrderId: repair.id,
    });
    const lines = wo.checklist.map((l) => ({ ...l }));
    lines[index].followUp = { kind: 'repair', workOrderId: repair.id, number: repair.number, by: who.name, at: clock.now().toISOString() };
    wo.checklist = lines;
    recordActivity(tx, who, 'work-order.failed-check-repair', { type: 'WorkOrder', id: wo.id }, { check: line.key, repair: repair.number });
    return { id: repair.id, number: repair.number };
  });
}

/** The safety officer's signed deviation (the password was checked by the route before this runs). */
export async function acceptDeviation(em: EntityManager, who: Principal, id: string, key: string, input: DeviationInput) {
  return em.transactional(async (tx) => {
    const { wo, index, line } = await failedLine(tx, id, key);
    const sign = await appendSignOff(tx, who, {
      meaning: 'deviation-accepted',
      subjectType: 'WorkOrder',
      subjectId: wo.id,
      machineId: wo.machine.id,
      details: {
        summary: `WO ${wo.number}: “${line.label}” failed; runs under a deviation`,
        workOrder: wo.number,
        check: line.key,
        justification: input.justification,
      },
      note: input.justification,
    });
    const lines = wo.checklist.map((l) => ({ ...l }));
    lines[index].followUp = { kind: 'deviation', justification: input.justification, by: who.name, at: sign.signedAt.toISOString(), signOffId: sign.id };
    wo.checklist = lines;
    recordActivity(tx, who, 'work-order.failed-check-deviation', { type: 'WorkOrder', id: wo.id }, { check: line.key, signOffId: sign.id });
    return { signOffId: sign.id };
  });
}
