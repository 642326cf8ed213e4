// Hommel's procedure.
//
// Closed testing with Simes' test for every intersection of hypotheses: a
// hypothesis is rejected when every set of hypotheses that contains it is
// rejected by Simes' test (a set of k p-values is rejected at alpha when its
// j-th smallest is <= j alpha / k for some j). It controls the FWER when
// Simes' test is valid (independent or positively dependent tests), and
// rejects everything Hochberg rejects, often more.
//
// Checking every subset is out of the question, and even the usual shortcut
// is quadratic in m. The shortcut used here rests on one number, h(alpha):
// the size of the largest set of hypotheses that Simes' test does not reject.
// The worst set of each size i is the i largest p-values, so with p-values
// ascending, p(1) <= ... <= p(m),
//   s_i = i * min over j = 1..i of p(m - i + j) / j   (Simes' p-value of that set),
//   h(alpha) = max { i : s_i > alpha }   (0 when there is none),
// and H(k) is rejected at alpha exactly when h(alpha) p(k) <= alpha. The
// adjusted p-value is the smallest such alpha. Writing t_i = max over i' > i
// of s_i' (so h(alpha) <= i exactly when alpha >= t_i, and t_m = 0), it is
//   adjusted p(k) = min over i of max(i p(k), t_i).
//
// Each s_i is a minimum slope: with c = m - i, p(l) / (l - c) is the slope
// from the point (c, 0) to (l, p(l)), and the smallest slope to points right
// of c touches their lower convex hull. Adding points from the right and
// keeping the hull on a stack, each s_i is a binary search on the hull, so
// the whole is O(m log m); the minimum over i is one merge-like pass because
// the best i falls as p(k) rises.
//
// Cost: O(m log m) time, O(m) memory. Tests counted in m but absent from the
// table (p = 1) cost nothing: for i up to their number s_i = 1, so they only
// bound the adjusted values by 1.
// Sources: Hommel, G. (1988). A stagewise rejective multiple test procedure
// based on a modified Bonferroni test. Biometrika 75:383-386. Simes, R. J.
// (1986). Biometrika 73:751-754. The h(alpha) shortcut and a linear-time
// algorithm: Meijer, R. J., Krebs, T. J. P. & Goeman, J. J. (2019). Hommel's
// procedure in linear time. Biometrical Journal 61:73-82.

import { adjustInInputOrder } from './sorting.js';

/** Hommel adjusted values of ascending p-values; m may exceed sorted.length (absent tests count as p = 1). */
export function hommelSorted(sorted: Float64Array, m: number): Float64Array {
  const n = sorted.length;
  const absent = m - n;
  const adjusted = new Float64Array(n);
  if (n === 0) return adjusted;

  // Points (x, y) on the lower hull, rightmost at the bottom of the stack.
  // x is the 1-based rank in the family of m; absent tests sit at n+1..m with y = 1.
  const hullX = new Float64Array(n + 2);
  const hullY = new Float64Array(n + 2);
  let size = 0;
  const push = (x: number, y: number): void => {
    // Drop the top point while it lies on or above the segment from the new point to the one below it.
    while (size >= 2) {
      const bx = hullX[size - 1];
      const by = hullY[size - 1];
      const cx = hullX[size - 2];
      const cy = hullY[size - 2];
      if ((by - y) * (cx - x) < (cy - y) * (bx - x)) break;
      size--;
    }
    hullX[size] = x;
    hullY[size] = y;
    size++;
  };
  if (absent > 0) {
    push(m, 1);
    if (absent > 1) push(n + 1, 1);
  }

  // simes[i - absent] = s_i for i = absent+1..m (for smaller i, s_i = 1).
  const simes = new Float64Array(n + 1);
  for (let l = n; l >= 1; l--) {
    push(l, sorted[l - 1]);
    const c = l - 1;
    // Binary search for the tangent from (c, 0): the first hull point (from the left, i.e. from the top)
    // where the next edge is no flatter than the line from (c, 0) to the point.
    let low = 0; // index from the top: 0 is the leftmost point
    let high = size - 1;
    while (low < high) {
      const mid = (low + high) >>> 1;
      const ax = hullX[size - 1 - mid];
      const ay = hullY[size - 1 - mid];
      const bx = hullX[size - 2 - mid];
      const by = hullY[size - 2 - mid];
      // next edge slope (by - ay) / (bx - ax) < slope ay / (ax - c): the tangent lies further right.
      if ((by - ay) * (ax - c) < ay * (bx - ax)) low = mid + 1;
      else high = mid;
    }
    const i = m - c;
    simes[i - absent] = (i * hullY[size - 1 - low]) / (hullX[size - 1 - low] - c);
  }

  // threshold[i - absent] = t_i = max over i' > i of s_i'; t_m = 0.
  const threshold = new Float64Array(n + 1);
  for (let k = n - 1; k >= 0; k--) threshold[k] = Math.max(threshold[k + 1], simes[k + 1]);

  // adjusted p(k) = min over i of max(i p(k), t_i). With i0 the smallest i where i p(k) >= t_i,
  // that is min(i0 p(k), t_{i0 - 1}); i0 only falls as p(k) rises. Values of i below
  // `absent` have t_i >= 1, so they matter only as the cap at 1.
  let i0 = m;
  for (let k = 0; k < n; k++) {
    const p = sorted[k];
    while (i0 > absent && (i0 - 1) * p >= threshold[i0 - 1 - absent]) i0--;
    const below = i0 > absent ? threshold[i0 - 1 - absent] : 1;
    adjusted[k] = Math.min(1, Math.max(p, Math.min(i0 * p, below)));
  }
  return adjusted;
}

/** Hommel adjusted p-values in input order. */
export function adjustHommel(p: Float64Array, m: number = p.length): Float64Array {
  return adjustInInputOrder(p, m, hommelSorted);
}
