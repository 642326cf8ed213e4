// p-values from test statistics: the probability, under the null
// hypothesis, of a statistic at least as extreme as the one observed.
//
// - z (standard normal under the null) and t (Student's t with df degrees
//   of freedom) are tested two-sided by default, P(|Z| >= |z|); or one-sided:
//   'upper' is P(Z >= z) (large positive values are the evidence), 'lower'
//   is P(Z <= z) (large negative values are).
// - chi-square (df) and F (df1, df2) statistics are sums of squares, and only
//   large values count against the null, so they are tested in the upper tail.
//
// Every tail is computed directly (see normal-tail.ts, gamma-tail.ts,
// beta-tail.ts), so p-values far below 1e-16 keep their digits.
//
// Cost: O(1) for z; O(sqrt(df)) for t, chi-square and F.
// Sources: the tail identities are in Abramowitz, M. & Stegun, I. A. (1964).
// Handbook of Mathematical Functions, chapter 26 (26.2.2, 26.4.2, 26.5.27,
// 26.6.2; equation numbers cited from memory).

import { fUpperTail, studentTTwoTail, studentTUpperTail } from './beta-tail.js';
import { chiSquareUpperTail } from './gamma-tail.js';
import { erfc, normalUpperTail } from './normal-tail.js';

export type StatisticKind = 'z' | 't' | 'chisq' | 'f';
export type Tail = 'two' | 'upper' | 'lower';

export const STATISTIC_KINDS: readonly StatisticKind[] = ['z', 't', 'chisq', 'f'];

/** The degrees of freedom each kind needs: 0, 1 (df) or 2 (df1, df2). */
export const DEGREES_NEEDED: Readonly<Record<StatisticKind, 0 | 1 | 2>> = { z: 0, t: 1, chisq: 1, f: 2 };

/** The tails each kind can be tested in. */
export const TAILS_ALLOWED: Readonly<Record<StatisticKind, readonly Tail[]>> = {
  z: ['two', 'upper', 'lower'],
  t: ['two', 'upper', 'lower'],
  chisq: ['upper'],
  f: ['upper'],
};

/** The tail a kind is tested in when none is given. */
export function defaultTail(kind: StatisticKind): Tail {
  return kind === 'z' || kind === 't' ? 'two' : 'upper';
}

/** P(|Z| >= |z|) for a standard normal Z. */
function normalTwoTail(z: number): number {
  return erfc(Math.abs(z) / Math.SQRT2);
}

/**
 * The p-value of one statistic. df and df2 are used by the kinds that need
 * them (t and chisq: df; f: df as numerator, df2 as denominator). Callers
 * check that values lie in each kind's range (chisq and f: >= 0; df > 0).
 */
export function pFromStatistic(kind: StatisticKind, tail: Tail, value: number, df = NaN, df2 = NaN): number {
  // An infinite statistic (a written number beyond the doubles, such as 1e400) sits at the end of every tail.
  if (value === Infinity) return tail === 'lower' ? 1 : 0;
  if (value === -Infinity) return tail === 'upper' ? 1 : 0;
  switch (kind) {
    case 'z':
      if (tail === 'two') return normalTwoTail(value);
      return normalUpperTail(tail === 'upper' ? value : -value);
    case 't':
      if (tail === 'two') return studentTTwoTail(value, df);
      return studentTUpperTail(tail === 'upper' ? value : -value, df);
    case 'chisq':
      return chiSquareUpperTail(value, df);
    case 'f':
      return fUpperTail(value, df, df2);
  }
}
