// Storey's q-values: false discovery rates that use an estimate of how many
// hypotheses are truly null.
//
// The Benjamini-Hochberg (BH) procedure controls the false discovery rate
// (FDR) at alpha * pi0, where pi0 is the share of true null hypotheses; it
// is conservative by that factor when many hypotheses are not null (a strong
// treatment, a deep screen). Storey's q-value of a test is the smallest FDR
// at which it is called significant, with pi0 estimated from the p-values
// themselves (see estimators/pi0.ts):
//   q(p(i)) = min over j >= i of pi0 m p(j) / j,
// which is exactly pi0 times the BH adjusted value. So q-values keep BH's
// order (monotone in p, ties equal), are at most pi0 <= 1, and equal BH's
// values when pi0 = 1; they are computed as pi0 * BH so that with pi0 = 1
// the arithmetic is BH's to the last bit (x * 1 is x). Rejecting q <= alpha
// is BH at level alpha / pi0.
//
// Its FDR control is proven for independent tests (Storey, Taylor &
// Siegmund 2004, finite-sample with a +1 in the count; asymptotically also
// under weak dependence), not for positive dependence in general, and it
// relies on pi0 being estimated well: with strong correlation between tests
// the p-values above lambda can cluster and pi0 can come out far too low, and
// with a few hundred tests or fewer the estimate is noisy.
//
// Cost: one sort, the pi0 estimator's cost, then one linear pass.
// Sources: Storey, J. D. (2002). A direct approach to false discovery rates.
// Journal of the Royal Statistical Society B 64:479-498. Storey, J. D. &
// Tibshirani, R. (2003). Statistical significance for genomewide studies.
// PNAS 100:9440-9445.

import { DEFAULT_PI0_SETTINGS, type Pi0Estimate, type Pi0Settings, estimatePi0 } from '../estimators/pi0.js';
import { benjaminiHochbergSorted } from './benjamini-hochberg.js';
import { scatter, sortAscending } from './sorting.js';
import { checkedTestCount } from './validate.js';

/**
 * q-values of ascending p-values for a given pi0 in (0, 1]; m may exceed
 * sorted.length (absent tests count as p = 1).
 */
export function storeyQValuesSorted(sorted: Float64Array, m: number, pi0: number): Float64Array {
  if (!(pi0 > 0 && pi0 <= 1)) throw new RangeError(`pi0 must be in (0, 1], got ${pi0}`);
  const q = benjaminiHochbergSorted(sorted, m);
  for (let i = 0; i < q.length; i++) q[i] *= pi0;
  return q;
}

/**
 * q-values in input order, with pi0 estimated from p as `settings` say (by
 * default the fixed lambda = 0.5); m may exceed p.length (absent tests count
 * as p = 1). The estimate is returned with them, fallback reason included.
 */
export function adjustStorey(p: Float64Array, m: number = p.length, settings: Pi0Settings = DEFAULT_PI0_SETTINGS): { qValues: Float64Array; pi0: Pi0Estimate } {
  const tests = checkedTestCount(p, m);
  const { order, sorted } = sortAscending(p);
  const pi0 = estimatePi0(sorted, tests, settings);
  return { qValues: scatter(storeyQValuesSorted(sorted, tests, pi0.value), order), pi0 };
}
