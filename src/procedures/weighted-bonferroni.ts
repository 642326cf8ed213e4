// Weighted Bonferroni.
//
// Each hypothesis gets a share of alpha in proportion to its prior weight:
// with weights of mean 1, H_i is tested at alpha w_i / m, and the adjusted
// value is m p_i / w_i, capped at 1. The shares sum to alpha, so Boole's
// inequality keeps the FWER at or below alpha under any dependence, as for
// plain Bonferroni; a hypothesis with a large weight is rejected more
// easily, one with weight 0 never. With all weights 1 it is Bonferroni.
//
// Cost: O(m).
// Sources: Holm, S. (1979). Scandinavian Journal of Statistics 6:65-70
// (weighted tests, section 5); Genovese, Roeder & Wasserman (2006),
// Biometrika 93:509-524.

import { weightedValues } from './weights.js';

/** min(1, m p / w) for each hypothesis; weights of mean 1 in the same order as p. */
export function weightedBonferroni(p: Float64Array, weights: Float64Array, m: number): Float64Array {
  const q = weightedValues(p, weights);
  for (let i = 0; i < q.length; i++) q[i] = Math.min(1, m * q[i]);
  return q;
}
