// The inspection of one family as a plain record for JSON: every number at
// full precision, names that say what they are, findings with their ids.

import type { FamilyInspection } from './inspect-family.js';
import { CHI_SQUARE_ONE_MEDIAN, type Inflation } from './inflation.js';
import { PI0_LAMBDA } from './inspect-family.js';

/** JSON has no Infinity: an unbounded factor is null with `unbounded: true`. */
function inflationRecord({ lambda, medianStatistic }: Inflation): Record<string, unknown> {
  const unbounded = lambda === Infinity;
  return { lambda: unbounded ? null : lambda, unbounded, medianStatistic: unbounded ? null : medianStatistic, nullMedianStatistic: CHI_SQUARE_ONE_MEDIAN };
}

export function inspectionRecord(family: Record<string, string> | null, inspection: FamilyInspection): Record<string, unknown> {
  const { counts, shareBelow05, pi0, histogram, inflation, uniformity, findings } = inspection;
  return {
    family,
    counts,
    shareBelow05,
    nullShareBelow05: 0.05,
    pi0: pi0 === null ? null : { lambda: PI0_LAMBDA, estimate: pi0 },
    histogram: {
      bins: histogram.counts.length,
      counts: Array.from(histogram.counts),
      uniformLevel: histogram.uniformLevel,
      pi0Level: histogram.pi0Level,
    },
    inflation: inflation === null ? null : inflationRecord(inflation),
    uniformity: uniformity === null ? null : { test: 'kolmogorov-smirnov', of: 'p-values above 0.5, rescaled to [0, 1] as 2p - 1', n: uniformity.n, statistic: uniformity.statistic, p: uniformity.p },
    findings,
  };
}
