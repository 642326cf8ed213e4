// Prior weights for weighted procedures.
//
// A weight says how much of the error budget a hypothesis gets: with weights
// w_i of mean 1 over the family, weighted Bonferroni tests H_i at
// alpha w_i / m, so the budget still sums to alpha. Only the ratios between
// weights matter, so users may give weights on any scale; they are
// normalised here to mean 1 within each family. A weight of 0 means the
// hypothesis is never rejected.
//
// Cost: O(n).
// Source: Genovese, C. R., Roeder, K. & Wasserman, L. (2006). False discovery
// control with p-value weighting. Biometrika 93:509-524, section 2.

/** Weights scaled to mean 1; all-equal weights become exactly 1. Throws a RangeError when none is positive. */
export function normalisedWeights(weights: Float64Array): Float64Array {
  let largest = 0;
  let allEqual = true;
  for (let i = 0; i < weights.length; i++) {
    const w = weights[i];
    if (!(w >= 0 && w < Infinity)) throw new RangeError(`weight at position ${i} is ${w}; weights must be finite numbers >= 0`);
    largest = Math.max(largest, w);
    if (w !== weights[0]) allEqual = false;
  }
  if (weights.length > 0 && largest === 0) throw new RangeError('the weights are all zero');
  // Equal weights mean no weighting; exactly 1 makes the weighted procedures equal the unweighted ones to the bit.
  if (allEqual) return new Float64Array(weights.length).fill(1);
  // Dividing by the largest first keeps the sum finite (weights near 1e308) and the smallest nonzero (near 1e-320).
  const scaled = weights.map((w) => w / largest);
  let total = 0;
  for (let i = 0; i < scaled.length; i++) total += scaled[i];
  const factor = scaled.length / total;
  return scaled.map((w) => w * factor);
}

/** p / w, the value weighted procedures order and scale; a weight of 0 gives Infinity (never rejected). */
export function weightedValues(sorted: Float64Array, weights: Float64Array): Float64Array {
  const q = new Float64Array(sorted.length);
  for (let i = 0; i < sorted.length; i++) q[i] = weights[i] > 0 ? sorted[i] / weights[i] : Infinity;
  return q;
}
