import type { EntityManager } from '@mikro-orm/postgresql';
import { LockMode, ref } from '@mikro-orm/core';
import { fileTypeFromBuffer } from 'file-type';
import { formatDateTime } from '../../../shared/locale';
import { ConsumableChange, ConsumableInstall, ConsumablePhoto } from './consumable.entity';
import { Machine, type IMachine } from '../machines/machine.entity';
import { Meter, type IMeter } from '../meters/meter.entity';
import { PartType } from '../stock/stock.entity';
import { Organization, type OrgSettings } from '../organizations/organization.entity';
import { applyStockChanges } from '../stock/stock.service';
import { neighbours, readingsSince, recordReading } from '../meters/meters.service';
import type { Principal } from '../../http/principal';
import { AppError, fieldError, notFound } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import { completeByStationRecord, workDoneBy } from '../work-orders/station-completion';
import { advanceSince } from '../../../shared/domain/meters';
import { reasonsFromSingle, referenceValues } from '../../../shared/domain/consumables';
import { PART_CATEGORY_LABELS, TORCH_CATEGORIES, type TorchCategory } from '../../../shared/schemas/stock';
import { type ChangeRow, type ConsumableChangeInput, type ConsumableSettingsInput } from '../../../shared/schemas/consumables';
import { clock } from '../../../shared/clock';
import type { Page } from '../../../shared/schemas/paging';
import { CHANGE_PHOTO_TYPES } from '../../../shared/schemas/photos';

const article = (noun: string) => `${/^[aeiou]/i.test(noun) ? 'an' : 'a'} ${noun.toLowerCase()}`;

export type TorchMeters = { starts: IMeter | null; arcHours: IMeter | null };

/**
 * The counters a torch's consumables wear by: a count meter in starts and a running-time
 * meter whose code names arc time (e.g. arc-hours), on the torch itself, else on the
 * machine it belongs to.
 */
export async function torchMeters(em: EntityManager, torches: IMachine[]): Promise<Map<string, TorchMeters>> {
  const ids = [...new Set(torches.flatMap((t) => [t.id, t.parent?.id].filter((x): x is string => !!x)))];
  const meters = ids.length ? await em.find(Meter, { machine: { $in: ids } }, { orderBy: { code: 'asc' } }) : [];
  const pick = (machineId: string | undefined, test: (m: IMeter) => boolean) =>
    machineId ? (meters.find((m) => m.machine.id === machineId && test(m)) ?? null) : null;
  const isStarts = (m: IMeter) => m.kind === 'count' && m.unit === 'starts';
  // Arc time only: a cell's run-hours meter also counts in h but says nothing about the torch.
  const isArcHours = (m: IMeter) => m.kind === 'running-time' && m.code.includes('arc');
  const out = new Map<string, TorchMeters>();
  for (const t of torches) {
    out.set(t.id, {
      starts: pick(t.id, isStarts) ?? pick(t.parent?.id, isStarts),
      arcHours: pick(t.id, isArcHours) ?? pick(t.parent?.id, isArcHours),
    });
  }
  return out;
}

function settingsOf(org: { settings: OrgSettings }) {
  return referenceValues(org.settings);
}

/** Advance of a meter from an installation to now (or to `until`), or null without a counter. */
async function advanceFrom(
  em: EntityManager,
  meterId: string | undefined,
  startValue: number | null | undefined,
  from: Date,
  until?: Date,
): Promise<number | null> {
  if (!meterId || startValue === null || startValue === undefined) return null;
  const readings = (await readingsSince(em, meterId, from)).filter((r) => r.at > from && (!until || r.at <= until));
  return advanceSince(startValue, readings);
}

/**
 * The counter value at a change: the one typed in (recorded as a reading when it is new),
 * else the reading at or before the change. A typed value that breaks the meter's order is
 * refused on the form field it came from.
 */
async function counterAt(
  em: EntityManager,
  who: Principal,
  meter: IMeter | null,
  typed: number | null,
  at: Date,
  field: string,
  isReset = false,
): Promise<number | null> {
  if (!meter) {
    if (typed !== null) throw fieldError(field, 'This torch has no such meter; leave the field empty');
    return null;
  }
  const { prev } = await neighbours(em, meter.id, at);
  if (typed === null) return prev?.value ?? null;
  if (prev && prev.value === typed && !isReset) return typed;
  try {
    await recordReading(
      em,
      who,
      meter.id,
      { value: typed, readAt: at.toISOString(), isReset, note: isReset ? 'At a consumable change; counter reset or replaced' : 'At a consumable change' },
      'consumable-change',
    );
  } catch (err) {
    if (err instanceof AppError && err.fields?.[0]?.path === 'value') throw fieldError(field, err.message);
    throw err;
  }
  return typed;
}

/** Checks an uploaded photo is an image by its content, not its name. */
export async function checkPhoto(buffer: Buffer): Promise<string> {
  const type = await fileTypeFromBuffer(buffer);
  if (!type || !(CHANGE_PHOTO_TYPES as readonly string[]).includes(type.mime)) {
    throw fieldError('photo', `The photo is not an image we take (JPEG, PNG, WebP, HEIC or AVIF)${type ? `; it looks like ${type.mime}` : ''}`);
  }
  return type.mime;
}

/**
 * Logs a consumable change in one transaction: records new counters, closes each old
 * installation with its life (the counter advance since it went in), opens the new ones
 * and takes the parts out of stock. Anything refused leaves nothing written.
 */
export async function logChange(
  em: EntityManager,
  who: Principal,
  input: ConsumableChangeInput,
  photo?: Buffer,
): Promise<{ id: string; closed: number; opened: number; workOrders: { id: string; number: number }[] }> {
  const mime = photo ? await checkPhoto(photo) : null;
  return em.transactional(async (tx) => {
    const torch = await tx.findOne(Machine, { id: input.torchId }, { lockMode: LockMode.PESSIMISTIC_WRITE });
    if (!torch) throw notFound('Torch');
    if (torch.kind !== 'torch') throw fieldError('torchId', `${torch.code} is not a torch`);
    const changedAt = input.changedAt ? new Date(input.changedAt) : clock.now();
    const meters = (await torchMeters(tx, [torch])).get(torch.id)!;
    if (input.startsReset && input.startsReading === null) throw fieldError('startsReading', 'Enter the counter as it reads now, after the reset');
    if (input.arcHoursReset && input.arcHoursReading === null) throw fieldError('arcHoursReading', 'Enter the counter as it reads now, after the reset');
    const starts = await counterAt(tx, who, meters.starts, input.startsReading, changedAt, 'startsReading', input.startsReset);
    const arcHours = await counterAt(tx, who, meters.arcHours, input.arcHoursReading, changedAt, 'arcHoursReading', input.arcHoursReset);
    await tx.flush(); // new readings count in the lives computed below

    const open = await tx.find(ConsumableInstall, { torch: torch.id, removedAt: null, category: { $in: input.categories } });
    // Reasons given per part win; the rest follow the one reason for the change (older clients).
    const reasons = { ...(input.reason ? reasonsFromSingle(input.categories, input.reason) : {}), ...input.reasons };
    const change = tx.create(ConsumableChange, {
      organization: who.orgId,
      torch,
      changedAt,
      startsReading: starts,
      arcHoursReading: arcHours,
      pitDepthMm: input.pitDepthMm,
      note: input.note,
      by: who.userId,
    });
    const taken: string[] = [];
    for (const category of input.categories as TorchCategory[]) {
      const label = PART_CATEGORY_LABELS[category];
      const old = open.find((i) => i.category === category);
      if (old && old.installedAt > changedAt)
        throw fieldError('changedAt', `The ${label.toLowerCase()} in the torch went in after this time (${formatDateTime(old.installedAt, who)})`);
      const partTypeId = input.partTypeIds[category] ?? old?.partType.id;
      if (!partTypeId) throw fieldError(`partTypeIds.${category}`, `Choose which ${label.toLowerCase()} goes in`);
      const part = await tx.findOne(PartType, { id: partTypeId });
      if (!part) throw fieldError(`partTypeIds.${category}`, `The ${label.toLowerCase()} part was not found`);
      if (part.category !== category)
        throw fieldError(`partTypeIds.${category}`, `${part.partNumber} is ${article(PART_CATEGORY_LABELS[part.category])}, not ${article(label)}`);
      if (old) {
        old.removedAt = changedAt;
        old.removalChange = ref(change);
        old.removalReason = reasons[category] ?? null;
        old.lifeStarts = await advanceFrom(tx, meters.starts?.id, old.startsAtInstall, old.installedAt, changedAt);
        old.lifeArcHours = await advanceFrom(tx, meters.arcHours?.id, old.arcHoursAtInstall, old.installedAt, changedAt);
      }
      tx.create(ConsumableInstall, {
        organization: who.orgId,
        torch,
        partType: part,
        category,
        installedAt: changedAt,
        installChange: change,
        startsAtInstall: starts,
        arcHoursAtInstall: arcHours,
      });
      taken.push(part.id);
    }
    if (input.takeFromStock) {
      await applyStockChanges(
        tx,
        who,
        taken.map((id) => ({
          partTypeId: id,
          quantity: -1,
          kind: 'used' as const,
          reason: `Consumable change on ${torch.code}`,
          ref: { type: 'ConsumableChange', id: change.id },
        })),
      );
    }
    if (photo && mime) tx.create(ConsumablePhoto, { organization: who.orgId, change, mimeType: mime, byteSize: photo.length, data: photo });
    recordActivity(
      tx,
      who,
      'consumable.changed',
      { type: 'ConsumableChange', id: change.id },
      { torch: torch.code, categories: input.categories, reasons, starts, arcHours, fromStock: input.takeFromStock },
    );
    const parts = (input.categories as TorchCategory[]).map((c) => PART_CATEGORY_LABELS[c].toLowerCase()).join(' + ');
    const done = await completeByStationRecord(tx, who, {
      type: 'ConsumableChange',
      id: change.id,
      machineId: torch.id,
      at: changedAt,
      summary: `Consumable change on ${torch.code}: ${parts}${input.pitDepthMm !== null ? `; electrode pit ${input.pitDepthMm} mm` : ''}`,
      categories: input.categories as TorchCategory[],
    });
    return { id: change.id, closed: open.length, opened: taken.length, workOrders: done.workOrders.map((w) => ({ id: w.id, number: w.number })) };
  });
}

export async function listChanges(em: EntityManager, q: { torchIds?: string[]; page: number; pageSize: number }): Promise<Page<ChangeRow>> {
  const where = q.torchIds ? { torch: { $in: q.torchIds } } : {};
  const [changes, total] = await em.findAndCount(ConsumableChange, where, {
    orderBy: { changedAt: 'desc', id: 'asc' },
    limit: q.pageSize,
    offset: (q.page - 1) * q.pageSize,
    populate: ['torch', 'by'],
  });
  const ids = changes.map((c) => c.id);
  const installs = ids.length ? await em.find(ConsumableInstall, { installChange: { $in: ids } }, { populate: ['partType'] }) : [];
  const removed = ids.length ? await em.find(ConsumableInstall, { removalChange: { $in: ids } }) : [];
  const photos: { change_id: string }[] = ids.length
    ? await em.execute('select change_id from consumable_photo where change_id = any(?::uuid[])', [`{${ids.join(',')}}`])
    : [];
  const withPhoto = new Set(photos.map((p) => p.change_id));
  const work = await workDoneBy(em, ids);
  return {
    rows: changes.map((c) => ({
      id: c.id,
      changedAt: c.changedAt.toISOString(),
      torchCode: c.torch.getEntity().code,
      parts: installs
        .filter((i) => i.installChange?.id === c.id)
        .sort((a, b) => TORCH_CATEGORIES.indexOf(a.category) - TORCH_CATEGORIES.indexOf(b.category))
        .map((i) => {
          const out = removed.find((r) => r.removalChange?.id === c.id && r.category === i.category);
          return {
            category: i.category,
            partNumber: i.partType.getEntity().partNumber,
            reason: out?.removalReason ?? null,
            lifeStarts: out?.lifeStarts ?? null,
            lifeArcHours: out?.lifeArcHours ?? null,
          };
        }),
      startsReading: c.startsReading ?? null,
      arcHoursReading: c.arcHoursReading ?? null,
      pitDepthMm: c.pitDepthMm ?? null,
      by: c.by?.getEntity().name ?? null,
      hasPhoto: withPhoto.has(c.id),
      note: c.note ?? null,
      workOrders: work.get(c.id) ?? [],
    })),
    total,
    page: q.page,
    pageSize: q.pageSize,
  };
}

export async function getPhoto(em: EntityManager, changeId: string) {
  const photo = await em.findOne(ConsumablePhoto, { change: changeId });
  if (!photo) throw notFound('Photo');
  return { mimeType: photo.mimeType, data: photo.data as Buffer };
}

export async function getConsumableSettings(em: EntityManager, who: Principal) {
  const org = await em.findOneOrFail(Organization, who.orgId);
  return settingsOf(org);
}

export async function updateConsumableSettings(em: EntityManager, who: Principal, input: ConsumableSettingsInput) {
  return em.transactional(async (tx) => {
    const org = await tx.findOneOrFail(Organization, who.orgId);
    const next: OrgSettings = { ...(org.settings ?? {}) };
    for (const [k, v] of Object.entries(input)) {
      if (v === undefined) continue;
      if (v === null) delete next[k];
      else next[k] = v;
    }
    org.settings = next;
    recordActivity(tx, who, 'settings.consumables-updated', { type: 'Organization', id: org.id }, { ...input });
    return settingsOf(org);
  });
}
