// The share of true null hypotheses, pi0, estimated at one tuning value lambda.
//
// Null p-values are uniform on [0, 1], and p-values of real effects pile up
// near 0. Above some lambda (0.5, say) nearly all p-values are nulls, and the
// nulls spread evenly there, so the count above lambda is about
// pi0 * m * (1 - lambda). Solving for pi0 gives
//   pi0(lambda) = #{p > lambda} / (m (1 - lambda)).
// It overestimates pi0 a little (a few alternatives land above lambda), which
// errs on the safe side. Tests counted in m but absent from the table count
// as p = 1, above any lambda < 1. The ratio can exceed 1 by chance; callers
// cap it.
//
// Cost: O(log m) on sorted p-values (a binary search for lambda).
// Source: Storey, J. D. (2002). A direct approach to false discovery rates.
// Journal of the Royal Statistical Society B 64:479-498, eq. (6).

/** #{p > lambda} / (m (1 - lambda)) on ascending p-values, uncapped; absent tests (m > sorted.length) count as p = 1. */
export function pi0AtLambda(sorted: Float64Array, m: number, lambda: number): number {
  if (!(lambda >= 0 && lambda < 1)) throw new RangeError(`lambda must be in [0, 1), got ${lambda}`);
  if (m <= 0) throw new RangeError('pi0 needs at least one test');
  let low = 0;
  let high = sorted.length;
  while (low < high) {
    const mid = (low + high) >>> 1;
    if (sorted[mid] <= lambda) low = mid + 1;
    else high = mid;
  }
  const above = sorted.length - low + (m - sorted.length);
  return above / (m * (1 - lambda));
}
