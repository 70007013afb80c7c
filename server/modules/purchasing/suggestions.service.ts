import type { EntityManager } from '@mikro-orm/postgresql';
import { ConsumableInstall } from '../station/consumable.entity';
import { Machine } from '../machines/machine.entity';
import { torchMeters } from '../station/station.service';
import { listPartTypes } from '../stock/part-types.service';
import { onOrderByPart } from './purchasing.service';
import type { Principal } from '../../http/principal';
import { suggestedOrder } from '../../../shared/domain/stock';
import { toCsv } from '../../../shared/domain/csv';
import type { SuggestedOrderRow } from '../../../shared/schemas/purchasing';

/** Days of counter readings a torch's usage rate is taken over. */
const RATE_WINDOW_DAYS = 28;

/**
 * Counter advance per calendar day of each meter over the last RATE_WINDOW_DAYS days (first to
 * latest reading in the window, at least a day apart); none across a counter reset.
 */
async function ratesPerDay(em: EntityManager, meterIds: string[]): Promise<Map<string, number>> {
  const out = new Map<string, number>();
  if (meterIds.length === 0) return out;
  const rows: { meter_id: string; advance: number; days: number; reset: boolean }[] = await em.execute(
    `select meter_id,
            (array_agg(value order by read_at desc))[1] - (array_agg(value order by read_at asc))[1] as advance,
            extract(epoch from max(read_at) - min(read_at)) / 86400 as days,
            bool_or(is_reset) as reset
       from meter_reading
      where meter_id = any(?::uuid[]) and read_at > now() - make_interval(days => ?)
      group by 1`,
    [`{${meterIds.join(',')}}`, RATE_WINDOW_DAYS],
  );
  for (const r of rows) if (!r.reset && Number(r.days) >= 1 && Number(r.advance) >= 0) out.set(r.meter_id, Number(r.advance) / Number(r.days));
  return out;
}

/**
 * What to order now to last the next `weeks` weeks. Torch consumables: the arc starts (or arc
 * hours) each torch is expected to run, from its counter's rate, ÷ the part's expected life;
 * other parts: their mean daily use. Plus the reorder point, less on hand, on order and already
 * requested, in whole packs and at least the supplier's minimum (shared/domain/stock.ts).
 */
export async function suggestedOrders(em: EntityManager, who: Principal, weeks: number): Promise<SuggestedOrderRow[]> {
  const days = weeks * 7;
  const parts = await listPartTypes(em, who);
  const installs = await em.find(ConsumableInstall, { removedAt: null }, { fields: ['id', 'torch', 'partType'] });
  const torchIds = [...new Set(installs.map((i) => i.torch.id))];
  const torches = torchIds.length ? await em.find(Machine, { id: { $in: torchIds } }) : [];
  const meters = await torchMeters(em, torches);
  const meterIds = [...meters.values()].flatMap((m) => [m.starts?.id, m.arcHours?.id]).filter((x): x is string => !!x);
  const rates = await ratesPerDay(em, meterIds);
  const ordered = await onOrderByPart(
    em,
    who.orgId,
    parts.map((p) => p.id),
  );
  const out: SuggestedOrderRow[] = [];
  for (const p of parts) {
    let expectedUse = p.usagePerDay * days;
    let basis: SuggestedOrderRow['basis'] = 'daily-use';
    if ((p.lifeUnit === 'starts' || p.lifeUnit === 'arc-hours') && p.expectedLife) {
      const rate = installs
        .filter((i) => i.partType.id === p.id)
        .map((i) => {
          const m = meters.get(i.torch.id);
          const id = p.lifeUnit === 'starts' ? m?.starts?.id : m?.arcHours?.id;
          return id ? rates.get(id) : undefined;
        })
        .filter((r): r is number => r !== undefined);
      if (rate.length) {
        expectedUse = (rate.reduce((s, r) => s + r, 0) * days) / p.expectedLife;
        basis = p.lifeUnit === 'starts' ? 'arc-starts' : 'arc-hours';
      }
    }
    const pending = ordered.get(p.id)?.pending ?? 0;
    const { quantity } = suggestedOrder({
      expectedUse,
      reorderPoint: p.reorderPoint,
      onHand: p.onHand,
      onOrder: p.onOrder + pending,
      packSize: p.packSize,
      minOrderQty: p.minOrderQty,
    });
    if (quantity <= 0) continue;
    out.push({
      partTypeId: p.id,
      partNumber: p.partNumber,
      name: p.name,
      supplier: p.supplierName,
      stockUnit: p.stockUnit,
      expectedUse,
      basis,
      onHand: p.onHand,
      onOrder: p.onOrder,
      pending,
      reorderPoint: p.reorderPoint,
      packSize: p.packSize,
      minOrderQty: p.minOrderQty,
      quantity,
      unitCost: p.unitCost,
    });
  }
  return out.sort((a, b) => (a.supplier ?? '~').localeCompare(b.supplier ?? '~') || a.partNumber.localeCompare(b.partNumber));
}

export function suggestionsCsv(rows: SuggestedOrderRow[]): string {
  return toCsv(
    [
      'Supplier',
      'Part number',
      'Name',
      'Quantity',
      'Unit',
      'Pack size',
      'Minimum order',
      'Expected use',
      'Based on',
      'On hand',
      'On order',
      'Requested',
      'Reorder point',
      'Unit cost',
      'Line cost',
    ],
    rows.map((r) => [
      r.supplier ?? '',
      r.partNumber,
      r.name,
      r.quantity,
      r.stockUnit,
      r.packSize,
      r.minOrderQty,
      Math.round(r.expectedUse * 10) / 10,
      r.basis,
      r.onHand,
      r.onOrder,
      r.pending,
      r.reorderPoint,
      r.unitCost,
      Math.round(r.quantity * r.unitCost * 100) / 100,
    ]),
  );
}
