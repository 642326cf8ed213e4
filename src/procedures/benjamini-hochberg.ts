// The Benjamini-Hochberg (BH) step-up procedure.
//
// Sort the p-values, p(1) <= ... <= p(m); find the largest i with
// p(i) <= (i / m) alpha and reject that hypothesis and every one with a
// smaller p-value. Instead of the chance of any false rejection it controls
// the false discovery rate (FDR): the expected share of false rejections among
// all rejections, at alpha * m0 / m <= alpha, where m0 is the number of true
// null hypotheses. That holds for independent tests and under positive
// regression dependence (Benjamini & Yekutieli 2001); for arbitrary
// dependence use Benjamini-Yekutieli. The adjusted p-value of the i-th
// smallest is min over j >= i of (m / j) p(j), capped at 1.
//
// Cost: one sort, then one linear pass.
// Source: Benjamini, Y. & Hochberg, Y. (1995). Controlling the false
// discovery rate: a practical and powerful approach to multiple testing.
// Journal of the Royal Statistical Society B 57:289-300.

import type { StepForm } from './step-parts.js';
import { adjustInInputOrder } from './sorting.js';

/**
 * The BH running minimum of (m / j) p(j) over ascending `sorted`, not capped
 * at 1. Shared with Benjamini-Yekutieli, which scales it by a constant.
 */
export function stepUpMinimum(sorted: Float64Array, m: number): Float64Array {
  const out = new Float64Array(sorted.length);
  let runningMin = Infinity;
  for (let i = sorted.length - 1; i >= 0; i--) {
    runningMin = Math.min(runningMin, (m / (i + 1)) * sorted[i]);
    out[i] = runningMin;
  }
  return out;
}

/** BH adjusted values of ascending p-values; m may exceed sorted.length (absent tests count as p = 1). */
export function benjaminiHochbergSorted(sorted: Float64Array, m: number): Float64Array {
  const adjusted = stepUpMinimum(sorted, m);
  for (let i = 0; i < adjusted.length; i++) adjusted[i] = Math.min(1, adjusted[i]);
  return adjusted;
}

/** BH adjusted p-values in input order. */
export function adjustBenjaminiHochberg(p: Float64Array, m: number = p.length): Float64Array {
  return adjustInInputOrder(p, m, benjaminiHochbergSorted);
}

/** BH as a step form: the running minimum of (m / (i + 1)) p(i), capped at 1 (test/step-parts.test.ts checks it against benjaminiHochbergSorted). */
export const BENJAMINI_HOCHBERG_STEPS: StepForm = {
  direction: 'up',
  terms(sorted, ranks, m, out, at) {
    for (let k = 0; k < sorted.length; k++) out[at + k] = (m / ((ranks[k] as number) + 1)) * (sorted[k] as number);
  },
  cap: true,
  factor: () => 1,
};
