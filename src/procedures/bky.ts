// The two-stage adaptive step-up procedure of Benjamini, Krieger & Yekutieli
// (BKY).
//
// BH controls the false discovery rate (FDR) at alpha * m0 / m, where m0 is
// the number of true null hypotheses; when many hypotheses are false it is
// needlessly strict. BKY first runs BH to estimate m0, then runs BH again at
// a level raised to match:
//   1. Run BH at q' = alpha / (1 + alpha); let r1 be the number rejected.
//      If r1 = 0, reject nothing; if r1 = m, reject everything.
//   2. Otherwise estimate m0 = m - r1 and run BH at q* = q' m / m0; its
//      rejections are the answer.
// The paper proves that it controls the FDR at alpha for independent tests;
// in the authors' simulations it also kept close to alpha under positive
// correlation. With strong correlation or arbitrary dependence use BH or BY
// instead.
//
// The adjusted value of a hypothesis is the smallest alpha at which the
// procedure rejects it. That is well defined because the rejections grow
// with alpha: r1 grows with q', so q* grows, and BH at a larger level rejects
// a superset. Write t = alpha / (1 + alpha) and let b(1) <= ... <= b(m) be the
// BH adjusted values (BH at level t rejects exactly the b <= t). Then
// hypothesis i is rejected at t when, for k = r1(t) = #{b <= t},
// b(i) (m - k) / m <= t (including k = m, where everything is). Because a
// larger r1 only makes that easier, the smallest such t is
//   t(i) = min over k of max(b(k), b(i) (m - k) / m),
// the minimum of a rising and a falling sequence in k, found where they
// cross; the crossing moves right as i grows, so one pointer walks it for
// all i. The adjusted value is t / (1 - t), capped at 1 (t >= 1/2 means no
// alpha below 1 rejects it).
//
// Cost: one sort, then linear passes (the two-pointer walk is O(m)).
// Source: Benjamini, Y., Krieger, A. M. & Yekutieli, D. (2006). Adaptive
// linear step-up procedures that control the false discovery rate.
// Biometrika 93:491-507, Definition 6.

import { benjaminiHochbergSorted } from './benjamini-hochberg.js';
import { adjustInInputOrder } from './sorting.js';

/** BKY adjusted values of ascending p-values; m may exceed sorted.length (absent tests count as p = 1). */
export function bkySorted(sorted: Float64Array, m: number): Float64Array {
  // BH values over all m tests: absent tests have b = 1, so capping the
  // present ones at 1 is exactly BH over all m, and k beyond the present
  // values only offers t >= 1, which no alpha below 1 reaches.
  const b = benjaminiHochbergSorted(sorted, m);
  const n = b.length;
  const adjusted = new Float64Array(n);
  let k = 1; // 1-based: the first k with b(k) >= b(i) (m - k) / m
  for (let i = 0; i < n; i++) {
    const bi = b[i];
    while (k <= n && b[k - 1] < (bi * (m - k)) / m) k++;
    const atCrossing = k <= n ? b[k - 1] : Infinity;
    const beforeCrossing = k > 1 ? (bi * (m - k + 1)) / m : Infinity;
    const t = Math.min(atCrossing, beforeCrossing);
    adjusted[i] = t < 0.5 ? Math.min(1, t / (1 - t)) : 1;
  }
  return adjusted;
}

/** BKY adjusted p-values in input order. */
export function adjustBky(p: Float64Array, m: number = p.length): Float64Array {
  return adjustInInputOrder(p, m, bkySorted);
}
