// Šidák correction.
//
// If the m tests are independent and each is run at level a, the chance that
// none of the true nulls is rejected is (1 - a)^m. Setting the FWER
// 1 - (1 - a)^m equal to alpha gives the per-test level a = 1 - (1 - alpha)^(1/m),
// a little larger than Bonferroni's alpha / m. The adjusted p-value is
// 1 - (1 - p)^m. Šidák showed the FWER stays at or below alpha also for
// two-sided tests of jointly normal statistics with any correlation; under
// other dependence it can exceed alpha, where Bonferroni cannot.
//
// Numerics: for tiny p, 1 - (1 - p)^m loses every digit (1 - p rounds to 1).
// Written as -expm1(m * log1p(-p)) it keeps full relative precision.
//
// Cost: O(m); single-step, no sorting needed.
// Source: Šidák, Z. (1967). Rectangular confidence regions for the means of
// multivariate normal distributions. Journal of the American Statistical
// Association 62:626-633.

import type { StepForm } from './step-parts.js';
import { checkedTestCount } from './validate.js';

/** 1 - (1 - p)^m without cancellation; one test (m = 1) returns p itself. */
export function sidakValue(p: number, m: number): number {
  if (m === 1) return p;
  return Math.min(1, -Math.expm1(m * Math.log1p(-p)));
}

/** Šidák adjusted values; the order of the values does not matter. */
export function sidakSorted(p: Float64Array, m: number): Float64Array {
  const out = new Float64Array(p.length);
  for (let i = 0; i < p.length; i++) out[i] = Math.max(p[i], sidakValue(p[i], m));
  return out;
}

/** Šidák adjusted p-values in input order. */
export function adjustSidak(p: Float64Array, m: number = p.length): Float64Array {
  return sidakSorted(p, checkedTestCount(p, m));
}

/** Šidák as a step form (test/step-parts.test.ts checks it against sidakSorted). */
export const SIDAK_STEPS: StepForm = {
  direction: 'single',
  terms(sorted, ranks, m, out, at) {
    for (let k = 0; k < sorted.length; k++) out[at + k] = Math.max(sorted[k] as number, sidakValue(sorted[k] as number, m));
  },
  cap: false,
  factor: () => 1,
};
