// Holm's step-down procedure.
//
// Sort the p-values from smallest to largest, p(1) <= ... <= p(m). Compare
// p(1) with alpha / m, p(2) with alpha / (m - 1), and so on; stop at the first
// one that fails and reject everything before it. The adjusted p-value of the
// i-th smallest is max over j <= i of (m - j + 1) p(j), capped at 1: the
// running maximum keeps the adjusted values in the same order as the raw ones.
// It controls the family-wise error rate (FWER) at alpha under any
// dependence, like Bonferroni, and never rejects less than Bonferroni.
//
// Cost: one sort, then one linear pass.
// Source: Holm, S. (1979). A simple sequentially rejective multiple test
// procedure. Scandinavian Journal of Statistics 6:65-70.

import type { StepForm } from './step-parts.js';
import { adjustInInputOrder } from './sorting.js';

/** Holm adjusted values of ascending p-values; m may exceed sorted.length (absent tests count as p = 1). */
export function holmSorted(sorted: Float64Array, m: number): Float64Array {
  const adjusted = new Float64Array(sorted.length);
  let runningMax = 0;
  for (let i = 0; i < sorted.length; i++) {
    runningMax = Math.max(runningMax, (m - i) * sorted[i]);
    adjusted[i] = Math.min(1, runningMax);
  }
  return adjusted;
}

/** Holm adjusted p-values in input order. */
export function adjustHolm(p: Float64Array, m: number = p.length): Float64Array {
  return adjustInInputOrder(p, m, holmSorted);
}

/** Holm as a step form: the running maximum of (m - i) p(i), capped at 1 (test/step-parts.test.ts checks it against holmSorted). */
export const HOLM_STEPS: StepForm = {
  direction: 'down',
  terms(sorted, ranks, m, out, at) {
    for (let k = 0; k < sorted.length; k++) out[at + k] = (m - (ranks[k] as number)) * (sorted[k] as number);
  },
  cap: true,
  factor: () => 1,
};
