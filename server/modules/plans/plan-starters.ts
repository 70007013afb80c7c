/** Starter plans: which fit a machine and why the others do not, and turning the chosen ones into plans. */
import type { EntityManager } from '@mikro-orm/postgresql';
import { DateTime } from 'luxon';
import { MaintenancePlan } from './plan.entity';
import type { IMachine } from '../machines/machine.entity';
import { PartType } from '../stock/stock.entity';
import type { Principal } from '../../http/principal';
import { summarizeTrigger } from '../../../shared/domain/plan-summary';
import { STARTER_PLANS, findStarter, type StarterMeter, type StarterPlan } from '../../../shared/domain/starter-plans';
import { MACHINE_KIND_LABELS, type MachineKind } from '../../../shared/schemas/machines';
import type { ApplyStartersInput, ApplyStartersResult, PlanInput, StarterFit, StarterView, TriggerInput } from '../../../shared/schemas/plans';
import { createPlan, findMachine, metersOf, relatedMachineIds, type MeterInfo } from './plans.service';
import { clock } from '../../../shared/clock';
import { formatNumber, shopLocale } from '../../../shared/locale';

function starterSummary(s: StarterPlan): string {
  return s.triggers
    .map((t) => {
      switch (t.kind) {
        case 'calendar-fixed':
          return summarizeTrigger({ kind: 'calendar-fixed', rrule: t.rrule, start: `2000-01-01T${t.time}:00`, ical: '' }).replace(/ \(from .*\)$/, '');
        case 'calendar-floating':
          return summarizeTrigger(t);
        case 'meter':
          return `every ${formatNumber(t.every, shopLocale(), { max: 3 })} ${t.meter.unit} (${t.meter.codes[0]})`;
        case 'condition':
          return `${t.meter.codes[0]} ${t.above !== undefined ? `above ${t.above}` : `below ${t.below}`} ${t.meter.unit}`;
        case 'oil-analysis':
          return 'an oil result outside targets';
      }
    })
    .join(', or ');
}

export function listStarters(): StarterView[] {
  return STARTER_PLANS.map((s) => ({
    key: s.key,
    title: s.title,
    machineKinds: s.machineKinds,
    summary: starterSummary(s),
    needsMeters: [...new Set(s.triggers.flatMap((t) => ('meter' in t ? [`${t.meter.codes[0]} (${t.meter.unit})`] : [])))],
    requiresLockout: s.requiresLockout,
    safetyCritical: s.safetyCritical,
  }));
}

function pickMeter(meters: MeterInfo[], want: StarterMeter, condition: boolean): MeterInfo | null {
  const fit = meters.filter((m) => (condition ? m.kind === 'condition' : m.kind !== 'condition'));
  for (const code of want.codes) {
    const byCode = fit.find((m) => m.code === code);
    if (byCode) return byCode;
  }
  const byUnit = fit.filter((m) => m.unit === want.unit);
  return byUnit.length === 1 ? byUnit[0] : null;
}

const kindLabel = (k: string) => MACHINE_KIND_LABELS[k as MachineKind]?.toLowerCase() ?? k;
const article = (w: string) => (/^[aeiou]/i.test(w) ? 'an' : 'a');

type StarterPick =
  | { ok: false; reason: string }
  /** `missing`: meters the machine lacks, for triggers that are left out (a calendar trigger remains). */
  | { ok: true; triggers: TriggerInput[]; missing: string[] };

/** One place decides whether a starter fits a machine, so the preview and the apply agree. */
function pickStarter(s: StarterPlan, machine: IMachine, meters: MeterInfo[], applied: Set<string | null | undefined>, today: string | null): StarterPick {
  if (!s.machineKinds.includes(machine.kind)) {
    const meant = s.machineKinds.map(kindLabel);
    return {
      ok: false,
      reason: `Meant for ${article(meant[0])} ${meant.join(' or ')}; ${machine.code} is ${article(kindLabel(machine.kind))} ${kindLabel(machine.kind)}`,
    };
  }
  if (applied.has(s.key)) return { ok: false, reason: `Already applied to ${machine.code}` };
  const triggers: TriggerInput[] = [];
  const missing: string[] = [];
  for (const t of s.triggers) {
    if (t.kind === 'meter' || t.kind === 'condition') {
      const m = pickMeter(meters, t.meter, t.kind === 'condition');
      if (!m) {
        missing.push(`${t.meter.codes[0]} (${t.meter.unit})`);
        continue;
      }
      triggers.push(
        t.kind === 'meter' ? { kind: 'meter', meterId: m.id, every: t.every } : { kind: 'condition', meterId: m.id, above: t.above, below: t.below },
      );
    } else if (t.kind === 'calendar-fixed') {
      triggers.push({ kind: 'calendar-fixed', start: `${today}T${t.time}`, rrule: t.rrule });
    } else {
      triggers.push(t);
    }
  }
  // A starter whose only triggers are missing meters cannot work; one with a calendar fallback still can.
  if (triggers.length === 0) return { ok: false, reason: `${machine.code} has no meter for ${missing.join(', ')}` };
  return { ok: true, triggers, missing };
}

/** Every starter with whether it fits this machine and why not, before anything is applied. */
export async function starterFits(em: EntityManager, machineId: string): Promise<StarterView[]> {
  const machine = await findMachine(em, machineId);
  const meters = await metersOf(em, await relatedMachineIds(em, machine));
  const existing = await em.find(MaintenancePlan, { machine: machine.id, active: true, starterKey: { $ne: null } }, { fields: ['starterKey'] });
  const applied = new Set(existing.map((p) => p.starterKey));
  const views = listStarters();
  return STARTER_PLANS.map((s, i) => {
    // The date only shapes a calendar trigger's start, which the preview does not show.
    const pick = pickStarter(s, machine, meters, applied, '2000-01-01');
    const fit: StarterFit = !pick.ok
      ? { status: 'no', reason: pick.reason }
      : pick.missing.length
        ? { status: 'partial', reason: `Without its ${pick.missing.join(', ')} trigger: ${machine.code} has no such meter` }
        : { status: 'fits', reason: null };
    return { ...views[i], fit };
  });
}

/**
 * Turns starters into plans on one machine, in one transaction; explains every starter it skips.
 * Fixed calendars start today (site time) unless `startDate` (YYYY-MM-DD) says otherwise.
 */
export async function applyStarters(
  em: EntityManager,
  who: Principal,
  input: ApplyStartersInput,
  opts: { startDate?: string } = {},
): Promise<ApplyStartersResult> {
  return em.transactional(async (tx) => {
    const machine = await findMachine(tx, input.machineId);
    const tz = who.timeZone;
    const meters = await metersOf(tx, await relatedMachineIds(tx, machine));
    const existing = await tx.find(MaintenancePlan, { machine: machine.id, active: true, starterKey: { $ne: null } }, { fields: ['starterKey'] });
    const have = new Set(existing.map((p) => p.starterKey));
    const today = opts.startDate ?? DateTime.fromMillis(clock.ms()).setZone(tz).toISODate();
    const result: ApplyStartersResult = { created: [], skipped: [] };
    for (const key of [...new Set(input.starterKeys)]) {
      const s = findStarter(key);
      if (!s) {
        result.skipped.push({ key, title: key, reason: 'No starter plan has this key' });
        continue;
      }
      const pick = pickStarter(s, machine, meters, have, today);
      if (!pick.ok) {
        result.skipped.push({ key, title: s.title, reason: pick.reason });
        continue;
      }
      const { triggers, missing } = pick;
      const parts: PlanInput['parts'] = [];
      for (const p of s.parts) {
        const part = await tx.findOne(PartType, { category: p.category, active: true }, { orderBy: { partNumber: 'asc' } });
        if (part) parts.push({ partTypeId: part.id, quantity: p.quantity });
      }
      const { id } = await createPlan(
        tx,
        who,
        {
          machineId: machine.id,
          title: s.title,
          instructions: s.instructions,
          checklist: s.checklist,
          estimatedMinutes: s.estimatedMinutes,
          parts,
          responsibleRole: s.responsibleRole,
          responsibleUserId: null,
          requiresLockout: s.requiresLockout,
          safetyCritical: s.safetyCritical,
          triggers,
          dueSoonDays: s.dueSoonDays,
          dueSoonFraction: s.dueSoonFraction,
          active: true,
          stationRecord: s.stationRecord ?? null,
        },
        { starterKey: s.key },
      );
      have.add(key);
      result.created.push({ key, planId: id, title: s.title });
      if (missing.length)
        result.skipped.push({ key, title: s.title, reason: `Created without its ${missing.join(', ')} trigger: ${machine.code} has no such meter` });
    }
    return result;
  });
}
