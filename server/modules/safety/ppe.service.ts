import { randomUUID } from 'node:crypto';
import type { EntityManager } from '@mikro-orm/postgresql';
import { Machine } from '../machines/machine.entity';
import { PpeCheck, PpeRequirement, type IPpeRequirement } from './records.entity';
import { appendSignOff } from './chain';
import { fieldError, notFound } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import type { Principal } from '../../http/principal';
import { loadSafetySettings } from './settings';
import { deriveRequiredItems } from '../../../shared/schemas/safety-ppe-derive';
import type { ShadeTable } from '../../../shared/domain/shade';
import type { SafetySettings } from '../../../shared/schemas/safety-records';
import type { PpeCheckInput, PpeRequirementInput, PpeRequirementRow } from '../../../shared/schemas/safety-ppe';

export const deriveSettings = (s: SafetySettings) => ({
  shadeTable: (s.shadeTable as ShadeTable | null) ?? null,
  hearingRequiredFromDbA: s.hearingRequiredFromDbA,
  hearingRuleSource: s.hearingRuleSource,
});

type RequirementInputs = Pick<IPpeRequirement, 'items' | 'otherItems' | 'arcCurrentA' | 'noise' | 'peakDbC' | 'protectorNrr'>;

/** What a requirement asks for once the shop's shade table and hearing rule are applied. */
export function derivedFor(r: RequirementInputs, settings: SafetySettings) {
  return deriveRequiredItems(
    {
      items: r.items,
      otherItems: r.otherItems,
      arcCurrentA: r.arcCurrentA ?? null,
      noise: r.noise,
      peakDbC: r.peakDbC ?? null,
      protectorNrr: r.protectorNrr ?? null,
    },
    deriveSettings(settings),
  );
}

/** The signed statement of a PPE check: the items put on, the shade and the hearing figures it rests on. */
export function ppeCheckDetails(machineCode: string, r: { id: string; task: string }, derived: ReturnType<typeof derivedFor>) {
  return {
    summary: `${machineCode} ${r.task}: ${derived.required.map((i) => (i.code === 'filter-lens' && derived.shade?.ok ? `${i.label.split(' (')[0]} shade ${derived.shade.minimum}+` : i.label.split(' (')[0])).join(', ')}`,
    requirementId: r.id,
    task: r.task,
    items: derived.required.map((i) => ({ code: i.code, detail: i.detail })),
    shade: derived.shade?.ok ? { minimum: derived.shade.minimum, arcCurrentA: derived.shade.arcCurrentA, source: derived.shade.source } : null,
    hearing: derived.hearing
      ? {
          twaDbA: derived.hearing.twaDbA,
          pelTwaDbA: derived.hearing.pel.twaDbA,
          overPel: derived.hearing.pel.reached,
          required: derived.hearing.required,
          rule: derived.hearing.ruleSource,
        }
      : null,
  };
}

function toRow(r: IPpeRequirement, settings: SafetySettings, last: { at: Date; name: string } | undefined): PpeRequirementRow {
  const machine = r.machine.getEntity();
  const derived = derivedFor(r, settings);
  return {
    id: r.id,
    machineId: machine.id,
    machineCode: machine.code,
    machineName: machine.name,
    task: r.task,
    items: r.items,
    otherItems: r.otherItems,
    arcCurrentA: r.arcCurrentA ?? null,
    noise: r.noise,
    peakDbC: r.peakDbC ?? null,
    protectorNrr: r.protectorNrr ?? null,
    cadence: r.cadence,
    ...derived,
    lastCheckAt: last ? last.at.toISOString() : null,
    lastCheckByName: last?.name ?? null,
  };
}

export async function listRequirements(em: EntityManager, who: Principal, machineId?: string): Promise<PpeRequirementRow[]> {
  const reqs = await em.find(
    PpeRequirement,
    { active: true, ...(machineId ? { machine: machineId } : {}) },
    { populate: ['machine'], orderBy: { machine: { code: 'asc' }, task: 'asc' } },
  );
  const { settings } = await loadSafetySettings(em, who.orgId);
  const last = await em.getConnection().execute<{ requirement_id: string; checked_at: Date; name: string }[]>(
    `select distinct on (c.requirement_id) c.requirement_id, c.checked_at, u.name from safety_ppe_check c join app_user u on u.id = c.person_id
      where c.organization_id = ? order by c.requirement_id, c.checked_at desc`,
    [who.orgId],
  );
  const byReq = new Map(last.map((l) => [l.requirement_id, { at: new Date(l.checked_at), name: l.name }]));
  return reqs.map((r) => toRow(r, settings, byReq.get(r.id)));
}

export async function saveRequirement(em: EntityManager, who: Principal, input: PpeRequirementInput, id?: string): Promise<{ id: string }> {
  return em.transactional(async (tx) => {
    const machine = await tx.findOne(Machine, input.machineId);
    if (!machine) throw notFound('Machine');
    const { settings } = await loadSafetySettings(tx, who.orgId);
    // Refuse an arc current the shade table cannot answer, instead of posting no shade at all.
    const derived = deriveRequiredItems(
      {
        items: input.items,
        otherItems: input.otherItems,
        arcCurrentA: input.arcCurrentA,
        noise: input.noise,
        peakDbC: input.peakDbC,
        protectorNrr: input.protectorNrr,
      },
      deriveSettings(settings),
    );
    if (derived.shade && !derived.shade.ok) throw fieldError('arcCurrentA', derived.shade.message);
    let r: IPpeRequirement;
    if (id) {
      const found = await tx.findOne(PpeRequirement, id);
      if (!found) throw notFound('PPE requirement');
      r = found;
      Object.assign(r, {
        machine,
        task: input.task,
        items: input.items,
        otherItems: input.otherItems,
        arcCurrentA: input.arcCurrentA,
        noise: input.noise,
        peakDbC: input.peakDbC,
        protectorNrr: input.protectorNrr,
        cadence: input.cadence,
      });
    } else {
      r = tx.create(PpeRequirement, {
        organization: who.orgId,
        machine,
        task: input.task,
        items: input.items,
        otherItems: input.otherItems,
        arcCurrentA: input.arcCurrentA,
        noise: input.noise,
        peakDbC: input.peakDbC,
        protectorNrr: input.protectorNrr,
        cadence: input.cadence,
        active: true,
      });
    }
    recordActivity(
      tx,
      who,
      id ? 'safety.ppe-requirement-changed' : 'safety.ppe-requirement-created',
      { type: 'PpeRequirement', id: r.id },
      { machine: machine.code, task: input.task, required: derived.required.map((x) => x.code) },
    );
    return { id: r.id };
  });
}

export async function retireRequirement(em: EntityManager, who: Principal, id: string) {
  await em.transactional(async (tx) => {
    const r = await tx.findOne(PpeRequirement, id);
    if (!r) throw notFound('PPE requirement');
    r.active = false;
    recordActivity(tx, who, 'safety.ppe-requirement-retired', { type: 'PpeRequirement', id: r.id });
  });
}

/** The shift PPE check: every required item must be tapped "on" before the signature is accepted. */
export async function recordPpeCheck(em: EntityManager, who: Principal, input: PpeCheckInput) {
  return em.transactional(async (tx) => {
    const r = await tx.findOne(PpeRequirement, { id: input.requirementId, active: true }, { populate: ['machine'] });
    if (!r) throw notFound('PPE requirement');
    const { settings } = await loadSafetySettings(tx, who.orgId);
    const derived = derivedFor(r, settings);
    const missing = derived.required.filter((i) => !input.confirmed.includes(i.code));
    if (missing.length) {
      throw fieldError('confirmed', `Do not start: put on ${missing.map((m) => m.label.toLowerCase()).join(', ')} first, then sign`);
    }
    const machine = r.machine.getEntity();
    // The sign-off names the check and the check points at its sign-off: the id comes first.
    const checkId = randomUUID();
    const signOff = await appendSignOff(tx, who, {
      meaning: 'ppe-check-done',
      subjectType: 'ppe-check',
      subjectId: checkId,
      machineId: machine.id,
      details: ppeCheckDetails(machine.code, r, derived),
    });
    const check = tx.create(PpeCheck, {
      id: checkId,
      organization: who.orgId,
      machine,
      requirement: r,
      person: who.userId,
      checkedAt: signOff.signedAt,
      items: derived.required.map((i) => i.code),
      signOff,
    });
    recordActivity(tx, who, 'safety.ppe-check', { type: 'PpeCheck', id: check.id }, { machine: machine.code, signOffId: signOff.id });
    return { id: check.id, signOffId: signOff.id };
  });
}
