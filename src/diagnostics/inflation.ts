// The genomic inflation factor lambda: how much larger the test statistics
// are, in the middle of their distribution, than the null distribution says.
//
// Each p-value is turned back into the chi-square statistic with one degree
// of freedom that would give it (chi2 = z^2, with z the normal quantile of
// p / 2), and lambda is the median of those statistics divided by the median
// of chi-square(1), 0.4549. The median is used because the few real effects
// barely move it. Null p-values give lambda near 1; unmodelled structure
// (population stratification, relatedness, batch effects, a variance that is
// too small) inflates every statistic and pushes lambda above 1: statistics
// scaled by a factor c give lambda near c^2. Many real small effects
// (a polygenic trait) raise it too, so a high lambda calls for a look, not
// for an automatic correction.
//
// The statistic is a decreasing function of p, so its median is the
// statistic of the median p-value (the mean of the two middle statistics
// when the count is even): only those are computed.
//
// Below p = 1e-300, p / 2 would lose digits among the subnormal doubles (and
// the smallest one, 5e-324, halves to 0), so the statistic is solved in log
// space from the asymptotic series of the normal upper tail,
// P(Z > z) = phi(z) / z * (1 - 1/z^2 + 3/z^4 - 15/z^6 + 105/z^8 - ...), whose
// first omitted term is below 1e-13 of the sum there (z > 37).
// When half or more of the p-values are exactly 0 the median statistic is
// infinite and lambda is unbounded (Infinity).
//
// Cost: O(1) on sorted p-values.
// Sources: Devlin, B. & Roeder, K. (1999). Genomic control for association
// studies. Biometrics 55:997-1004. The series: Abramowitz, M. & Stegun, I. A.
// (1964). Handbook of Mathematical Functions, 26.2.12 (from memory); checked
// against R's qchisq(p, 1, lower.tail = FALSE) down to 5e-324.

import { normalUpperQuantile } from '../distributions/normal-quantile.js';

/** Below this p-value the statistic comes from the asymptotic series. */
const TINY_P = 1e-300;
const LOG_SQRT_2PI = 0.5 * Math.log(2 * Math.PI);

/** log P(Z > z) by the asymptotic series, for z > 37. */
function logNormalUpperTailFar(z: number): number {
  const w = 1 / (z * z);
  return -0.5 * z * z - Math.log(z) - LOG_SQRT_2PI + Math.log(1 - w * (1 - 3 * w * (1 - 5 * w * (1 - 7 * w))));
}

/** The z with P(Z > z) = p / 2 for 0 < p < 1e-300, by Newton's method on the logarithms. */
function farQuantileOfHalf(p: number): number {
  const target = Math.log(p) - Math.LN2;
  let z = Math.sqrt(-2 * target);
  for (let step = 0; step < 50; step++) {
    // d/dz log P(Z > z) is -z - 1/z to well within the precision needed for the step.
    const next = z + (logNormalUpperTailFar(z) - target) / (z + 1 / z);
    if (Math.abs(next - z) <= 1e-15 * z) return next;
    z = next;
  }
  return z;
}

/** The chi-square(1) statistic whose upper tail is p (Infinity for p = 0). */
export function chiSquareOneOfP(p: number): number {
  const z = p > 0 && p < TINY_P ? farQuantileOfHalf(p) : normalUpperQuantile(p / 2);
  return z * z;
}

/** The median of chi-square(1): the square of the normal quartile, about 0.454936. */
export const CHI_SQUARE_ONE_MEDIAN = chiSquareOneOfP(0.5);

export interface Inflation {
  /** Median chi-square(1) statistic of the p-values. */
  readonly medianStatistic: number;
  /** medianStatistic / median of chi-square(1); Infinity when half or more of the p-values are 0. */
  readonly lambda: number;
}

/** lambda of ascending p-values; null for an empty family. */
export function genomicInflation(sorted: Float64Array): Inflation | null {
  const n = sorted.length;
  if (n === 0) return null;
  const middle = n >> 1;
  const medianStatistic =
    n % 2 === 1 ? chiSquareOneOfP(sorted[middle] as number) : (chiSquareOneOfP(sorted[middle - 1] as number) + chiSquareOneOfP(sorted[middle] as number)) / 2;
  return { medianStatistic, lambda: medianStatistic / CHI_SQUARE_ONE_MEDIAN };
}
