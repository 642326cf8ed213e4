// Findings: what a family's p-values suggest, each in one sentence of plain
// advice, from a table of rules. A rule looks at the diagnosis and returns
// its sentence, or null when it has nothing to say. Each rule has a stable
// identifier (for CI to match on: `jq '.families[].findings[].id'`); to add
// one, append an entry to RULES and a test table that triggers it and one
// that does not (test/findings.test.ts).
//
// The thresholds are this tool's choices, set to stay quiet on uniform null
// p-values of any size while catching clear cases: a shape rule needs both a
// large deviation in counts (a binomial z-score beyond 4) and a large ratio,
// so that huge tables do not raise findings for deviations too small to
// matter. The inflation and deflation rules rest on a z-score beyond 3, so
// about two null families in a thousand raise one of them by chance (measured
// on seeded simulations, see README).
//
// Discrete tests (exact, rank and count tests) give p-values that are not
// uniform even when every null is true: a few distinct values, an atom just
// below 0.05 with none just above, many exact ones, a median above 0.5. So
// when the `few-distinct` rule fires, the shape, deflation and caliper rules
// keep quiet (`few-distinct` says why), and the caliper rule also keeps quiet
// when its excess rests on one atom (a group of equal values).
//
// lambda alone cannot tell real effects from inflation: both raise it. Real
// effects pile p-values up near 0; inflation by a factor c spreads every
// statistic and predicts a share below 0.05 of 2 P(Z > 1.96 / c), c^2 =
// lambda. When pi0 is clearly below 1 and more p-values lie below 0.05 than
// inflation alone predicts, the inflation finding names real effects first.
//
// Cost: O(log n) per rule (binary searches on the sorted p-values).
// Sources: the readings of the shapes are common practice; the caliper
// comparison just below and above 0.05 follows Gerber, A. & Malhotra, N.
// (2008). Do statistical reporting standards affect what is published?
// Quarterly Journal of Political Science 3:313-326 (from memory); inflation
// as in Devlin & Roeder (1999), Biometrics 55:997-1004.

import { normalUpperTail } from '../distributions/normal-tail.js';
import type { Counts } from './counts.js';
import type { Inflation } from './inflation.js';
import { shortNumber } from './short-number.js';

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
  /** Storey's pi0 (capped at 1); null or absent when unknown. */
  readonly pi0?: number | null;
  /** Whether famwise computed the p-values itself (from statistics or -log10 p); absent means read as written. */
  readonly pComputed?: boolean;
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

/** The few-distinct rule's test: discrete tests or rounding. */
const looksDiscrete = (counts: Counts): boolean => counts.tested >= 20 && counts.distinct < 0.5 * counts.tested;

/** The size of the largest group of equal values in [low, high). */
function largestTie(sorted: Float64Array, low: number, high: number): number {
  const start = sorted.length - countBetween(sorted, low, Infinity, true);
  const end = start + countBetween(sorted, low, high);
  let largest = 0;
  for (let i = start, run = 0; i < end; i++) {
    run = i > start && sorted[i] === sorted[i - 1] ? run + 1 : 1;
    largest = Math.max(largest, run);
  }
  return largest;
}

/** The median p-value's binomial z-score: how far more (positive) or fewer than half lie below 0.5. */
const belowHalfZ = (sorted: Float64Array, tested: number): number => binomialZ(countBetween(sorted, 0, 0.5), tested, 0.5);

/** Whether the p-values look like real effects rather than inflation: pi0 clearly below 1, and more below 0.05 than inflation by lambda alone would give. */
function realEffectsLikely({ counts, inflation, pi0 }: Diagnosis): boolean {
  if (inflation === null || pi0 === null || pi0 === undefined || pi0 >= 0.95) return false;
  const inflatedShare = Math.min(1 - 1e-9, 2 * normalUpperTail(1.959963984540054 / Math.sqrt(inflation.lambda)));
  return binomialZ(counts.below05, counts.tested, inflatedShare) > 3;
}

export const RULES: readonly Rule[] = [
  {
    id: 'exact-zeros',
    check: ({ counts, pComputed }) => {
      if (counts.zeros === 0) return null;
      const start = `${plural(counts.zeros, 'p-value')} ${counts.zeros === 1 ? 'is' : 'are'} exactly 0, which a real p-value never is`;
      return pComputed
        ? `${start}: famwise computed them from statistics too large for double precision (beyond about 1e-308), so every procedure rejects them and their order is lost; their order is still the order of the statistics.`
        : `${start}: the tool that computed them underflowed, printed them rounded to a few decimals (0.000), or counted 0 of B permutations (a permutation p-value is at least 1/(B + 1)), so every procedure rejects them and their order is lost; recompute them with more precision or more permutations, or from the test statistics (--statistic).`;
    },
  },
  {
    id: 'spike-at-one',
    check: ({ counts }) =>
      counts.ones >= 3 && counts.ones > 0.01 * counts.tested
        ? `${plural(counts.ones, 'p-value')} of ${counts.tested} ${counts.ones === 1 ? 'is' : 'are'} exactly 1, which continuous tests never give: discrete tests (exact, rank or count tests) do, and so do one-sided tests reported as 1 when the effect went the other way, tests that were skipped and given p = 1, and values clipped at 1 upstream; find out which before adjusting.`
        : null,
  },
  {
    id: 'few-distinct',
    check: ({ counts }) =>
      looksDiscrete(counts)
        ? `Only ${plural(counts.distinct, 'distinct value')} among ${counts.tested} p-values: the tests are discrete (counts, ranks, exact tests) or the p-values were rounded; discrete null p-values are not uniform (steps, atoms, values of exactly 1), so the shape, deflation and 0.05 rules are not applied here, and BH and the FWER procedures stay valid but are conservative on them, while rounding loses the smallest ones.`
        : null,
  },
  {
    id: 'u-shape',
    check: (diagnosis) => {
      const near = nearOne(diagnosis);
      if (!near || looksDiscrete(diagnosis.counts) || near.z < 4 || near.observed < 1.25 * near.expected) return null;
      return `More p-values lie between 0.9 and 1 than null tests would put there (${near.observed} where about ${shortNumber(near.expected)} were expected), so the histogram rises toward 1 (a U shape, with the peak at 0): the tests are likely misspecified or conservative (one-sided tests in the wrong direction, an overestimated variance, a wrong null distribution); fix them before trusting any adjustment.`;
    },
  },
  {
    id: 'hill-shape',
    check: (diagnosis) => {
      const near = nearOne(diagnosis);
      if (!near || looksDiscrete(diagnosis.counts) || near.z > -4 || near.observed > 0.8 * near.expected) return null;
      return `Fewer p-values lie between 0.9 and 1 than null tests would put there (${near.observed} where about ${shortNumber(near.expected)} were expected), so the histogram falls toward 1 (a hill shape): the null p-values are not uniform, a sign of a wrong null distribution or variance model, or of p-values made by combining or averaging other p-values; fix the tests before trusting any adjustment.`;
    },
  },
  {
    id: 'inflation',
    // The factor also has to differ from 1 by more than chance: its median
    // p-value lies below 0.5 by a binomial z-score beyond 3 (on 2,000 null
    // p-values, lambda alone exceeds 1.1 about one time in forty).
    check: (diagnosis) => {
      const { sorted, counts, inflation, pi0 } = diagnosis;
      // An unbounded factor (half the p-values exactly 0) is the exact-zeros rule's to explain.
      if (!inflation || counts.tested < 100 || !(inflation.lambda > 1.1) || inflation.lambda === Infinity || belowHalfZ(sorted, counts.tested) <= 3) return null;
      const start = `The inflation factor is ${shortNumber(inflation.lambda)}, above 1, which real effects or inflation of the test statistics make`;
      return realEffectsLikely(diagnosis)
        ? `${start}: here pi0 is ${shortNumber(pi0 as number)} and more p-values lie near 0 than inflation alone would put there, so real effects are the likelier reading, and genomic control (dividing the statistics by lambda) would remove real signal; rule out unmodelled structure (population stratification, relatedness, batch effects) by design or by modelling it, not by dividing.`
        : `${start}: here pi0 is ${pi0 === null || pi0 === undefined ? 'unknown' : shortNumber(pi0)} and no more p-values lie near 0 than inflation alone would put there, so the likelier reading is statistics larger throughout than the null allows, as unmodelled structure (population stratification, relatedness, batch effects) or an underestimated variance makes them; model it (or apply genomic control) before adjusting.`;
    },
  },
  {
    id: 'deflation',
    // As for inflation: the median p-value has to lie above 0.5 by a
    // binomial z-score beyond 3, so that chance alone rarely raises it.
    check: ({ sorted, counts, inflation }) =>
      inflation && counts.tested >= 100 && inflation.lambda < 0.9 && !looksDiscrete(counts) && belowHalfZ(sorted, counts.tested) < -3
        ? `The inflation factor is ${shortNumber(inflation.lambda)}, well below 1: the test statistics are smaller throughout than the null allows, so the tests are conservative (an overestimated variance, a wrong null distribution, a too strict correction applied upstream); BH and the other procedures then lose power, so check the variance model before adjusting.`
        : null,
  },
  {
    id: 'excess-below-05',
    check: ({ sorted, counts }) => {
      const above = countBetween(sorted, 0.05, 0.055);
      const excess = (below: number): boolean => below + above >= 10 && below >= 1.5 * above && binomialZ(below, below + above, 0.5) >= 3.09;
      const below = countBetween(sorted, 0.045, 0.05);
      // A discrete test puts an atom where its support falls (0.0499 for
      // exact Wilcoxon 8 vs 8, none just above 0.05): the excess has to
      // remain without the largest group of equal values.
      if (looksDiscrete(counts) || !excess(below) || !excess(below - largestTie(sorted, 0.045, 0.05))) return null;
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
