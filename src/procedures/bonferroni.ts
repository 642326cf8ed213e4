// Bonferroni correction.
//
// Multiply each p-value by the number of tests m (and cap at 1). Rejecting
// where the adjusted value is <= alpha is the same as testing every
// hypothesis at alpha / m. By Boole's inequality the chance of at least one
// false rejection, the family-wise error rate (FWER), is then at most alpha,
// whatever the dependence between the tests. It is single-step and the most
// conservative of the classic procedures: Holm rejects everything it rejects.
//
// Cost: O(m); it needs no sorting, but works on sorted input like the others.
// Source: Dunn, O. J. (1961). Multiple comparisons among means. Journal of
// the American Statistical Association 56:52-64 (the use of Bonferroni's
// inequality for simultaneous tests).

import type { StepForm } from './step-parts.js';
import { checkedTestCount } from './validate.js';

/** min(1, m * p) for each p; the order of the values does not matter. */
export function bonferroniSorted(p: Float64Array, m: number): Float64Array {
  const out = new Float64Array(p.length);
  for (let i = 0; i < p.length; i++) out[i] = Math.min(1, m * p[i]);
  return out;
}

/** Bonferroni adjusted p-values in input order. */
export function adjustBonferroni(p: Float64Array, m: number = p.length): Float64Array {
  return bonferroniSorted(p, checkedTestCount(p, m));
}

/** Bonferroni as a step form (test/step-parts.test.ts checks it against bonferroniSorted). */
export const BONFERRONI_STEPS: StepForm = {
  direction: 'single',
  terms(sorted, ranks, m, out, at) {
    for (let k = 0; k < sorted.length; k++) out[at + k] = m * (sorted[k] as number);
  },
  cap: true,
  factor: () => 1,
};
