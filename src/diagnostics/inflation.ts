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
// Cost: O(1) on sorted p-values.
// Source: Devlin, B. & Roeder, K. (1999). Genomic control for association
// studies. Biometrics 55:997-1004.

import { normalUpperQuantile } from '../distributions/normal-quantile.js';

/** The chi-square(1) statistic whose upper tail is p. */
export function chiSquareOneOfP(p: number): number {
  const z = normalUpperQuantile(p / 2);
  return z * z;
}

/** The median of chi-square(1): the square of the normal quartile, about 0.454936. */
export const CHI_SQUARE_ONE_MEDIAN = chiSquareOneOfP(0.5);

export interface Inflation {
  /** Median chi-square(1) statistic of the p-values. */
  readonly medianStatistic: number;
  /** medianStatistic / median of chi-square(1). */
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
