// Hochberg's step-up procedure.
//
// Uses Holm's thresholds, alpha / (m - i + 1) for the i-th smallest p-value,
// but steps up from the largest: find the largest i with
// p(i) <= alpha / (m - i + 1) and reject that hypothesis and every one with a
// smaller p-value. The adjusted p-value of the i-th smallest is
// min over j >= i of (m - j + 1) p(j), capped at 1. It controls the
// family-wise error rate (FWER) when the tests are independent or positively
// dependent (Simes' inequality holds, e.g. under positive regression
// dependence; Sarkar 1998, Annals of Statistics 26:494-504), not under
// arbitrary dependence. It rejects at least what Holm rejects.
//
// Cost: one sort, then one linear pass.
// Source: Hochberg, Y. (1988). A sharper Bonferroni procedure for multiple
// tests of significance. Biometrika 75:800-802.

import { HOLM_STEPS } from './holm.js';
import type { StepForm } from './step-parts.js';
import { adjustInInputOrder } from './sorting.js';

/** Hochberg adjusted values of ascending p-values; m may exceed sorted.length (absent tests count as p = 1). */
export function hochbergSorted(sorted: Float64Array, m: number): Float64Array {
  const adjusted = new Float64Array(sorted.length);
  let runningMin = Infinity;
  for (let i = sorted.length - 1; i >= 0; i--) {
    runningMin = Math.min(runningMin, (m - i) * sorted[i]);
    adjusted[i] = Math.min(1, runningMin);
  }
  return adjusted;
}

/** Hochberg adjusted p-values in input order. */
export function adjustHochberg(p: Float64Array, m: number = p.length): Float64Array {
  return adjustInInputOrder(p, m, hochbergSorted);
}

/** Hochberg as a step form: the running minimum of (m - i) p(i), capped at 1 (test/step-parts.test.ts checks it against hochbergSorted). */
export const HOCHBERG_STEPS: StepForm = {
  direction: 'up',
  // Holm's term, (m - i) p(i), taken as a running minimum instead of a maximum.
  terms: HOLM_STEPS.terms,
  cap: true,
  factor: () => 1,
};
