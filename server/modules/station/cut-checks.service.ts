import type { EntityManager } from '@mikro-orm/postgresql';
import { ConsumableInstall, CutCheck } from './consumable.entity';
import { Machine } from '../machines/machine.entity';
import { Organization } from '../organizations/organization.entity';
import type { Principal } from '../../http/principal';
import { fieldError, notFound } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import { completeByStationRecord, workDoneBy } from '../work-orders/station-completion';
import { couponResult, referenceValues } from '../../../shared/domain/consumables';
import type { CutCheckInput, CutCheckRow } from '../../../shared/schemas/consumables';
import { clock } from '../../../shared/clock';
import type { Page } from '../../../shared/schemas/paging';

/**
 * Records a test coupon measured against nominal with the shop's tolerance, tied to the
 * consumables that were in the torch when it was cut.
 */
export async function recordCutCheck(em: EntityManager, who: Principal, input: CutCheckInput): Promise<CutCheckRow> {
  const id = await em.transactional(async (tx) => {
    const torch = await tx.findOne(Machine, { id: input.torchId });
    if (!torch) throw notFound('Torch');
    if (torch.kind !== 'torch') throw fieldError('torchId', `${torch.code} is not a torch`);
    const at = input.checkedAt ? new Date(input.checkedAt) : clock.now();
    if (at.getTime() > clock.ms() + 5 * 60_000) throw fieldError('checkedAt', 'The check time lies in the future');
    const org = await tx.findOneOrFail(Organization, who.orgId);
    const tolerance = referenceValues(org.settings).cutToleranceMm.value;
    const result = couponResult(input.dimensions, tolerance);
    const inTorch = await tx.find(ConsumableInstall, { torch: torch.id, installedAt: { $lte: at }, $or: [{ removedAt: null }, { removedAt: { $gt: at } }] });
    const check = tx.create(CutCheck, {
      organization: who.orgId,
      torch,
      checkedAt: at,
      toleranceMm: tolerance,
      dimensions: input.dimensions,
      maxDeviationMm: result.maxDeviationMm,
      passed: result.passed,
      installIds: inTorch.map((i) => i.id),
      by: who.userId,
      note: input.note,
    });
    recordActivity(
      tx,
      who,
      'cut-check.recorded',
      { type: 'CutCheck', id: check.id },
      { torch: torch.code, passed: result.passed, maxDeviationMm: result.maxDeviationMm },
    );
    // A coupon out of tolerance still is the check done; its result is in the summary for the work order.
    await completeByStationRecord(tx, who, {
      type: 'CutCheck',
      id: check.id,
      machineId: torch.id,
      at,
      summary: `Test coupon on ${torch.code}: ${result.passed ? 'within' : 'OUT OF'} tolerance (largest deviation ${result.maxDeviationMm} mm, tolerance ±${tolerance} mm)`,
    });
    return check.id;
  });
  return (await listCutChecks(em, { ids: [id], page: 1, pageSize: 1 })).rows[0];
}

export async function listCutChecks(em: EntityManager, q: { torchIds?: string[]; ids?: string[]; page: number; pageSize: number }): Promise<Page<CutCheckRow>> {
  const where = { ...(q.torchIds ? { torch: { $in: q.torchIds } } : {}), ...(q.ids ? { id: { $in: q.ids } } : {}) };
  const [checks, total] = await em.findAndCount(CutCheck, where, {
    orderBy: { checkedAt: 'desc', id: 'asc' },
    limit: q.pageSize,
    offset: (q.page - 1) * q.pageSize,
    populate: ['torch', 'by'],
  });
  const installIds = [...new Set(checks.flatMap((c) => c.installIds))];
  const installs = installIds.length ? await em.find(ConsumableInstall, { id: { $in: installIds } }, { populate: ['partType'] }) : [];
  const byId = new Map(installs.map((i) => [i.id, i]));
  const work = await workDoneBy(
    em,
    checks.map((c) => c.id),
  );
  return {
    rows: checks.map((c) => ({
      id: c.id,
      checkedAt: c.checkedAt.toISOString(),
      torchCode: c.torch.getEntity().code,
      toleranceMm: c.toleranceMm,
      dimensions: couponResult(c.dimensions, c.toleranceMm).dimensions,
      maxDeviationMm: c.maxDeviationMm,
      passed: c.passed,
      installedParts: c.installIds
        .map((id) => byId.get(id))
        .filter((i): i is NonNullable<typeof i> => !!i)
        .map((i) => ({ category: i.category, partNumber: i.partType.getEntity().partNumber })),
      by: c.by?.getEntity().name ?? null,
      note: c.note ?? null,
      workOrders: work.get(c.id) ?? [],
    })),
    total,
    page: q.page,
    pageSize: q.pageSize,
  };
}
