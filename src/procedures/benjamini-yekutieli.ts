// The Benjamini-Yekutieli (BY) step-up procedure.
//
// BH with every threshold divided by the harmonic sum c(m) = 1 + 1/2 + ... +
// 1/m (about ln m + 0.577): find the largest i with
// p(i) <= i alpha / (m c(m)). The price of that factor buys false discovery
// rate (FDR) control at alpha under any dependence between the tests. The
// adjusted p-values are the BH ones multiplied by c(m), capped at 1.
//
// Cost: one sort, then linear passes.
// Source: Benjamini, Y. & Yekutieli, D. (2001). The control of the false
// discovery rate in multiple testing under dependency. Annals of Statistics
// 29:1165-1188, Theorem 1.3.

import type { StepForm } from './step-parts.js';
import { BENJAMINI_HOCHBERG_STEPS, stepUpMinimum } from './benjamini-hochberg.js';
import { adjustInInputOrder } from './sorting.js';

/** Above this m, the asymptotic expansion is exact to the last bit and the sum would be slow. */
const SUMMED_UP_TO = 100_000;
const EULER_GAMMA = 0.5772156649015329;

/**
 * c(m) = sum of 1/i for i = 1..m. Summed from the smallest term up, with
 * Kahan compensation, for m up to 100,000; above that from the
 * Euler-Maclaurin expansion ln m + gamma + 1/(2m) - 1/(12m^2) + 1/(120m^4),
 * whose next term, 1/(252 m^6), is far below double precision there
 * (Knuth, The Art of Computer Programming, vol. 1, section 1.2.7).
 */
export function harmonicSum(m: number): number {
  if (m === lastM) return lastSum;
  lastSum = computeHarmonicSum(m);
  lastM = m;
  return lastSum;
}

// Many families share one m (--tests): remember the last sum.
let lastM = -1;
let lastSum = 0;

function computeHarmonicSum(m: number): number {
  if (m > SUMMED_UP_TO) {
    const inverse = 1 / m;
    const inverse2 = inverse * inverse;
    return Math.log(m) + EULER_GAMMA + inverse / 2 - inverse2 / 12 + (inverse2 * inverse2) / 120;
  }
  let sum = 0;
  let compensation = 0;
  for (let i = m; i >= 1; i--) {
    const term = 1 / i - compensation;
    const next = sum + term;
    compensation = next - sum - term;
    sum = next;
  }
  return sum;
}

/** BY adjusted values of ascending p-values; m may exceed sorted.length (absent tests count as p = 1). */
export function benjaminiYekutieliSorted(sorted: Float64Array, m: number): Float64Array {
  const adjusted = stepUpMinimum(sorted, m);
  const factor = harmonicSum(m);
  for (let i = 0; i < adjusted.length; i++) adjusted[i] = Math.min(1, factor * adjusted[i]);
  return adjusted;
}

/** BY adjusted p-values in input order. */
export function adjustBenjaminiYekutieli(p: Float64Array, m: number = p.length): Float64Array {
  return adjustInInputOrder(p, m, benjaminiYekutieliSorted);
}

/** BY as a step form: BH's running minimum times c(m), capped at 1 (test/step-parts.test.ts checks it against benjaminiYekutieliSorted). */
export const BENJAMINI_YEKUTIELI_STEPS: StepForm = {
  direction: 'up',
  // BH's term, (m / (i + 1)) p(i); the running minimum is then scaled by c(m).
  terms: BENJAMINI_HOCHBERG_STEPS.terms,
  cap: true,
  factor: harmonicSum,
};
