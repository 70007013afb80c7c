import {
  fitWeibull,
  optimalChangeAge,
  recommendedChangePoint,
  runToFailureCostRate,
  weibullBLife,
  weibullConfidenceBounds,
  weibullMeanLife,
} from '../../../shared/domain/weibull';
import type { ChangePlan, LifeFit } from '../../../shared/schemas/consumables';

/** Fewer worn-out parts than this and the fit's bounds are wide and the shape is a guess (common practice). */
export const FEW_FAILURES = 10;
/** Two-sided level of the bounds shown with a fit. */
export const BOUNDS_LEVEL = 0.9;

/** The part's change costs: planned = the shop's planned-change cost, else the part's unit cost. */
export type PartCosts = { unitCost: number; plannedChangeCost: number | null; failureCost: number | null };

/**
 * The cheapest change point for a fit and the part's costs, with the saving against running to
 * failure, or a sentence saying why there is none.
 */
export function changePlan(fit: { shape: number; scale: number }, costs: PartCosts): ChangePlan {
  const plannedCost = costs.plannedChangeCost ?? costs.unitCost;
  const failureCost = costs.failureCost;
  const base = { plannedCost, failureCost, age: null, costRate: null, runToFailureCostRate: null, savingPercent: null };
  if (failureCost === null) return { ...base, note: 'Enter the cost of a failure in service on the part to see the cheapest change point.' };
  const rtf = runToFailureCostRate(fit, failureCost);
  if (!(failureCost > plannedCost))
    return { ...base, runToFailureCostRate: rtf, note: 'A failure costs no more than a planned change, so no planned change age is cheaper: run to failure.' };
  const best = optimalChangeAge(fit, { plannedCost, failureCost });
  if (!best) return { ...base, runToFailureCostRate: rtf, note: 'Shape β ≤ 1: parts do not wear out, so a planned change never pays. Run to failure.' };
  return {
    ...base,
    age: best.age,
    costRate: best.costRate,
    runToFailureCostRate: rtf,
    savingPercent: rtf > 0 ? (1 - best.costRate / rtf) * 100 : null,
    note: null,
  };
}

/** The fit, its bounds, B10, the reliability-target change point and the cheapest change point; or why there is none. */
export function lifeModel(
  failures: number[],
  suspensions: number[],
  costs: PartCosts,
  targetReliability: number,
): { fit: LifeFit | null; fitProblem: string | null; warning: string | null } {
  if (failures.length < 3) return { fit: null, fitProblem: `A fit needs at least 3 worn-out parts; ${failures.length} so far.`, warning: null };
  try {
    const f = fitWeibull(failures, suspensions);
    const top = Math.max(...failures, ...suspensions) * 1.25;
    let bounds: LifeFit['bounds'] = null;
    try {
      const b = weibullConfidenceBounds(failures, suspensions, f, BOUNDS_LEVEL);
      bounds = { level: b.level, method: b.method, shape: b.shape, scale: b.scale, b10: b.b10 };
    } catch {
      bounds = null; // a singular information matrix: the fit stands, without bounds
    }
    return {
      fit: {
        shape: f.shape,
        scale: f.scale,
        meanLife: weibullMeanLife(f),
        b10: weibullBLife(f, 0.1),
        recommended: recommendedChangePoint(f, targetReliability),
        targetReliability,
        bounds,
        plan: changePlan(f, costs),
        curve: Array.from({ length: 41 }, (_, k) => ({ life: (top * k) / 40, reliability: Math.exp(-Math.pow((top * k) / 40 / f.scale, f.shape)) })),
      },
      fitProblem: null,
      warning:
        failures.length < FEW_FAILURES
          ? `Only ${failures.length} worn-out parts: the fit is rough (see its bounds). Trust it more from ${FEW_FAILURES} on.`
          : null,
    };
  } catch (err) {
    return { fit: null, fitProblem: err instanceof Error ? err.message : 'The fit failed', warning: null };
  }
}
