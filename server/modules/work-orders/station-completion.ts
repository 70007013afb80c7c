/**
 * Station records that do a plan's work. A plan may name the record that counts as doing it (a
 * consumable change of given parts, a test coupon, a counter reading, a pre-use check); when that
 * record is made, the plan's open work order is signed off as done by the same person at the same
 * moment, linked to the record, and the plan's cycle restarts from it, so nobody enters it twice.
 */
import type { EntityManager } from '@mikro-orm/postgresql';
import { WorkOrder } from './work-order.entity';
import { MaintenancePlan, type IMaintenancePlan } from '../plans/plan.entity';
import { Machine } from '../machines/machine.entity';
import { User } from '../users/user.entity';
import type { Principal } from '../../http/principal';
import { recordActivity } from '../activity-log/activity-log.service';
import { restartPlanCycle } from './work-orders.service';
import { OPEN } from './work-orders.queries';
import type { TorchCategory } from '../../../shared/schemas/stock';

export type StationRecordType = 'ConsumableChange' | 'CutCheck' | 'MeterReading' | 'PreUseCheck';

export type StationRecord = {
  type: StationRecordType;
  id: string;
  /** The machine the record was made on (a torch for consumables and coupons). */
  machineId: string;
  at: Date;
  /** Words for the work order: what was recorded. */
  summary: string;
  categories?: TorchCategory[];
  meterId?: string;
};

export type StationCompletion = { workOrders: { id: string; number: number; planId: string }[]; planIds: string[] };

function satisfies(plan: IMaintenancePlan, rec: StationRecord): boolean {
  const rule = plan.stationRecord;
  if (!rule) return false;
  switch (rule.kind) {
    case 'consumable-change':
      // Every part the plan names must be in this change; a change of other parts does not count.
      return rec.type === 'ConsumableChange' && rule.categories.every((c) => rec.categories?.includes(c));
    case 'cut-check':
      return rec.type === 'CutCheck';
    case 'counter-reading':
      return rec.type === 'MeterReading' && rec.meterId === rule.meterId;
    case 'pre-use-check':
      return rec.type === 'PreUseCheck';
  }
}

/** The machine and everything it is part of: a torch's record also does its table's plans. */
async function machineAndParents(em: EntityManager, machineId: string): Promise<string[]> {
  const out: string[] = [];
  let id: string | undefined = machineId;
  while (id && !out.includes(id) && out.length < 6) {
    out.push(id);
    const m: { parent?: { id: string } | null } | null = await em.findOne(Machine, { id }, { fields: ['parent'] });
    id = m?.parent?.id;
  }
  return out;
}

/** Runs inside the transaction that writes the record, so the record and the work it does are one change. */
export async function completeByStationRecord(tx: EntityManager, who: Principal, rec: StationRecord): Promise<StationCompletion> {
  const machineIds = await machineAndParents(tx, rec.machineId);
  const plans = (await tx.find(MaintenancePlan, { machine: { $in: machineIds }, active: true, stationRecord: { $ne: null } })).filter((p) => satisfies(p, rec));
  const out: StationCompletion = { workOrders: [], planIds: [] };
  for (const plan of plans) {
    // Only work that was already waiting when the record was made; a back-dated record does not close later work.
    const open = await tx.find(WorkOrder, { plan: plan.id, status: { $in: OPEN }, createdAt: { $lte: rec.at } }, { orderBy: { number: 'asc' } });
    for (const wo of open) {
      wo.status = 'done';
      wo.startedAt ??= rec.at;
      wo.completedAt = rec.at;
      wo.completedBy = tx.getReference(User, who.userId, { wrapped: true });
      wo.stationRecordType = rec.type;
      wo.stationRecordId = rec.id;
      wo.stationRecordSummary = rec.summary.slice(0, 300);
      recordActivity(
        tx,
        who,
        'work-order.done-at-station',
        { type: 'WorkOrder', id: wo.id },
        { record: { type: rec.type, id: rec.id }, summary: rec.summary, at: rec.at.toISOString() },
      );
      out.workOrders.push({ id: wo.id, number: wo.number, planId: plan.id });
    }
    await restartPlanCycle(tx, who, plan.id, rec.at);
    out.planIds.push(plan.id);
  }
  return out;
}

/** The work orders each record did, for the record's own list (the other half of the link). */
export async function workDoneBy(em: EntityManager, recordIds: string[]): Promise<Map<string, { id: string; number: number; title: string }[]>> {
  const out = new Map<string, { id: string; number: number; title: string }[]>();
  if (recordIds.length === 0) return out;
  const wos = await em.find(WorkOrder, { stationRecordId: { $in: recordIds } }, { orderBy: { number: 'asc' }, fields: ['number', 'title', 'stationRecordId'] });
  for (const wo of wos) {
    const list = out.get(wo.stationRecordId!) ?? [];
    list.push({ id: wo.id, number: wo.number, title: wo.title });
    out.set(wo.stationRecordId!, list);
  }
  return out;
}
