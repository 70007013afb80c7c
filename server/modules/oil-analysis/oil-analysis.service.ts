import { QueryOrder, type EntityManager } from '@mikro-orm/postgresql';
import { OilAnalysis, OilTarget, type IOilAnalysis, type IOilTarget } from './oil-analysis.entity';
import { Machine } from '../machines/machine.entity';
import { MaintenancePlan } from '../plans/plan.entity';
import { WorkOrder } from '../work-orders/work-order.entity';
import type { Principal } from '../../http/principal';
import { badRequest, notFound } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import { cleanlinessVerdict, iso4406Code } from '../../../shared/domain/cleanliness';
import { isoViscosityGradeLimits, viscosityChange } from '../../../shared/domain/viscosity';
import { raiseWorkOrders } from '../work-orders/raise-work-orders';
import type { EvaluatePlansNow } from '../plans/plan-evaluation';
import { uuidArray } from '../../db';
import type {
  HydraulicUnitView,
  OilAnalysisInput,
  OilAnalysisRow,
  OilFinding,
  OilTarget as OilTargetView,
  OilTargetInput,
  ListOilAnalysesQuery,
  OilVerdictSettings,
} from '../../../shared/schemas/oil-analysis';
import { DEFAULT_OIL_VERDICT_SETTINGS, oilVerdictSettings } from '../../../shared/schemas/oil-analysis';
import { Organization } from '../organizations/organization.entity';
import { clock } from '../../../shared/clock';
import type { Page } from '../../../shared/schemas/paging';

async function hydraulicUnit(em: EntityManager, id: string) {
  const m = await em.findOne(Machine, { id });
  if (!m) throw notFound('Hydraulic unit');
  if (m.kind !== 'hydraulic-unit') throw badRequest(`${m.code} is not a hydraulic unit`, [{ path: 'machineId', message: 'Choose a hydraulic unit' }]);
  return m;
}

const STEP_WORD = (n: number) => `${n} step${n === 1 ? '' : 's'}`;

/**
 * Judges a result against the unit's targets and the shop's thresholds:
 * - cleanliness: ISO 4406 code (shared/domain/cleanliness.ts, ISO 4406:2021 Table 1) steps over the
 *   target on the worst size, caution/action at the shop's steps (default 1/2, common practice);
 * - viscosity at 40 °C: change from the oil's new-oil value (shared/domain/viscosity.ts), caution/action
 *   at the shop's percentages (default ±10/±20 %, common practice); without a recorded new-oil value
 *   the grade's ISO 3448 mid-point stands in, and the finding says so;
 * - water over the unit's limit: action.
 * Oil temperature at sampling is recorded and shown, not judged. Only 'action' raises condition work.
 */
export function judge(
  input: Pick<OilAnalysisInput, 'ge4um' | 'ge6um' | 'ge14um' | 'viscosity40' | 'waterPpm' | 'temperatureC'>,
  target: OilTargetView | OilTargetInput | null,
  settings: OilVerdictSettings = DEFAULT_OIL_VERDICT_SETTINGS,
) {
  const isoCode = iso4406Code({ ge4um: input.ge4um, ge6um: input.ge6um, ge14um: input.ge14um });
  const findings: OilFinding[] = [];
  let viscosityBand: string | null = null;
  if (target) {
    const c = cleanlinessVerdict(isoCode, target.targetCode, { caution: settings.cleanlinessCautionSteps, action: settings.cleanlinessActionSteps });
    if (c.verdict !== 'within') {
      const cmp = c.comparison;
      const sizes = (['ge4um', 'ge6um', 'ge14um'] as const)
        .filter((k) => cmp[k].exceeds)
        .map((k) => `≥${k.slice(2, -2)} µm by ${STEP_WORD(cmp[k].stepsOver as number)}`);
      findings.push({
        field: 'cleanliness',
        severity: c.verdict === 'action' ? 'danger' : 'caution',
        message:
          `Cleanliness ${isoCode} is worse than the target ${target.targetCode} (${sizes.join(', ')}; each step is about twice the particles): ` +
          (c.verdict === 'action'
            ? `act (${STEP_WORD(settings.cleanlinessActionSteps)} or more over)`
            : `watch the next sample (under ${STEP_WORD(settings.cleanlinessActionSteps)} over is within a recount's spread)`),
      });
    }
    if (input.viscosity40 !== null) {
      const measured = target.baselineViscosityCst ?? null;
      const baseline = measured ?? isoViscosityGradeLimits(target.vgGrade).midpoint;
      const v = viscosityChange(input.viscosity40, baseline, {
        cautionPercent: settings.viscosityCautionPercent,
        actionPercent: settings.viscosityActionPercent,
      });
      viscosityBand = v.verdict;
      if (v.verdict !== 'within') {
        const pct = `${v.changePercent > 0 ? '+' : ''}${Math.round(v.changePercent * 10) / 10} %`;
        const from =
          measured !== null ? `the new-oil value ${baseline} mm²/s` : `ISO VG ${target.vgGrade}'s mid-point ${baseline} mm²/s (no new-oil value recorded)`;
        const limit = v.verdict === 'action' ? `±${settings.viscosityActionPercent} %` : `±${settings.viscosityCautionPercent} %`;
        findings.push({
          field: 'viscosity',
          severity: v.verdict === 'action' ? 'danger' : 'caution',
          message: `Viscosity ${input.viscosity40} mm²/s is ${pct} from ${from}, at or beyond ${limit}`,
        });
      }
    }
    if (input.waterPpm !== null && input.waterPpm > target.waterLimitPpm) {
      findings.push({ field: 'water', severity: 'danger', message: `Water ${input.waterPpm} ppm is above the limit of ${target.waterLimitPpm} ppm` });
    }
  }
  const outOfLimits = findings.some((f) => f.severity === 'danger');
  const verdict: OilAnalysisRow['verdict'] = outOfLimits ? 'action' : findings.length ? 'caution' : 'within';
  return { isoCode, findings, viscosityBand, outOfLimits, verdict };
}

function toRow(a: IOilAnalysis, machine: { id: string; code: string; name: string }, wo: { id: string; number: number } | null): OilAnalysisRow {
  return {
    id: a.id,
    machine,
    sampledAt: a.sampledAt.toISOString(),
    labReference: a.labReference ?? null,
    ge4um: a.ge4um,
    ge6um: a.ge6um,
    ge14um: a.ge14um,
    isoCode: a.isoCode,
    targetCode: a.targetCode ?? null,
    viscosity40: a.viscosity40 ?? null,
    vgGrade: a.vgGrade ?? null,
    viscosityBand: a.viscosityBand ?? null,
    waterPpm: a.waterPpm ?? null,
    temperatureC: a.temperatureC ?? null,
    verdict: a.outOfLimits ? 'action' : a.findings.length ? 'caution' : 'within',
    outOfLimits: a.outOfLimits,
    findings: a.findings,
    workOrder: wo,
  };
}

const targetView = (t: IOilTarget): OilTargetView => ({
  machineId: t.machine.id,
  targetCode: t.targetCode,
  vgGrade: t.vgGrade,
  baselineViscosityCst: t.baselineViscosityCst ?? null,
  waterLimitPpm: t.waterLimitPpm,
  temperatureLimitC: t.temperatureLimitC ?? null,
});

/** The shop's oil thresholds (Organization.settings.oil) over the common-practice defaults. */
export async function loadOilSettings(em: EntityManager, orgId: string): Promise<OilVerdictSettings> {
  const org = await em.findOneOrFail(Organization, orgId);
  const stored = (org.settings as { oil?: Partial<OilVerdictSettings> } | null)?.oil ?? {};
  return { ...DEFAULT_OIL_VERDICT_SETTINGS, ...stored };
}

export async function saveOilSettings(em: EntityManager, who: Principal, input: OilVerdictSettings): Promise<OilVerdictSettings> {
  const parsed = oilVerdictSettings.parse(input);
  return em.transactional(async (tx) => {
    const org = await tx.findOneOrFail(Organization, who.orgId);
    const before = await loadOilSettings(tx, who.orgId);
    org.settings = { ...(org.settings ?? {}), oil: parsed };
    recordActivity(tx, who, 'oil.settings', { type: 'Organization', id: org.id }, { before, after: parsed });
    return parsed;
  });
}

export async function listUnits(em: EntityManager): Promise<HydraulicUnitView[]> {
  const units = await em.find(Machine, { kind: 'hydraulic-unit', active: true }, { orderBy: { code: 'asc' } });
  const targets = await em.find(OilTarget, { machine: { $in: units.map((u) => u.id) } });
  const out: HydraulicUnitView[] = [];
  for (const u of units) {
    const [latest] = await em.find(OilAnalysis, { machine: u.id }, { orderBy: { sampledAt: 'desc' }, limit: 1, populate: ['workOrder'] });
    const t = targets.find((x) => x.machine.id === u.id);
    const m = { id: u.id, code: u.code, name: u.name };
    out.push({
      ...m,
      target: t ? targetView(t) : null,
      latest: latest ? toRow(latest, m, latest.workOrder ? { id: latest.workOrder.id, number: latest.workOrder.getEntity().number } : null) : null,
    });
  }
  return out;
}

export async function setTarget(em: EntityManager, who: Principal, machineId: string, input: OilTargetInput): Promise<OilTargetView> {
  return em.transactional(async (tx) => {
    const unit = await hydraulicUnit(tx, machineId);
    let t = await tx.findOne(OilTarget, { machine: unit.id });
    const before = t ? targetView(t) : null;
    if (t) Object.assign(t, input);
    else t = tx.create(OilTarget, { organization: who.orgId, machine: unit, ...input });
    recordActivity(tx, who, 'oil.target', { type: 'Machine', id: unit.id }, { before, after: input });
    return targetView(t);
  });
}

export async function listAnalyses(em: EntityManager, q: ListOilAnalysesQuery): Promise<Page<OilAnalysisRow>> {
  // Missing values sort last either way; ties fall back to the newest sample first.
  const dir = q.dir === 'asc' ? QueryOrder.ASC_NULLS_LAST : QueryOrder.DESC_NULLS_LAST;
  const first = q.sort === 'unit' ? { machine: { code: dir } } : { [q.sort]: dir };
  const [items, total] = await em.findAndCount(OilAnalysis, q.machineId ? { machine: q.machineId } : {}, {
    orderBy: [first, { sampledAt: QueryOrder.DESC }, { id: QueryOrder.ASC }],
    limit: q.pageSize,
    offset: (q.page - 1) * q.pageSize,
    populate: ['machine', 'workOrder'],
  });
  return {
    rows: items.map((a) => {
      const m = a.machine.getEntity();
      return toRow(a, { id: m.id, code: m.code, name: m.name }, a.workOrder ? { id: a.workOrder.id, number: a.workOrder.getEntity().number } : null);
    }),
    total,
    page: q.page,
    pageSize: q.pageSize,
  };
}

/**
 * Records a result. Outside its targets it raises condition work: through the unit's plans with an
 * oil-analysis trigger when there are any (`evaluatePlansNow`, the due engine, so the occurrence is
 * raised once), else as a condition work order of its own.
 */
export async function recordAnalysis(em: EntityManager, who: Principal, input: OilAnalysisInput, evaluatePlansNow: EvaluatePlansNow): Promise<OilAnalysisRow> {
  const saved = await em.transactional(async (tx) => {
    const unit = await hydraulicUnit(tx, input.machineId);
    const t = await tx.findOne(OilTarget, { machine: unit.id });
    const target = t ? targetView(t) : null;
    const verdict = judge(input, target, await loadOilSettings(tx, who.orgId));
    const a = tx.create(OilAnalysis, {
      organization: who.orgId,
      machine: unit,
      sampledAt: new Date(input.sampledAt),
      labReference: input.labReference ?? null,
      ge4um: input.ge4um,
      ge6um: input.ge6um,
      ge14um: input.ge14um,
      isoCode: verdict.isoCode,
      targetCode: target?.targetCode ?? null,
      viscosity40: input.viscosity40,
      vgGrade: target?.vgGrade ?? null,
      viscosityBand: verdict.viscosityBand,
      waterPpm: input.waterPpm,
      temperatureC: input.temperatureC,
      outOfLimits: verdict.outOfLimits,
      findings: verdict.findings,
      recordedBy: who.userId,
      notes: input.notes ?? null,
    });
    const plans = verdict.outOfLimits ? await tx.find(MaintenancePlan, { machine: unit.id, active: true }) : [];
    const oilPlans = plans.filter((p) => p.triggers.some((tr) => tr.kind === 'oil-analysis'));
    if (verdict.outOfLimits && oilPlans.length === 0) {
      const [wo] = await raiseWorkOrders(
        tx,
        who.orgId,
        who,
        [
          {
            standalone: {
              machineId: unit.id,
              kind: 'condition',
              title: `Oil result outside targets on ${unit.code}`,
              instructions: verdict.findings.map((f) => f.message).join('\n'),
              reason: `oil sample of ${input.sampledAt.slice(0, 10)}: ${verdict.findings
                .filter((f) => f.severity === 'danger')
                .map((f) => f.message)
                .join('; ')}`,
              dueAt: clock.now(),
              assigneeId: null,
              responsibleRole: 'technician',
              requiresLockout: false,
              safetyCritical: false,
              raisedById: null,
              auditDetails: { oilAnalysisId: a.id },
            },
          },
        ],
        // Left for the pass's notice step, as before (that step reads plan work only, so no mail goes out).
        { mode: 'by-pass' },
      );
      a.workOrder = tx.getReference(WorkOrder, wo.id, { wrapped: true });
    }
    recordActivity(
      tx,
      who,
      'oil.recorded',
      { type: 'OilAnalysis', id: a.id },
      { machine: unit.code, isoCode: verdict.isoCode, outOfLimits: verdict.outOfLimits },
    );
    return { id: a.id, unit: { id: unit.id, code: unit.code, name: unit.name }, oilPlanIds: oilPlans.map((p) => p.id) };
  });
  if (saved.oilPlanIds.length) {
    // After the result is committed, so the engine reads it.
    await evaluatePlansNow(who.orgId, saved.oilPlanIds);
    const [wo]: { id: string }[] = await em.execute(
      `select w.id from work_order w join maintenance_plan p on p.id = w.plan_id and w.occurrence_key = p.last_raised_key
        where p.id = any(?::uuid[]) and w.status in ('open', 'in-progress', 'on-hold') order by w.created_at desc limit 1`,
      [uuidArray(saved.oilPlanIds)],
    );
    if (wo) await em.nativeUpdate(OilAnalysis, { id: saved.id }, { workOrder: wo.id });
  }
  em.clear();
  const a = await em.findOneOrFail(OilAnalysis, { id: saved.id }, { populate: ['workOrder'] });
  return toRow(a, saved.unit, a.workOrder ? { id: a.workOrder.id, number: a.workOrder.getEntity().number } : null);
}
