// Weighted Holm.
//
// Holm's step-down scheme with prior weights: order the hypotheses by
// p_i / w_i, smallest first. At step i, reject H(i) if its p-value is at most
// alpha w(i) / (the sum of the weights of the hypotheses not yet rejected);
// stop at the first that fails. The adjusted value of the i-th in that
// order is the running maximum over j <= i of (p(j) / w(j)) times the sum
// of w(k) over k >= j, capped at 1. It controls the FWER under any
// dependence; with all weights 1 it is Holm's procedure.
//
// Cost: one sort by p / w, then linear passes.
// Source: Holm, S. (1979). A simple sequentially rejective multiple test
// procedure. Scandinavian Journal of Statistics 6:65-70, section 5 (the
// weighted procedure).

import { ascendingOrder } from './sorting.js';
import { weightedValues } from './weights.js';

/** Weighted Holm adjusted values; p and weights (mean 1) in the same order, results in that order too. */
export function weightedHolm(p: Float64Array, weights: Float64Array): Float64Array {
  const q = weightedValues(p, weights);
  const order = ascendingOrder(q);
  // remaining[i] = sum of the weights from the i-th in order to the last.
  const remaining = new Float64Array(order.length + 1);
  for (let i = order.length - 1; i >= 0; i--) remaining[i] = remaining[i + 1] + weights[order[i]];
  const adjusted = new Float64Array(p.length);
  let runningMax = 0;
  for (let i = 0; i < order.length; i++) {
    const value = q[order[i]];
    runningMax = Math.max(runningMax, value === Infinity ? 1 : remaining[i] * value);
    adjusted[order[i]] = Math.min(1, runningMax);
  }
  return adjusted;
}
