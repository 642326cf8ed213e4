// Holm–Šidák step-down procedure.
//
// Holm's step-down scheme with Šidák's per-step levels: sort the p-values,
// p(1) <= ... <= p(m), and compare p(i) with 1 - (1 - alpha)^(1/(m - i + 1))
// instead of alpha / (m - i + 1); stop at the first that fails. The adjusted
// value of the i-th smallest is the running maximum over j <= i of
// 1 - (1 - p(j))^(m - j + 1). It rejects at least what Holm and Šidák each
// reject, and controls the FWER under the same conditions as Šidák
// (independence, or two-sided tests of jointly normal statistics).
//
// Cost: one sort, then one linear pass.
// Sources: Holm, S. (1979). A simple sequentially rejective multiple test
// procedure. Scandinavian Journal of Statistics 6:65-70 (the step-down
// scheme); Šidák, Z. (1967). Journal of the American Statistical Association
// 62:626-633 (the levels).

import type { StepForm } from './step-parts.js';
import { sidakValue } from './sidak.js';
import { adjustInInputOrder } from './sorting.js';

/** Holm–Šidák adjusted values of ascending p-values; m may exceed sorted.length (absent tests count as p = 1). */
export function holmSidakSorted(sorted: Float64Array, m: number): Float64Array {
  const adjusted = new Float64Array(sorted.length);
  let runningMax = 0;
  for (let i = 0; i < sorted.length; i++) {
    runningMax = Math.max(runningMax, sorted[i], sidakValue(sorted[i], m - i));
    adjusted[i] = runningMax;
  }
  return adjusted;
}

/** Holm–Šidák adjusted p-values in input order. */
export function adjustHolmSidak(p: Float64Array, m: number = p.length): Float64Array {
  return adjustInInputOrder(p, m, holmSidakSorted);
}

/** Holm–Šidák as a step form (test/step-parts.test.ts checks it against holmSidakSorted). */
export const HOLM_SIDAK_STEPS: StepForm = {
  direction: 'down',
  terms(sorted, ranks, m, out, at) {
    for (let k = 0; k < sorted.length; k++) out[at + k] = Math.max(sorted[k] as number, sidakValue(sorted[k] as number, m - (ranks[k] as number)));
  },
  cap: false,
  factor: () => 1,
};
