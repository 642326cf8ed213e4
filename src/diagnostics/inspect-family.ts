// Everything `famwise inspect` says about one family of p-values, as data:
// counts, the histogram with its uniform and pi0 levels, the share below
// 0.05, the inflation factor, the uniformity of the upper half, and the
// findings. The text, JSON and SVG views are drawn from this one object.
//
// Cost: O(n) on sorted p-values (plus O(n log n) for sorting, done by the caller).
// Sources: see the modules it combines; pi0 is Storey's estimate at lambda = 0.5
// (Storey 2002, J. R. Stat. Soc. B 64:479-498, eq. 6), capped at 1.

import { pi0AtLambda } from '../estimators/pi0-lambda.js';
import { type Counts, pValueCounts } from './counts.js';
import { type Finding, findingsOf } from './findings.js';
import { type Histogram, pValueHistogram } from './histogram.js';
import { type Inflation, genomicInflation } from './inflation.js';
import { type Uniformity, upperHalfUniformity } from './uniformity.js';

/** The lambda of the pi0 estimate shown on the histogram. */
export const PI0_LAMBDA = 0.5;

export interface FamilyInspection {
  readonly counts: Counts;
  /** The share of p-values below 0.05 (null p-values alone give 0.05); null without p-values. */
  readonly shareBelow05: number | null;
  /** Storey's pi0 at lambda = 0.5, capped at 1; null without p-values. */
  readonly pi0: number | null;
  readonly histogram: Histogram;
  readonly inflation: Inflation | null;
  readonly uniformity: Uniformity | null;
  readonly findings: readonly Finding[];
}

/**
 * Inspects one family: ascending p-values (none missing), the count of missing
 * ones, and whether famwise computed the p-values from statistics (which
 * changes the advice on exact zeros).
 */
export function inspectFamily(sorted: Float64Array, missing: number, bins: number, pComputed = false): FamilyInspection {
  const counts = pValueCounts(sorted, missing);
  const pi0 = sorted.length === 0 ? null : Math.min(1, pi0AtLambda(sorted, sorted.length, PI0_LAMBDA));
  const inflation = genomicInflation(sorted);
  return {
    counts,
    shareBelow05: sorted.length === 0 ? null : counts.below05 / sorted.length,
    pi0,
    histogram: pValueHistogram(sorted, bins, pi0 ?? 1),
    inflation,
    uniformity: upperHalfUniformity(sorted),
    findings: findingsOf({ sorted, counts, inflation, pi0, pComputed }),
  };
}
