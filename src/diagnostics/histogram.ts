// The p-value histogram: counts in equal-width bins over [0, 1], with the two
// levels that make it readable. If every p-value were null, each bin would
// hold about tested / bins ("the uniform level"); with a share pi0 of true
// nulls, the flat part of the histogram sits near pi0 * tested / bins, and
// what rises above it near 0 is the signal. A healthy histogram is flat from
// the middle to 1 with a peak at 0; other shapes are what findings.ts reads.
//
// Bins are [k/B, (k+1)/B), the last one closed at 1.
// Cost: O(n).
// Source: the reading of p-value histograms is common practice; see e.g.
// Storey, J. D. & Tibshirani, R. (2003). Statistical significance for
// genomewide studies. PNAS 100:9440-9445 (cited from memory).

export interface Histogram {
  /** counts[k] = p-values in bin k. */
  readonly counts: Int32Array;
  /** The count per bin if every p-value were null: tested / bins. */
  readonly uniformLevel: number;
  /** The count per bin of the nulls alone: pi0 * tested / bins. */
  readonly pi0Level: number;
}

/**
 * Which bin a p-value falls in. p * bins can round below a whole number
 * (0.29 * 100 = 28.999999999999996), so the floor is stepped up when p has
 * reached the next edge (k + 1) / bins, and down when p lies below its own
 * edge k / bins (a product that rounded up); 1 stays in the last bin.
 */
export function binOf(p: number, bins: number): number {
  const k = Math.floor(p * bins);
  const bin = (k + 1) / bins <= p ? k + 1 : k / bins > p ? k - 1 : k;
  return Math.min(bins - 1, bin);
}

/** Counts per bin of p-values (none missing), with the uniform and pi0 levels. */
export function pValueHistogram(p: Float64Array, bins: number, pi0: number): Histogram {
  if (!(Number.isInteger(bins) && bins >= 1)) throw new RangeError(`bins must be a whole number >= 1, got ${bins}`);
  const counts = new Int32Array(bins);
  for (let i = 0; i < p.length; i++) counts[binOf(p[i] as number, bins)]++;
  const uniformLevel = p.length / bins;
  return { counts, uniformLevel, pi0Level: pi0 * uniformLevel };
}
