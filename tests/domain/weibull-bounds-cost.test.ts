import { describe, it, expect } from 'vitest';
import {
  ageReplacementCostRate,
  fitWeibull,
  optimalChangeAge,
  runToFailureCostRate,
  weibullConfidenceBounds,
  weibullMeanLife,
} from '../../shared/domain/weibull';

// NIST e-Handbook §8.4.1.3 censored example: 10 failures, 10 units removed unfailed at 500 h.
const NIST_FAILURES = [54, 187, 216, 240, 244, 335, 361, 373, 375, 386];
const NIST_SUSPENSIONS = Array<number>(10).fill(500);

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('weibullConfidenceBounds (Fisher matrix, Meeker & Escobar §8.4)', () => {
  // Reference computed with SciPy 1.17.1 (/tmp script, written down here):
  //   data = stats.CensoredData(uncensored=fail, right=[500]*10)
  //   c, loc, scale = stats.weibull_min.fit(data, floc=0)          → β 1.7207972, η 606.52757
  //   H = central-difference Hessian (step 1e-4 relative) of
  //       Σ weibull_min.logpdf(fail) + Σ weibull_min.logsf(susp) at (β, η)
  //   cov = inv(−H) → [[0.252155, −28.3136], [−28.3136, 15602.67]]
  //   95 % two-sided, z = norm.ppf(0.975), log-scale Wald bounds:
  //     β  [0.971266, 3.048745]   η [405.0893, 908.1348]
  //     B10 (delta method on ln t_p) 164.0224, [83.87512, 320.75491]
  const fit = fitWeibull(NIST_FAILURES, NIST_SUSPENSIONS);
  const b = weibullConfidenceBounds(NIST_FAILURES, NIST_SUSPENSIONS, fit, 0.95);

  it('covariance matches the numerical Hessian of an independent (SciPy) log-likelihood', () => {
    // Finite differences carry about 1e-6 relative error, so compare to 1e-4.
    expect(rel(b.covariance[0][0], 0.252155194)).toBeLessThan(1e-4);
    expect(rel(b.covariance[0][1], -28.3136223)).toBeLessThan(1e-4);
    expect(rel(b.covariance[1][1], 15602.6719)).toBeLessThan(1e-4);
  });

  it('95 % bounds on shape, scale and B10 match SciPy', () => {
    expect(b.method).toBe('fisher-matrix');
    expect(rel(b.shape.lower, 0.9712660693)).toBeLessThan(1e-4);
    expect(rel(b.shape.upper, 3.0487453754)).toBeLessThan(1e-4);
    expect(rel(b.scale.lower, 405.0893008)).toBeLessThan(1e-4);
    expect(rel(b.scale.upper, 908.1347907)).toBeLessThan(1e-4);
    expect(rel(b.b10.lower, 83.87512294)).toBeLessThan(1e-4);
    expect(rel(b.b10.upper, 320.7549129)).toBeLessThan(1e-4);
  });

  it('the bounds enclose the estimate and widen with the level and with fewer failures', () => {
    const b90 = weibullConfidenceBounds(NIST_FAILURES, NIST_SUSPENSIONS, fit, 0.9);
    expect(b90.shape.lower).toBeGreaterThan(b.shape.lower);
    expect(b90.shape.lower).toBeLessThan(fit.shape);
    expect(b90.shape.upper).toBeGreaterThan(fit.shape);
    // Same data with half the failures turned into suspensions: less information, wider bounds.
    const fewer = NIST_FAILURES.slice(0, 5);
    const more = [...NIST_FAILURES.slice(5), ...NIST_SUSPENSIONS];
    const f2 = fitWeibull(fewer, more);
    const b2 = weibullConfidenceBounds(fewer, more, f2, 0.9);
    expect(b2.shape.upper / b2.shape.lower).toBeGreaterThan(b90.shape.upper / b90.shape.lower);
  });

  it('rejects a level outside (0, 1)', () => {
    expect(() => weibullConfidenceBounds(NIST_FAILURES, NIST_SUSPENSIONS, fit, 1)).toThrow(/level/);
  });
});

describe('optimalChangeAge (age replacement, Barlow & Proschan)', () => {
  // References computed with SciPy 1.17.1:
  //   C = lambda T: (cp*R(T) + cf*(1-R(T))) / integrate.quad(R, 0, T, epsabs=1e-13, epsrel=1e-13)[0]
  //   optimize.minimize_scalar(C, bounds=(1e-6*eta, 3*eta), method='bounded', options={'xatol': 1e-10})
  //   run to failure: cf / (eta * special.gamma(1 + 1/beta))
  const cases = [
    { beta: 2.5, eta: 1000, cp: 10, cf: 60, age: 450.083024, rate: 0.03774409, rtf: 0.06762363 },
    { beta: 2.0, eta: 1.0, cp: 1, cf: 5, age: 0.510655, rate: 4.085241794, rtf: 5.641895835 },
    { beta: 3.0, eta: 1.0, cp: 1, cf: 10, age: 0.382456, rate: 3.949350299, rtf: 11.198465217 },
    { beta: 1.7208, eta: 606.528, cp: 4, cf: 40, age: 208.052059, rate: 0.047232565, rtf: 0.073973065 },
  ];
  for (const c of cases) {
    it(`β ${c.beta}, η ${c.eta}, Cp ${c.cp}, Cf ${c.cf} → T* ${c.age} (SciPy)`, () => {
      const fit = { shape: c.beta, scale: c.eta };
      const out = optimalChangeAge(fit, { plannedCost: c.cp, failureCost: c.cf })!;
      // The cost curve is flat at its minimum, so SciPy's bounded search pins T* to ~1e-6 relative.
      expect(rel(out.age, c.age)).toBeLessThan(1e-5);
      expect(rel(out.costRate, c.rate)).toBeLessThan(1e-8);
      expect(rel(runToFailureCostRate(fit, c.cf), c.rtf)).toBeLessThan(1e-8);
    });
  }

  it('at the optimum C(T*) = (Cf − Cp)·h(T*), and nearby ages cost more (Barlow & Proschan, first-order condition)', () => {
    const fit = { shape: 2.5, scale: 1000 };
    const costs = { plannedCost: 10, failureCost: 60 };
    const { age, costRate } = optimalChangeAge(fit, costs)!;
    const hazard = (2.5 / 1000) * Math.pow(age / 1000, 1.5);
    expect(rel(costRate, 50 * hazard)).toBeLessThan(1e-9);
    for (const f of [0.9, 0.97, 1.03, 1.1]) expect(ageReplacementCostRate(fit, costs, age * f)).toBeGreaterThan(costRate);
  });

  it('hand-worked: β = 2, η = 1 → ∫₀^∞ R = Γ(1.5) = √π/2, so run to failure costs Cf·2/√π', () => {
    expect(rel(weibullMeanLife({ shape: 2, scale: 1 }), Math.sqrt(Math.PI) / 2)).toBeLessThan(1e-12);
    expect(rel(runToFailureCostRate({ shape: 2, scale: 1 }, 5), 10 / Math.sqrt(Math.PI))).toBeLessThan(1e-12);
  });

  it('no planned change pays when the hazard does not rise (β ≤ 1): null', () => {
    expect(optimalChangeAge({ shape: 1, scale: 500 }, { plannedCost: 1, failureCost: 10 })).toBeNull();
    expect(optimalChangeAge({ shape: 0.7, scale: 500 }, { plannedCost: 1, failureCost: 10 })).toBeNull();
  });

  it('refuses a failure cost not above the planned cost, and negative costs', () => {
    const fit = { shape: 2, scale: 100 };
    expect(() => optimalChangeAge(fit, { plannedCost: 10, failureCost: 8 })).toThrow(/failureCost must be above plannedCost/);
    expect(() => optimalChangeAge(fit, { plannedCost: 10, failureCost: 10 })).toThrow(/failureCost/);
    expect(() => optimalChangeAge(fit, { plannedCost: -1, failureCost: 10 })).toThrow(/plannedCost/);
  });

  it('the dearer a failure, the earlier the change', () => {
    const fit = { shape: 2.5, scale: 1000 };
    const cheap = optimalChangeAge(fit, { plannedCost: 10, failureCost: 20 })!.age;
    const dear = optimalChangeAge(fit, { plannedCost: 10, failureCost: 200 })!.age;
    expect(dear).toBeLessThan(cheap);
  });
});
