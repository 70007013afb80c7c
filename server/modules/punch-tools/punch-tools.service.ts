import type { EntityManager } from '@mikro-orm/postgresql';
import { LockMode } from '@mikro-orm/core';
import { formatDateTime } from '../../../shared/locale';
import { PunchTool, ToolSharpening, type IPunchTool } from './punch-tool.entity';
import { Machine } from '../machines/machine.entity';
import { Meter } from '../meters/meter.entity';
import { latestReadings, readingsSince, neighbours } from '../meters/meters.service';
import type { Principal } from '../../http/principal';
import { conflict, fieldError, notFound } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import { advanceSince } from '../../../shared/domain/meters';
import type { PunchToolInput, PunchToolRow, SharpeningInput, SharpeningRow } from '../../../shared/schemas/punch-tools';
import { clock } from '../../../shared/clock';

type Reading = { at: Date; value: number; isReset: boolean };

/** Hits since the last sharpening: the hits meter's advance since then (resets counted). */
function hitsSince(tool: IPunchTool, readings: Reading[], latest: number | null): number | null {
  const since = tool.lastSharpenedAt ?? tool.createdAt;
  const after = readings.filter((r) => r.at.getTime() > since.getTime());
  if (after.length === 0) return latest === null ? null : Math.max(0, latest - tool.hitsAtLastSharpening);
  return advanceSince(tool.hitsAtLastSharpening, after);
}

function toRow(t: IPunchTool, hits: number | null, sharpenings: number): PunchToolRow {
  const fraction = hits === null ? null : hits / t.sharpeningIntervalHits;
  return {
    id: t.id,
    code: t.code,
    name: t.name,
    stationSize: t.stationSize,
    machineId: t.machine.id,
    machineCode: t.machine.getEntity().code,
    hitsMeterId: t.hitsMeter.id,
    sharpeningIntervalHits: t.sharpeningIntervalHits,
    lastSharpenedAt: t.lastSharpenedAt?.toISOString() ?? null,
    hitsSince: hits,
    fraction,
    due: fraction !== null && fraction >= 1,
    sharpenings,
    active: t.active,
  };
}

export async function listTools(em: EntityManager, q: { machineIds?: string[]; includeInactive?: boolean } = {}): Promise<PunchToolRow[]> {
  const where = { ...(q.machineIds ? { machine: { $in: q.machineIds } } : {}), ...(q.includeInactive ? {} : { active: true }) };
  const tools = await em.find(PunchTool, where, { populate: ['machine'], orderBy: { code: 'asc' } });
  const counts: { tool_id: string; n: string }[] = tools.length
    ? await em.execute('select tool_id, count(*) as n from tool_sharpening where tool_id = any(?::uuid[]) group by tool_id', [
        `{${tools.map((t) => t.id).join(',')}}`,
      ])
    : [];
  const byTool = new Map(counts.map((c) => [c.tool_id, Number(c.n)]));
  // One read per hits meter, from the oldest sharpening among its tools.
  const meterIds = [...new Set(tools.map((t) => t.hitsMeter.id))];
  const latest = await latestReadings(em, meterIds);
  const readings = new Map<string, Reading[]>();
  for (const id of meterIds) {
    const from = new Date(Math.min(...tools.filter((t) => t.hitsMeter.id === id).map((t) => (t.lastSharpenedAt ?? t.createdAt).getTime())));
    readings.set(id, await readingsSince(em, id, from));
  }
  return tools.map((t) => toRow(t, hitsSince(t, readings.get(t.hitsMeter.id)!, latest.get(t.hitsMeter.id)?.value ?? null), byTool.get(t.id) ?? 0));
}

export async function createTool(em: EntityManager, who: Principal, input: PunchToolInput): Promise<{ id: string }> {
  return em.transactional(async (tx) => {
    const machine = await tx.findOne(Machine, { id: input.machineId });
    if (!machine) throw fieldError('machineId', 'The machine was not found');
    const meter = await tx.findOne(Meter, { id: input.hitsMeterId });
    if (!meter) throw fieldError('hitsMeterId', 'The hits meter was not found');
    if (meter.kind !== 'count' || meter.unit !== 'hits') throw fieldError('hitsMeterId', `${meter.name} counts ${meter.unit}, not hits`);
    if (await tx.findOne(PunchTool, { code: input.code }))
      throw conflict(`A tool with the code ${input.code} exists`, [{ path: 'code', message: `Code ${input.code} is taken` }]);
    const latest = (await latestReadings(tx, [meter.id])).get(meter.id);
    const tool = tx.create(PunchTool, {
      organization: who.orgId,
      machine,
      hitsMeter: meter,
      code: input.code,
      name: input.name,
      stationSize: input.stationSize,
      sharpeningIntervalHits: input.sharpeningIntervalHits,
      hitsAtLastSharpening: latest?.value ?? 0,
      lastSharpenedAt: null,
    });
    recordActivity(tx, who, 'tool.created', { type: 'PunchTool', id: tool.id }, { code: input.code });
    return { id: tool.id };
  });
}

export async function updateTool(em: EntityManager, who: Principal, id: string, input: { name?: string; sharpeningIntervalHits?: number; active?: boolean }) {
  await em.transactional(async (tx) => {
    const tool = await tx.findOne(PunchTool, { id });
    if (!tool) throw notFound('Tool');
    tx.assign(tool, input);
    recordActivity(tx, who, 'tool.updated', { type: 'PunchTool', id }, { ...input });
  });
}

/** A sharpening ends a run: hits since the previous sharpening are kept, the count starts again. */
export async function recordSharpening(
  em: EntityManager,
  who: Principal,
  toolId: string,
  input: SharpeningInput,
): Promise<{ id: string; hitsSincePrevious: number }> {
  return em.transactional(async (tx) => {
    const tool = await tx.findOne(PunchTool, { id: toolId }, { lockMode: LockMode.PESSIMISTIC_WRITE });
    if (!tool) throw notFound('Tool');
    const at = input.sharpenedAt ? new Date(input.sharpenedAt) : clock.now();
    if (tool.lastSharpenedAt && at < tool.lastSharpenedAt)
      throw fieldError('sharpenedAt', `The last sharpening was later (${formatDateTime(tool.lastSharpenedAt, who)})`);
    const { prev } = await neighbours(tx, tool.hitsMeter.id, at);
    const reading = prev?.value ?? tool.hitsAtLastSharpening;
    const since = tool.lastSharpenedAt ?? tool.createdAt;
    const run = (await readingsSince(tx, tool.hitsMeter.id, since)).filter((r) => r.at > since && r.at <= at);
    const hitsSincePrevious = run.length ? advanceSince(tool.hitsAtLastSharpening, run) : Math.max(0, reading - tool.hitsAtLastSharpening);
    const s = tx.create(ToolSharpening, {
      organization: who.orgId,
      tool,
      sharpenedAt: at,
      hitsReading: reading,
      hitsSincePrevious,
      removedMm: input.removedMm,
      by: who.userId,
      note: input.note,
    });
    tool.hitsAtLastSharpening = reading;
    tool.lastSharpenedAt = at;
    recordActivity(tx, who, 'tool.sharpened', { type: 'PunchTool', id: tool.id }, { hitsSincePrevious, removedMm: input.removedMm });
    return { id: s.id, hitsSincePrevious };
  });
}

export async function listSharpenings(em: EntityManager, toolId: string): Promise<SharpeningRow[]> {
  if (!(await em.findOne(PunchTool, { id: toolId }))) throw notFound('Tool');
  const rows = await em.find(ToolSharpening, { tool: toolId }, { orderBy: { sharpenedAt: 'desc' }, populate: ['by'] });
  return rows.map((s) => ({
    id: s.id,
    sharpenedAt: s.sharpenedAt.toISOString(),
    hitsReading: s.hitsReading,
    hitsSincePrevious: s.hitsSincePrevious,
    removedMm: s.removedMm ?? null,
    by: s.by?.getEntity().name ?? null,
    note: s.note ?? null,
  }));
}
