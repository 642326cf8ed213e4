// Findings: what a family's p-values suggest, each in one sentence of plain
// advice, from a table of rules. A rule looks at the diagnosis and returns
// its sentence, or null when it has nothing to say. Each rule has a stable
// identifier (for CI to match on: `jq '.families[].findings[].id'`); to add
// one, append an entry to RULES and a test table that triggers it and one
// that does not (test/findings.test.ts).
//
// The thresholds are this tool's choices, set to stay quiet on uniform null
// p-values of any size (checked by a seeded test) while catching clear
// cases: a shape rule needs both a large deviation in counts (a binomial
// z-score beyond 4) and a large ratio, so that huge tables do not raise
// findings for deviations too small to matter.
//
// Cost: O(log n) per rule (binary searches on the sorted p-values).
// Sources: the readings of the shapes are common practice; the caliper
// comparison just below and above 0.05 follows Gerber, A. & Malhotra, N.
// (2008). Do statistical reporting standards affect what is published?
// Quarterly Journal of Political Science 3:313-326 (from memory); inflation
// as in Devlin & Roeder (1999), Biometrics 55:997-1004.

import type { Counts } from './counts.js';
import type { Inflation } from './inflation.js';

export interface Finding {
  /** Stable identifier, for scripts. */
  readonly id: string;
  /** One sentence of plain advice. */
  readonly text: string;
}

/** What the rules look at. */
export interface Diagnosis {
  /** The family's p-values, ascending, none missing. */
  readonly sorted: Float64Array;
  readonly counts: Counts;
  readonly inflation: Inflation | null;
}

interface Rule {
  readonly id: string;
  /** The sentence, or null when the rule has nothing to say. */
  readonly check: (diagnosis: Diagnosis) => string | null;
}

/** How many sorted values lie in [low, high) (or [low, high] when closed). */
function countBetween(sorted: Float64Array, low: number, high: number, closed = false): number {
  const firstAtLeast = (bound: number, strict: boolean): number => {
    let lo = 0;
    let hi = sorted.length;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (strict ? (sorted[mid] as number) <= bound : (sorted[mid] as number) < bound) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  };
  return firstAtLeast(high, closed) - firstAtLeast(low, false);
}

/** The binomial z-score of `observed` out of n where the share `expected` was expected. */
function binomialZ(observed: number, n: number, expected: number): number {
  return (observed - n * expected) / Math.sqrt(n * expected * (1 - expected));
}

const plural = (count: number, word: string): string => `${count} ${word}${count === 1 ? '' : 's'}`;

/**
 * The p-values strictly between 0.5 and 1 should be flat; the top fifth of
 * that range, (0.9, 1), should hold a fifth of them. Exact ones are left to
 * their own rule.
 */
function nearOne(diagnosis: Diagnosis): { observed: number; expected: number; z: number } | null {
  const half = countBetween(diagnosis.sorted, 0.5, 1) - countBetween(diagnosis.sorted, 0.5, 0.5, true);
  if (half < 50) return null;
  const observed = countBetween(diagnosis.sorted, 0.9, 1) - countBetween(diagnosis.sorted, 0.9, 0.9, true);
  return { observed, expected: 0.2 * half, z: binomialZ(observed, half, 0.2) };
}

const format = (value: number): string => String(Number(value.toPrecision(3)));

export const RULES: readonly Rule[] = [
  {
    id: 'exact-zeros',
    check: ({ counts }) =>
      counts.zeros === 0
        ? null
        : `${plural(counts.zeros, 'p-value')} ${counts.zeros === 1 ? 'is' : 'are'} exactly 0, which a real p-value never is: the tool that computed them probably underflowed, so every procedure rejects them and their order is lost; recompute them with more precision, or from the test statistics (--statistic).`,
  },
  {
    id: 'spike-at-one',
    check: ({ counts }) =>
      counts.ones >= 3 && counts.ones > 0.01 * counts.tested
        ? `${plural(counts.ones, 'p-value')} of ${counts.tested} ${counts.ones === 1 ? 'is' : 'are'} exactly 1, a spike continuous null p-values never make: check for one-sided tests, tests that were skipped and given p = 1, or values clipped at 1 upstream, before adjusting.`
        : null,
  },
  {
    id: 'few-distinct',
    check: ({ counts }) =>
      counts.tested >= 20 && counts.distinct < 0.5 * counts.tested
        ? `Only ${plural(counts.distinct, 'distinct value')} among ${counts.tested} p-values: the tests are discrete (counts, ranks, exact tests) or the p-values were rounded; BH and the FWER procedures stay valid but are conservative on discrete p-values, and rounding loses the smallest ones.`
        : null,
  },
  {
    id: 'u-shape',
    check: (diagnosis) => {
      const near = nearOne(diagnosis);
      if (!near || near.z < 4 || near.observed < 1.25 * near.expected) return null;
      return `More p-values lie between 0.9 and 1 than null tests would put there (${near.observed} where about ${format(near.expected)} were expected), so the histogram rises toward 1 (a U shape, with the peak at 0): the tests are likely misspecified or conservative (one-sided tests in the wrong direction, an overestimated variance, a wrong null distribution); fix them before trusting any adjustment.`;
    },
  },
  {
    id: 'hill-shape',
    check: (diagnosis) => {
      const near = nearOne(diagnosis);
      if (!near || near.z > -4 || near.observed > 0.8 * near.expected) return null;
      return `Fewer p-values lie between 0.9 and 1 than null tests would put there (${near.observed} where about ${format(near.expected)} were expected), so the histogram falls toward 1 (a hill shape): the null p-values are not uniform, a sign of a wrong null distribution or variance model, or of p-values made by combining or averaging other p-values; fix the tests before trusting any adjustment.`;
    },
  },
  {
    id: 'inflation',
    // The factor also has to differ from 1 by more than chance: its median
    // p-value lies below 0.5 by a binomial z-score beyond 3 (on 2,000 null
    // p-values, lambda alone exceeds 1.1 about one time in forty).
    check: ({ sorted, counts, inflation }) =>
      inflation && counts.tested >= 100 && inflation.lambda > 1.1 && binomialZ(countBetween(sorted, 0, 0.5), counts.tested, 0.5) > 3
        ? `The inflation factor is ${format(inflation.lambda)}, well above 1: the test statistics are larger throughout than the null allows, as unmodelled structure (population stratification, relatedness, batch effects) or an underestimated variance makes them; model it (or apply genomic control) before adjusting, though many real effects raise the factor too, so read it together with the histogram.`
        : null,
  },
  {
    id: 'excess-below-05',
    check: ({ sorted }) => {
      const below = countBetween(sorted, 0.045, 0.05);
      const above = countBetween(sorted, 0.05, 0.055);
      const n = below + above;
      if (n < 10 || below < 1.5 * above || binomialZ(below, n, 0.5) < 3.09) return null;
      return `${below} p-values lie just below 0.05 (0.045 to 0.05) against ${above} just above it (0.05 to 0.055): results may have been chosen or tuned until they crossed 0.05 (selective reporting), which no adjustment can undo.`;
    },
  },
];

/** The findings for one family's diagnosis, in the order of RULES. */
export function findingsOf(diagnosis: Diagnosis): Finding[] {
  return RULES.flatMap((rule) => {
    const text = rule.check(diagnosis);
    return text === null ? [] : [{ id: rule.id, text }];
  });
}
