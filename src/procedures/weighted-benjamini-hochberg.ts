// Weighted Benjamini–Hochberg.
//
// The BH step-up procedure run on p_i / w_i instead of p_i, with prior
// weights of mean 1: order the hypotheses by p / w, find the largest k with
// p(k) / w(k) <= k alpha / m, and reject the k first. Hypotheses with large
// weights get through more easily and the FDR stays at or below alpha under
// independence (Genovese, Roeder & Wasserman 2006, theorem 1; the proof there
// is for independent tests). The adjusted value of the i-th in order is the minimum over
// j >= i of m (p(j) / w(j)) / j, capped at 1. With all weights 1 it is BH.
//
// Cost: one sort by p / w, then one linear pass.
// Source: Genovese, C. R., Roeder, K. & Wasserman, L. (2006). False discovery
// control with p-value weighting. Biometrika 93:509-524.

import { stepUpMinimum } from './benjamini-hochberg.js';
import { ascendingOrder, gather, scatter } from './sorting.js';
import { weightedValues } from './weights.js';

/** Weighted BH adjusted values; p and weights (mean 1) in the same order, results in that order too. */
export function weightedBenjaminiHochberg(p: Float64Array, weights: Float64Array, m: number): Float64Array {
  const q = weightedValues(p, weights);
  const order = ascendingOrder(q);
  const adjusted = stepUpMinimum(gather(q, order), m);
  for (let i = 0; i < adjusted.length; i++) adjusted[i] = Math.min(1, adjusted[i]);
  return scatter(adjusted, order);
}
