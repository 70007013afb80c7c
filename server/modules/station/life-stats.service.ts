import type { EntityManager } from '@mikro-orm/postgresql';
import { ConsumableInstall } from './consumable.entity';
import { Machine } from '../machines/machine.entity';
import { PartType } from '../stock/stock.entity';
import { Organization } from '../organizations/organization.entity';
import { readingsSince } from '../meters/meters.service';
import { torchMeters } from './station.service';
import { subtreeIds } from '../machines/machines.service';
import type { Principal } from '../../http/principal';
import { notFound } from '../../http/errors';
import { advanceSince } from '../../../shared/domain/meters';
import { lifeHistogram, referenceValues, splitLives } from '../../../shared/domain/consumables';
import { fitWeibull, recommendedChangePoint, weibullBLife, weibullReliability } from '../../../shared/domain/weibull';
import { WEAR_OUT_REASONS, type LifeStats } from '../../../shared/schemas/consumables';

const mean = (xs: number[]) => (xs.length ? xs.reduce((s, x) => s + x, 0) / xs.length : null);

/**
 * Achieved lives of one part type (optionally on one machine and its components): the
 * distribution, a Weibull fit with non-wear removals and parts still in the torch as
 * suspensions, B10, a recommended change point and the consumable cost per arc-hour.
 */
export async function lifeStats(em: EntityManager, who: Principal, partTypeId: string, machineId?: string): Promise<LifeStats> {
  const part = await em.findOne(PartType, { id: partTypeId });
  if (!part) throw notFound('Part');
  const unit: LifeStats['unit'] = part.lifeUnit === 'arc-hours' ? 'arc-hours' : 'starts';
  const all = await em.find(Machine, {});
  let torchIds: string[] | null = null;
  if (machineId) {
    if (!all.some((m) => m.id === machineId)) throw notFound('Machine');
    torchIds = subtreeIds(all, machineId);
  }
  const installs = await em.find(
    ConsumableInstall,
    { partType: part.id, ...(torchIds ? { torch: { $in: torchIds } } : {}) },
    { orderBy: { installedAt: 'asc' } },
  );
  const removed = installs.filter((i) => i.removedAt);
  const open = installs.filter((i) => !i.removedAt);

  // Lives of parts still in the torch: the counter advance since they went in.
  const openTorches = all.filter((m) => open.some((i) => i.torch.id === m.id));
  const meters = await torchMeters(em, openTorches);
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
  const lifeOf = (i: (typeof installs)[number]) => (unit === 'starts' ? (i.lifeStarts ?? null) : (i.lifeArcHours ?? null));
  const { failures, suspensions } = splitLives(
    removed.map((i) => ({ life: lifeOf(i), wornOut: WEAR_OUT_REASONS.includes(i.removalReason!) })),
    current,
  );

  const org = await em.findOneOrFail(Organization, who.orgId);
  const target = referenceValues(org.settings).changeTargetReliability.value;
  let fit: LifeStats['fit'] = null;
  let fitProblem: string | null = null;
  if (failures.length < 3) fitProblem = `A fit needs at least 3 worn-out parts; ${failures.length} so far.`;
  else {
    try {
      const f = fitWeibull(failures, suspensions);
      const top = Math.max(...failures, ...suspensions) * 1.25;
      fit = {
        shape: f.shape,
        scale: f.scale,
        b10: weibullBLife(f, 0.1),
        recommended: recommendedChangePoint(f, target),
        targetReliability: target,
        curve: Array.from({ length: 41 }, (_, k) => ({ life: (top * k) / 40, reliability: weibullReliability(f, (top * k) / 40) })),
      };
    } catch (err) {
      fitProblem = err instanceof Error ? err.message : 'The fit failed';
    }
  }

  const costOf = (rows: typeof removed) => {
    const hours = rows.reduce((s, i) => s + (i.lifeArcHours ?? 0), 0);
    return hours > 0 ? (rows.length * Number(part.unitCost)) / hours : null;
  };
  const codeOf = new Map(all.map((m) => [m.id, m.code]));
  const byTorch = new Map<string, typeof removed>();
  for (const i of removed) byTorch.set(i.torch.id, [...(byTorch.get(i.torch.id) ?? []), i]);
  return {
    partType: {
      id: part.id,
      partNumber: part.partNumber,
      name: part.name,
      category: part.category,
      lifeUnit: part.lifeUnit ?? null,
      unitCost: Number(part.unitCost),
      expectedLife: part.expectedLife ?? null,
    },
    unit,
    failures,
    suspensions,
    stillInstalled: open.length,
    histogram: lifeHistogram(failures, suspensions),
    fit,
    fitProblem,
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
