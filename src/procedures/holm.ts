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
// Cost: O(m log m) for the sort, then one linear pass.
// Source: Holm, S. (1979). A simple sequentially rejective multiple test
// procedure. Scandinavian Journal of Statistics 6:65-70.

import { inInputOrder, sortedAscending } from './sorting.js';
import { checkedTestCount } from './validate.js';

/** Holm adjusted p-values in input order; m may exceed p.length (absent tests count as p = 1). */
export function adjustHolm(p: Float64Array, m: number = p.length): Float64Array {
  const tests = checkedTestCount(p, m);
  const sorted = sortedAscending(p);
  const adjusted = new Float64Array(sorted.length);
  let runningMax = 0;
  for (let i = 0; i < sorted.length; i++) {
    runningMax = Math.max(runningMax, (tests - i) * sorted[i]);
    adjusted[i] = Math.min(1, runningMax);
  }
  return inInputOrder(p, sorted, adjusted);
}
