import { QueryOrder, type EntityManager } from '@mikro-orm/postgresql';
import { OilAnalysis, OilTarget, type IOilAnalysis, type IOilTarget } from './oil-analysis.entity';
import { Machine } from '../machines/machine.entity';
import { MaintenancePlan } from '../plans/plan.entity';
import { WorkOrder } from '../work-orders/work-order.entity';
import type { Principal } from '../../http/principal';
import { badRequest, notFound } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import { compareToTarget, iso4406Code } from '../../../shared/domain/cleanliness';
import { viscosityStatus } from '../../../shared/domain/viscosity';
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
} from '../../../shared/schemas/oil-analysis';
import { clock } from '../../../shared/clock';
import type { Page } from '../../../shared/schemas/paging';

/** Inside ±5 % of the grade mid-point is fine; beyond that (still inside the ±10 % ISO 3448 band) is a drift warning. */
const VISCOSITY_WARN = 0.05;

async function hydraulicUnit(em: EntityManager, id: string) {
  const m = await em.findOne(Machine, { id });
  if (!m) throw notFound('Hydraulic unit');
  if (m.kind !== 'hydraulic-unit') throw badRequest(`${m.code} is not a hydraulic unit`, [{ path: 'machineId', message: 'Choose a hydraulic unit' }]);
  return m;
}

/**
 * Judges a result against the unit's targets: ISO 4406 code size by size (shared/domain/cleanliness.ts,
 * ISO 4406:2021 Table 1), kinematic viscosity at 40 °C against the ISO VG band (shared/domain/viscosity.ts,
 * ISO 3448 Table 1), water against the site's limit, temperature against the site's limit.
 */
export function judge(
  input: Pick<OilAnalysisInput, 'ge4um' | 'ge6um' | 'ge14um' | 'viscosity40' | 'waterPpm' | 'temperatureC'>,
  target: OilTargetInput | null,
) {
  const isoCode = iso4406Code({ ge4um: input.ge4um, ge6um: input.ge6um, ge14um: input.ge14um });
  const findings: OilFinding[] = [];
  let viscosityBand: string | null = null;
  if (target) {
    const cmp = compareToTarget(isoCode, target.targetCode);
    if (cmp.exceedsAny) {
      const sizes = (['ge4um', 'ge6um', 'ge14um'] as const)
        .filter((k) => cmp[k].exceeds)
        .map((k) => `≥${k.slice(2, -2)} µm by ${cmp[k].stepsOver} step${cmp[k].stepsOver === 1 ? '' : 's'}`);
      findings.push({
        field: 'cleanliness',
        severity: 'danger',
        message: `Cleanliness ${isoCode} is worse than the target ${target.targetCode} (${sizes.join(', ')}; each step is about twice the particles)`,
      });
    }
    if (input.viscosity40 !== null) {
      const v = viscosityStatus(input.viscosity40, target.vgGrade, { warnFraction: VISCOSITY_WARN });
      viscosityBand = v.band;
      const pct = `${v.deviation > 0 ? '+' : ''}${Math.round(v.deviation * 1000) / 10} %`;
      if (v.band === 'below' || v.band === 'above') {
        findings.push({
          field: 'viscosity',
          severity: 'danger',
          message: `Viscosity ${input.viscosity40} mm²/s is ${v.band} the ISO VG ${target.vgGrade} band ${v.limits.min}–${v.limits.max} mm²/s (${pct})`,
        });
      } else if (v.band === 'near-limit') {
        findings.push({
          field: 'viscosity',
          severity: 'caution',
          message: `Viscosity ${input.viscosity40} mm²/s is inside ISO VG ${target.vgGrade} but ${pct} from its mid-point`,
        });
      }
    }
    if (input.waterPpm !== null && input.waterPpm > target.waterLimitPpm) {
      findings.push({ field: 'water', severity: 'danger', message: `Water ${input.waterPpm} ppm is above the limit of ${target.waterLimitPpm} ppm` });
    }
    if (input.temperatureC !== null && target.temperatureLimitC !== null && input.temperatureC > target.temperatureLimitC) {
      findings.push({
        field: 'temperature',
        severity: 'danger',
        message: `Oil temperature ${input.temperatureC} °C is above the limit of ${target.temperatureLimitC} °C`,
      });
    }
  }
  return { isoCode, findings, viscosityBand, outOfLimits: findings.some((f) => f.severity === 'danger') };
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
    outOfLimits: a.outOfLimits,
    findings: a.findings,
    workOrder: wo,
  };
}

const targetView = (t: IOilTarget): OilTargetView => ({
  machineId: t.machine.id,
  targetCode: t.targetCode,
  vgGrade: t.vgGrade,
  waterLimitPpm: t.waterLimitPpm,
  temperatureLimitC: t.temperatureLimitC ?? null,
});

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
    const verdict = judge(input, target);
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
