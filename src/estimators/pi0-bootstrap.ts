// pi0, the share of true null hypotheses, at the tuning value lambda that a
// bootstrap judges best.
//
// pi0(lambda) = #{p > lambda} / (m (1 - lambda)) (see pi0-lambda.ts) is
// biased upwards for small lambda and noisy for large lambda. Storey, Taylor
// & Siegmund choose lambda from the grid 0, 0.05, ..., 0.95 by estimating
// each choice's mean squared error: resample the m p-values with replacement
// B times, compute pi0*(lambda) on each resample, and measure its squared
// distance from the smallest pi0(lambda) of the real data over the grid (a
// stand-in for the truth that errs low, since every pi0(lambda) errs high
// on average). The lambda with the smallest average squared distance wins,
// and pi0 is pi0(lambda) of the real data there.
//
// Resampling makes the estimate depend on the random draws; here they come
// from a seeded generator (mulberry32), so the same seed gives the same
// answer on every machine. Tests counted in m but absent from the table
// count as p = 1 in the resampling as everywhere.
//
// Cost: O(B m) for the resampling (B = 100 draws of m values, each placed in
// one of 21 bins found once per p-value by binary search), plus O(B * 20).
// Source: Storey, J. D., Taylor, J. E. & Siegmund, D. (2004). Strong
// control, conservative point estimation and simultaneous conservative
// consistency of false discovery rates: a unified approach. Journal of the
// Royal Statistical Society B 66:187-205, section 6 (the grid and the
// mean-squared-error criterion as we remember them; B = 100 is our choice).

import { seededUniform } from '../random.js';
import { pi0AtLambda } from './pi0-lambda.js';

/** lambda = 0, 0.05, ..., 0.95, each computed as k / 20. */
export const BOOTSTRAP_LAMBDAS: Float64Array = Float64Array.from({ length: 20 }, (_, k) => k / 20);

/** Resamples drawn; enough that the chosen lambda rarely changes with the seed for m in the thousands. */
export const BOOTSTRAP_RESAMPLES = 100;

/** For each present p-value, how many grid lambdas lie strictly below it (so p > lambda_k for k < bin). */
function gridBins(sorted: Float64Array, lambdas: Float64Array): Uint8Array {
  const bins = new Uint8Array(sorted.length);
  let bin = 0;
  for (let i = 0; i < sorted.length; i++) {
    while (bin < lambdas.length && sorted[i] > lambdas[bin]) bin++;
    bins[i] = bin;
  }
  return bins;
}

export interface BootstrapChoice {
  /** pi0(lambda) of the real data at the chosen lambda, uncapped. */
  readonly value: number;
  readonly lambda: number;
}

/** The bootstrap choice of lambda and pi0 at it, on ascending p-values; m may exceed sorted.length. */
export function pi0Bootstrap(sorted: Float64Array, m: number, seed: number): BootstrapChoice {
  const lambdas = BOOTSTRAP_LAMBDAS;
  const grid = lambdas.length;
  const observed = lambdas.map((lambda) => pi0AtLambda(sorted, m, lambda));
  const target = Math.min(...observed);
  const bins = gridBins(sorted, lambdas);
  const uniform = seededUniform(seed);
  const squaredError = new Float64Array(grid);
  const counts = new Float64Array(grid + 1);
  for (let b = 0; b < BOOTSTRAP_RESAMPLES; b++) {
    counts.fill(0);
    for (let draw = 0; draw < m; draw++) {
      const index = Math.floor(uniform() * m);
      counts[index < bins.length ? bins[index] : grid]++;
    }
    // p > lambda_k exactly when its bin is above k: walking down the grid,
    // `above` sums the bins above k, #{p* > lambda_k}.
    let above = 0;
    for (let k = grid - 1; k >= 0; k--) {
      above += counts[k + 1];
      const resampled = above / (m * (1 - lambdas[k]));
      squaredError[k] += (resampled - target) ** 2;
    }
  }
  let best = 0;
  for (let k = 1; k < grid; k++) if (squaredError[k] < squaredError[best]) best = k;
  return { value: observed[best] as number, lambda: lambdas[best] as number };
}
