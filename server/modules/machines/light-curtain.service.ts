/**
 * The periodic light-curtain check of a press brake: the technician's measured stopping time,
 * the curtain's detection capability and the measured mounting distance, checked against the
 * ISO 13855 minimum distance. A failed check takes the brake out of service at once.
 */
import type { EntityManager } from '@mikro-orm/postgresql';
import { LightCurtainCheck, MachineDowntime, type ILightCurtainCheck } from './machine-state.entity';
import type { Principal } from '../../http/principal';
import { badRequest, conflict } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import { machineByCode } from './machines.service';
import { takeOutOfService } from './machine-state.service';
import { clock } from '../../../shared/clock';
import { checkLightCurtain, SafetyDistanceInputError } from '../../../shared/domain/safety-distance';
import type { LightCurtainCheckInput, LightCurtainCheckRow } from '../../../shared/schemas/machine-state';

function toRow(c: ILightCurtainCheck, byName: string): LightCurtainCheckRow {
  return {
    id: c.id,
    stoppingTimeMs: c.stoppingTimeMs,
    detectionCapabilityMm: c.detectionCapabilityMm,
    measuredDistanceMm: c.measuredDistanceMm,
    requiredDistanceMm: c.requiredDistanceMm,
    approachSpeedMmS: c.approachSpeedMmS,
    pass: c.pass,
    note: c.note ?? null,
    checkedAt: c.checkedAt.toISOString(),
    checkedBy: byName,
    tookOutOfService: !!c.downtime,
  };
}

export async function recordLightCurtainCheck(em: EntityManager, who: Principal, code: string, input: LightCurtainCheckInput): Promise<LightCurtainCheckRow> {
  return em.transactional(async (tx) => {
    const machine = await machineByCode(tx, code);
    if (machine.kind !== 'press-brake')
      throw badRequest(`${machine.code} is not a press brake; the light-curtain check is for press brakes`, [{ path: 'code', message: 'Not a press brake' }]);
    if (!machine.active)
      throw conflict(`Machine ${machine.code} is deactivated; it cannot take a check`, [{ path: 'code', message: `${machine.code} is deactivated` }]);
    let result;
    try {
      result = checkLightCurtain(input);
    } catch (e) {
      if (e instanceof SafetyDistanceInputError) throw badRequest(e.message, [{ path: e.field, message: e.message }]);
      throw e;
    }
    // The stop comes first: the check row is written once, with it (its table takes no updates).
    let downtimeId: string | null = null;
    if (!result.pass) {
      const alreadyDown = await tx.findOne(MachineDowntime, { machine: machine.id, endedAt: null });
      const stop = await takeOutOfService(tx, who, {
        machineId: machine.id,
        kind: 'failure',
        failureCode: null,
        reason: `Light curtain ${input.measuredDistanceMm} mm from the hazard; at least ${result.distanceMm} mm needed`,
      });
      if (!alreadyDown) downtimeId = stop.id;
    }
    const check = tx.create(LightCurtainCheck, {
      organization: who.orgId,
      machine: machine.id,
      stoppingTimeMs: input.stoppingTimeMs,
      detectionCapabilityMm: input.detectionCapabilityMm,
      measuredDistanceMm: input.measuredDistanceMm,
      requiredDistanceMm: result.distanceMm,
      approachSpeedMmS: result.approachSpeedMmS,
      pass: result.pass,
      note: input.note,
      checkedAt: clock.now(),
      checkedBy: who.userId,
      downtime: downtimeId,
    });
    recordActivity(
      tx,
      who,
      'machine.light-curtain-check',
      { type: 'Machine', id: machine.id },
      { ...input, requiredDistanceMm: result.distanceMm, approachSpeedMmS: result.approachSpeedMmS, pass: result.pass },
    );
    return toRow(check, who.name);
  });
}

export async function listLightCurtainChecks(em: EntityManager, code: string): Promise<LightCurtainCheckRow[]> {
  const machine = await machineByCode(em, code);
  const list = await em.find(LightCurtainCheck, { machine: machine.id }, { orderBy: { checkedAt: 'desc' }, limit: 20, populate: ['checkedBy'] });
  return list.map((c) => toRow(c, (c.checkedBy.getEntity() as { name: string }).name));
}
