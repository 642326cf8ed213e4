// The inverse of the normal upper tail: the z with P(Z > z) = q, for the
// genomic inflation factor (which turns p-values back into chi-square(1)
// statistics, z^2). Solved by Newton's method on log P(Z > z): that function
// is concave, so after at most one step past the root the iterates approach
// it from above, monotonically. It keeps full relative precision for q down
// to the smallest double because the tail is computed directly.
//
// Cost: a few evaluations of the tail (O(1)).
// Source: the Newton iteration is textbook (e.g. Press et al. 2007, Numerical
// Recipes, 3rd ed., section 9.4); the tail is in normal-tail.ts.

import { normalUpperTail } from './normal-tail.js';

const LOG_SQRT_2PI = 0.5 * Math.log(2 * Math.PI);

/** The z >= 0 with P(Z > z) = q, for 0 < q <= 0.5; Infinity for q = 0. */
export function normalUpperQuantile(q: number): number {
  if (!(q >= 0 && q <= 0.5)) throw new RangeError(`q must be in [0, 0.5], got ${q}`);
  if (q === 0) return Infinity;
  const target = Math.log(q);
  let z = q > 0.3 ? 0.5 : Math.sqrt(-2 * target);
  for (let step = 0; step < 100; step++) {
    const tail = normalUpperTail(z);
    // Past z = 38.5 the tail underflows to 0 and its logarithm says nothing: step back.
    if (tail === 0) {
      z *= 0.999;
      continue;
    }
    // d/dz log P(Z > z) = -density(z) / tail.
    const slope = -Math.exp(-0.5 * z * z - LOG_SQRT_2PI) / tail;
    const next = Math.max(0, z - (Math.log(tail) - target) / slope);
    if (Math.abs(next - z) <= 1e-15 * Math.max(1, z)) return next;
    z = next;
  }
  return z;
}
