import type { EntityManager } from '@mikro-orm/postgresql';
import { ConsumableInstall, type IConsumableInstall } from './consumable.entity';
import { Machine, type IMachine } from '../machines/machine.entity';
import { PartType, type IPartType } from '../stock/stock.entity';
import { Organization } from '../organizations/organization.entity';
import { readingsSince } from '../meters/meters.service';
import { torchMeters } from './station.service';
import { subtreeIds } from '../machines/machines.service';
import { lifeModel, type PartCosts } from './life-model';
import { cachedChangePlans } from './change-plan-cache';
import type { Principal } from '../../http/principal';
import { notFound } from '../../http/errors';
import { advanceSince } from '../../../shared/domain/meters';
import { lifeHistogram, referenceValues, splitLives } from '../../../shared/domain/consumables';
import { REMOVAL_REASONS, REMOVAL_REASON_KIND, type InstalledPart, type LifeStats } from '../../../shared/schemas/consumables';

const mean = (xs: number[]) => (xs.length ? xs.reduce((s, x) => s + x, 0) / xs.length : null);
const unitOf = (part: IPartType): LifeStats['unit'] => (part.lifeUnit === 'arc-hours' ? 'arc-hours' : 'starts');
export const costsOf = (part: IPartType): PartCosts => ({
  unitCost: Number(part.unitCost),
  plannedChangeCost: part.plannedChangeCost === null || part.plannedChangeCost === undefined ? null : Number(part.plannedChangeCost),
  failureCost: part.failureCost === null || part.failureCost === undefined ? null : Number(part.failureCost),
});

/**
 * Achieved lives of one part type on the given torches (all when null): removed parts with
 * their reasons, and the lives so far of the parts still in a torch.
 */
async function collectLives(em: EntityManager, part: IPartType, machines: IMachine[], torchIds: string[] | null) {
  const unit = unitOf(part);
  const installs = await em.find(
    ConsumableInstall,
    { partType: part.id, ...(torchIds ? { torch: { $in: torchIds } } : {}) },
    { orderBy: { installedAt: 'asc' } },
  );
  const removed = installs.filter((i) => i.removedAt);
  const open = installs.filter((i) => !i.removedAt);
  // Lives of parts still in the torch: the counter advance since they went in.
  const meters = await torchMeters(
    em,
    machines.filter((m) => open.some((i) => i.torch.id === m.id)),
  );
  const current: (number | null)[] = [];
  for (const i of open) {
    const tm = meters.get(i.torch.id);
    const meterId = unit === 'starts' ? tm?.starts?.id : tm?.arcHours?.id;
    const start = unit === 'starts' ? i.startsAtInstall : i.arcHoursAtInstall;
    if (!meterId || start === null || start === undefined) {
      current.push(null);
      continue;
    }
    const rs = (await readingsSince(em, meterId, i.installedAt)).filter((r) => r.at > i.installedAt);
    current.push(advanceSince(start, rs));
  }
  const lifeOf = (i: IConsumableInstall) => (unit === 'starts' ? (i.lifeStarts ?? null) : (i.lifeArcHours ?? null));
  const split = splitLives(
    removed.map((i) => ({ life: lifeOf(i), reason: i.removalReason ?? null })),
    current,
  );
  return { unit, removed, open, lifeOf, ...split };
}

async function targetReliability(em: EntityManager, who: Principal) {
  const org = await em.findOneOrFail(Organization, who.orgId);
  return referenceValues(org.settings).changeTargetReliability.value;
}

/**
 * Achieved lives of one part type (optionally on one machine and its components): the
 * distribution, a Weibull fit with suspensions (changed with a partner, preventive, damaged,
 * process faults, still installed), its bounds, B10, the reliability-target change point, the
 * cheapest change point and the consumable cost per arc-hour.
 */
export async function lifeStats(em: EntityManager, who: Principal, partTypeId: string, machineId?: string): Promise<LifeStats> {
  const part = await em.findOne(PartType, { id: partTypeId });
  if (!part) throw notFound('Part');
  const all = await em.find(Machine, {});
  let torchIds: string[] | null = null;
  if (machineId) {
    if (!all.some((m) => m.id === machineId)) throw notFound('Machine');
    torchIds = subtreeIds(all, machineId);
  }
  const { unit, removed, open, lifeOf, failures, suspensions, processFaults } = await collectLives(em, part, all, torchIds);
  const costs = costsOf(part);
  const model = lifeModel(failures, suspensions, costs, await targetReliability(em, who));

  const costOf = (rows: typeof removed) => {
    const hours = rows.reduce((s, i) => s + (i.lifeArcHours ?? 0), 0);
    return hours > 0 ? (rows.length * Number(part.unitCost)) / hours : null;
  };
  const codeOf = new Map(all.map((m) => [m.id, m.code]));
  const byTorch = new Map<string, typeof removed>();
  for (const i of removed) byTorch.set(i.torch.id, [...(byTorch.get(i.torch.id) ?? []), i]);
  const byReason = REMOVAL_REASONS.map((reason) => ({
    reason,
    kind: REMOVAL_REASON_KIND[reason],
    count: removed.filter((i) => i.removalReason === reason).length,
  })).filter((r) => r.count > 0);
  return {
    partType: {
      id: part.id,
      partNumber: part.partNumber,
      name: part.name,
      category: part.category,
      lifeUnit: part.lifeUnit ?? null,
      unitCost: costs.unitCost,
      plannedChangeCost: costs.plannedChangeCost,
      failureCost: costs.failureCost,
      expectedLife: part.expectedLife ?? null,
    },
    unit,
    failures,
    suspensions,
    stillInstalled: open.length,
    byReason,
    processFaults,
    histogram: lifeHistogram(failures, suspensions),
    ...model,
    meanLife: mean(removed.map(lifeOf).filter((x): x is number => x !== null && x > 0)),
    costPerArcHour: costOf(removed),
    perMachine: [...byTorch.entries()]
      .map(([torchId, rows]) => ({
        machineId: torchId,
        machineCode: codeOf.get(torchId) ?? '?',
        removed: rows.length,
        meanLife: mean(rows.map(lifeOf).filter((x): x is number => x !== null && x > 0)),
        costPerArcHour: costOf(rows),
      }))
      .sort((a, b) => a.machineCode.localeCompare(b.machineCode)),
  };
}

/** B10 and the cheapest change point of each part type, over the whole shop, for the station page. */
export async function changePlans(em: EntityManager, who: Principal, partTypeIds: string[]): Promise<Map<string, InstalledPart['plan']>> {
  const out = new Map<string, InstalledPart['plan']>();
  if (partTypeIds.length === 0) return out;
  return cachedChangePlans(em, who.orgId, partTypeIds, () => computeChangePlans(em, who, partTypeIds));
}

async function computeChangePlans(em: EntityManager, who: Principal, partTypeIds: string[]): Promise<Map<string, InstalledPart['plan']>> {
  const out = new Map<string, InstalledPart['plan']>();
  const parts = await em.find(PartType, { id: { $in: [...new Set(partTypeIds)] } });
  const all = await em.find(Machine, {});
  const target = await targetReliability(em, who);
  for (const part of parts) {
    const { failures, suspensions } = await collectLives(em, part, all, null);
    const { fit } = lifeModel(failures, suspensions, costsOf(part), target);
    out.set(part.id, fit ? { b10: fit.b10, failures: failures.length, change: fit.plan } : null);
  }
  return out;
}
