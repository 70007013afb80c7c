import type { EntityManager } from '@mikro-orm/postgresql';
import { PartType, StockMove, type IPartType } from './stock.entity';
import { Organization, type OrgSettings } from '../organizations/organization.entity';
import { applyStockChanges } from './stock.service';
import type { Principal } from '../../http/principal';
import { conflict, fieldError, notFound } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import { demandStats, reorderPointUnits } from '../../../shared/domain/stock';
import {
  failureCostProblem,
  type PartTypeInput,
  type PartTypeRow,
  type PartTypeUpdate,
  type RecordStockMoveInput,
  type StockMoveRow,
} from '../../../shared/schemas/stock';
import type { Page } from '../../../shared/schemas/paging';

/** Days of 'used' moves the reorder point learns from; days without use count as zero. */
export const USAGE_WINDOW_DAYS = 90;

/**
 * Daily use of each part over the last USAGE_WINDOW_DAYS days, counted in the shop's
 * time zone, as arrays with a zero for every day without use.
 */
async function dailyUsage(em: EntityManager, orgId: string, timeZone: string, partIds: string[]): Promise<Map<string, number[]>> {
  const out = new Map<string, number[]>(partIds.map((id) => [id, new Array(USAGE_WINDOW_DAYS).fill(0)]));
  if (partIds.length === 0) return out;
  const rows: { part_type_id: string; day_index: number; used: number }[] = await em.execute(
    `select part_type_id,
            (date_trunc('day', now() at time zone ?)::date - date_trunc('day', created_at at time zone ?)::date) as day_index,
            sum(-quantity) as used
       from stock_move
      where organization_id = ? and kind = 'used' and created_at > now() - make_interval(days => ?)
      group by 1, 2`,
    [timeZone, timeZone, orgId, USAGE_WINDOW_DAYS],
  );
  for (const r of rows) {
    const days = out.get(r.part_type_id);
    const i = Number(r.day_index);
    if (days && i >= 0 && i < USAGE_WINDOW_DAYS) days[i] += Math.max(0, Number(r.used));
  }
  return out;
}

/** The shop's currency code from its settings, when it names one we can format; else costs go without a symbol. */
function currencyOf(settings: OrgSettings | null | undefined): string | null {
  const c = settings?.currency;
  return typeof c === 'string' && /^[A-Z]{3}$/.test(c) ? c : null;
}

function toRow(p: IPartType, usage: number[], currency: string | null = null): PartTypeRow {
  const { mean, sd } = demandStats(usage);
  const rop = reorderPointUnits({ dailyDemandMean: mean, dailyDemandSd: sd, leadTimeDays: p.leadTimeDays, serviceLevel: p.serviceLevel });
  return {
    id: p.id,
    partNumber: p.partNumber,
    name: p.name,
    category: p.category,
    stockUnit: p.stockUnit,
    lifeUnit: p.lifeUnit ?? null,
    expectedLife: p.expectedLife ?? null,
    unitCost: Number(p.unitCost),
    plannedChangeCost: p.plannedChangeCost === null || p.plannedChangeCost === undefined ? null : Number(p.plannedChangeCost),
    failureCost: p.failureCost === null || p.failureCost === undefined ? null : Number(p.failureCost),
    currency,
    onHand: p.onHand,
    leadTimeDays: p.leadTimeDays,
    serviceLevel: p.serviceLevel,
    active: p.active,
    usagePerDay: mean,
    usageSdPerDay: sd,
    usageWindowDays: USAGE_WINDOW_DAYS,
    reorderPoint: rop,
    // At or below the reorder point: an order placed now just covers the lead time.
    low: p.active && (rop > 0 ? p.onHand <= rop : p.onHand <= 0),
  };
}

export async function listPartTypes(em: EntityManager, who: Principal, q: { lowOnly?: boolean; includeInactive?: boolean } = {}): Promise<PartTypeRow[]> {
  const parts = await em.find(PartType, q.includeInactive ? {} : { active: true }, { orderBy: { category: 'asc', partNumber: 'asc' } });
  const org = await em.findOneOrFail(Organization, who.orgId);
  const usage = await dailyUsage(
    em,
    who.orgId,
    org.timeZone,
    parts.map((p) => p.id),
  );
  const rows = parts.map((p) => toRow(p, usage.get(p.id)!, currencyOf(org.settings)));
  return q.lowOnly ? rows.filter((r) => r.low) : rows;
}

export async function getPartType(em: EntityManager, who: Principal, id: string): Promise<PartTypeRow> {
  const p = await em.findOne(PartType, { id });
  if (!p) throw notFound('Part');
  const org = await em.findOneOrFail(Organization, who.orgId);
  const usage = await dailyUsage(em, who.orgId, org.timeZone, [p.id]);
  return toRow(p, usage.get(p.id)!, currencyOf(org.settings));
}

async function assertPartNumberFree(em: EntityManager, partNumber: string, selfId: string | null) {
  const other = await em.findOne(PartType, { partNumber, ...(selfId ? { id: { $ne: selfId } } : {}) });
  if (other)
    throw conflict(`Part number ${partNumber} is already in the catalogue (${other.name})`, [
      { path: 'partNumber', message: `${partNumber} is already in the catalogue` },
    ]);
}

export async function createPartType(em: EntityManager, who: Principal, input: PartTypeInput): Promise<{ id: string }> {
  return em.transactional(async (tx) => {
    await assertPartNumberFree(tx, input.partNumber, null);
    const { openingStock, ...fields } = input;
    const p = tx.create(PartType, { organization: who.orgId, ...fields, onHand: 0 });
    await tx.flush();
    if (openingStock > 0) await applyStockChanges(tx, who, [{ partTypeId: p.id, quantity: openingStock, kind: 'adjusted', reason: 'Opening stock' }]);
    recordActivity(tx, who, 'part.created', { type: 'PartType', id: p.id }, { partNumber: input.partNumber, openingStock });
    return { id: p.id };
  });
}

export async function updatePartType(em: EntityManager, who: Principal, id: string, input: PartTypeUpdate): Promise<void> {
  await em.transactional(async (tx) => {
    const p = await tx.findOne(PartType, { id });
    if (!p) throw notFound('Part');
    if (input.partNumber !== undefined) await assertPartNumberFree(tx, input.partNumber, id);
    const next = (k: 'unitCost' | 'plannedChangeCost' | 'failureCost') => {
      const v = input[k] !== undefined ? input[k] : p[k];
      return v === null || v === undefined ? null : Number(v);
    };
    const problem = failureCostProblem(next('plannedChangeCost') ?? next('unitCost') ?? 0, next('failureCost'));
    if (problem) throw fieldError('failureCost', problem);
    tx.assign(p, input);
    recordActivity(tx, who, 'part.updated', { type: 'PartType', id }, { ...input });
  });
}

export async function recordStockMove(em: EntityManager, who: Principal, input: RecordStockMoveInput): Promise<{ id: string; onHand: number }> {
  return em.transactional(async (tx) => {
    const [move] = await applyStockChanges(tx, who, [
      { partTypeId: input.partTypeId, quantity: input.quantity, kind: input.kind, reason: input.reason ?? null },
    ]);
    recordActivity(tx, who, `stock.${input.kind}`, { type: 'PartType', id: input.partTypeId }, { quantity: input.quantity, reason: input.reason ?? null });
    return { id: move.id, onHand: move.onHandAfter };
  });
}

export async function listMoves(em: EntityManager, partTypeId: string, q: { page: number; pageSize: number }): Promise<Page<StockMoveRow>> {
  if (!(await em.findOne(PartType, { id: partTypeId }))) throw notFound('Part');
  const [rows, total] = await em.findAndCount(
    StockMove,
    { partType: partTypeId },
    { orderBy: { createdAt: 'desc', id: 'asc' }, limit: q.pageSize, offset: (q.page - 1) * q.pageSize, populate: ['by'] },
  );
  return {
    rows: rows.map((m) => ({
      id: m.id,
      at: m.createdAt.toISOString(),
      kind: m.kind,
      quantity: m.quantity,
      onHandAfter: m.onHandAfter,
      reason: m.reason ?? null,
      by: m.by?.getEntity().name ?? null,
      refType: m.refType ?? null,
    })),
    total,
    page: q.page,
    pageSize: q.pageSize,
  };
}
