// Every finding has a table that triggers it and one that does not; typical
// uniform null p-values of any size trigger none (common practice, no source:
// null p-values are uniform, so a healthy table should raise nothing; by
// chance about 2 to 3 null families in 1,000 do, as the README states).
import { describe, expect, it } from 'vitest';
import { RULES } from '../src/diagnostics/findings.js';
import { inspectFamily } from '../src/diagnostics/inspect-family.js';
import { pFromStatistic } from '../src/distributions/p-from-statistic.js';
import { seededRandom } from './helpers/random.js';

function ids(values: ArrayLike<number>): string[] {
  return inspectFamily(Float64Array.from(values).sort(), 0, 20).findings.map((finding) => finding.id);
}

function uniform(seed: number, size: number): number[] {
  const random = seededRandom(seed);
  return Array.from({ length: size }, () => random());
}

function between(seed: number, size: number, low: number, high: number): number[] {
  return uniform(seed, size).map((u) => low + u * (high - low));
}

function scaledZ(seed: number, size: number, scale: number): number[] {
  return shiftedZ(seed, size, scale, 0, 0);
}

/** Two-sided p-values of z-scores: a share `effects` of them shifted by `shift`, all scaled by `scale`. */
function shiftedZ(seed: number, size: number, scale: number, effects: number, shift: number): number[] {
  const random = seededRandom(seed);
  return Array.from({ length: size }, (_, i) => {
    const z = Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random());
    return pFromStatistic('z', 'two', scale * z + (i < effects * size ? shift : 0));
  });
}

/**
 * Exact two-sided Wilcoxon rank-sum p-values of `size` null comparisons of
 * n1 against n2 (no ties): the null distribution of the rank sum is counted
 * exactly (each subset of n1 ranks out of n1 + n2 equally likely), and
 * p = min(1, 2 min(P(W <= w), P(W >= w))), the convention of R's wilcox.test
 * with exact = TRUE (Hollander, M. & Wolfe, D. A. (1999). Nonparametric
 * Statistical Methods, 2nd ed., section 4.1; from memory).
 */
function wilcoxonNull(seed: number, size: number, n1: number, n2: number): number[] {
  const total = n1 + n2;
  const maxSum = (total * (total + 1)) / 2;
  // ways[k][s]: subsets of k ranks among those seen so far with rank sum s.
  let ways = Array.from({ length: n1 + 1 }, (_, k) => Array.from({ length: maxSum + 1 }, (_, s): number => (k === 0 && s === 0 ? 1 : 0)));
  for (let rank = 1; rank <= total; rank++) {
    ways = ways.map((row, k) => row.map((count, s) => count + (k > 0 && s >= rank ? (ways[k - 1]?.[s - rank] as number) : 0)));
  }
  const counts = ways[n1] as number[];
  const all = counts.reduce((a, b) => a + b, 0);
  const random = seededRandom(seed);
  return Array.from({ length: size }, () => {
    const ranks = Array.from({ length: total }, (_, i) => i + 1);
    for (let i = total - 1; i > 0; i--) {
      const j = Math.floor(random() * (i + 1));
      [ranks[i], ranks[j]] = [ranks[j] as number, ranks[i] as number];
    }
    const w = ranks.slice(0, n1).reduce((a, b) => a + b, 0);
    const lower = counts.slice(0, w + 1).reduce((a, b) => a + b, 0) / all;
    const upper = counts.slice(w).reduce((a, b) => a + b, 0) / all;
    return Math.min(1, 2 * Math.min(lower, upper));
  });
}

/**
 * Fisher's exact test of a 2x2 table, two-sided, for `size` null comparisons
 * of two arms of n with the same success probability 0.3: given the total
 * successes t, the first arm's count is hypergeometric, and p sums the
 * probabilities of the tables no more likely than the one observed (with R's
 * relative tolerance 1e-7; Agresti, A. (2002). Categorical Data Analysis,
 * 2nd ed., section 3.5; from memory).
 */
function fisherNull(seed: number, size: number, n: number): number[] {
  const choose = (a: number, b: number): number => (b < 0 || b > a ? 0 : Array.from({ length: b }, (_, i) => (a - i) / (i + 1)).reduce((x, y) => x * y, 1));
  const random = seededRandom(seed);
  const binomial = (): number => Array.from({ length: n }, () => (random() < 0.3 ? 1 : 0)).reduce<number>((a, b) => a + b, 0);
  return Array.from({ length: size }, () => {
    const x = binomial();
    const t = x + binomial();
    const probability = (k: number): number => (choose(n, k) * choose(n, t - k)) / choose(2 * n, t);
    const observed = probability(x);
    let p = 0;
    for (let k = 0; k <= t; k++) if (probability(k) <= observed * (1 + 1e-7)) p += probability(k);
    return Math.min(1, p);
  });
}

const cases: Record<string, { triggers: number[]; quiet: number[] }> = {
  'exact-zeros': { triggers: [...uniform(1, 200), 0], quiet: [...uniform(1, 200), 1e-300] },
  'spike-at-one': { triggers: [...uniform(2, 1000), ...Array(50).fill(1)], quiet: [...uniform(2, 1000), 1, 1] },
  'few-distinct': {
    triggers: uniform(3, 400).map((p) => Math.round(p * 20) / 20),
    quiet: uniform(3, 400).map((p) => Math.round(p * 1000) / 1000),
  },
  'u-shape': { triggers: [...uniform(4, 1000), ...between(5, 200, 0.9, 1)], quiet: [...uniform(4, 1000), ...between(5, 200, 0, 0.05)] },
  'hill-shape': { triggers: [...between(6, 1000, 0, 0.9), ...between(7, 10, 0.9, 1)], quiet: uniform(6, 1000) },
  inflation: { triggers: scaledZ(8, 2000, 1.3), quiet: scaledZ(8, 2000, 1) },
  deflation: { triggers: scaledZ(11, 10_000, 0.8), quiet: shiftedZ(11, 10_000, 1, 0.3, 3) },
  'excess-below-05': {
    triggers: [...uniform(9, 1000), ...between(10, 30, 0.045, 0.05)],
    quiet: [...uniform(9, 1000), ...between(10, 30, 0.045, 0.055)],
  },
};

describe('each finding: a table that triggers it, and one that does not', () => {
  for (const rule of RULES) {
    it(rule.id, () => {
      const table = cases[rule.id];
      expect(table, `add test tables for ${rule.id}`).toBeDefined();
      expect(ids(table?.triggers ?? [])).toContain(rule.id);
      expect(ids(table?.quiet ?? [])).not.toContain(rule.id);
    });
  }

  it('the identifiers are unique and stable (scripts match on them)', () => {
    expect(RULES.map((rule) => rule.id)).toEqual(['exact-zeros', 'spike-at-one', 'few-distinct', 'u-shape', 'hill-shape', 'inflation', 'deflation', 'excess-below-05']);
  });
});

describe('uniform null p-values raise no finding', () => {
  for (const size of [20, 100, 1_000, 10_000, 200_000]) {
    it(`${size} of them, five seeds`, () => {
      for (let seed = 100; seed < 105; seed++) expect(ids(uniform(seed * size, size))).toEqual([]);
    });
  }

  it('nor do null p-values computed from z statistics', () => {
    expect(ids(scaledZ(21, 50_000, 1))).toEqual([]);
  });
});

describe('the sentences', () => {
  it('are one sentence each, naming the counts they rest on', () => {
    const findings = inspectFamily(Float64Array.from([...uniform(2, 1000), 0, 0, ...Array(50).fill(1)]).sort(), 0, 20).findings;
    const text = Object.fromEntries(findings.map((finding) => [finding.id, finding.text]));
    expect(text['exact-zeros']).toMatch(/^2 p-values are exactly 0, /);
    expect(text['spike-at-one']).toMatch(/^50 p-values of 1052 are exactly 1, /);
    for (const finding of findings) expect(finding.text.match(/\. /g)).toBeNull();
  });
});

describe('real effects or inflation: lambda alone cannot tell them apart', () => {
  const textOf = (values: ArrayLike<number>): string | undefined =>
    inspectFamily(Float64Array.from(values).sort(), 0, 20).findings.find((finding) => finding.id === 'inflation')?.text;

  it('10,000 z-tests, 30% or 10% of them real effects of 3 (seeded): names real effects first and warns that genomic control would remove them', () => {
    for (const share of [0.3, 0.1]) {
      const text = textOf(shiftedZ(31, 10_000, 1, share, 3));
      expect(text).toMatch(/^The inflation factor is [\d.]+, above 1, which real effects or inflation of the test statistics make: here pi0 is /);
      expect(text).toMatch(/real effects are the likelier reading, and genomic control \(dividing the statistics by lambda\) would remove real signal/);
    }
  });

  it('10,000 null z-scores scaled by 1.1 (lambda near 1.21): names inflation and genomic control', () => {
    const values = scaledZ(32, 10_000, 1.1);
    expect(genomicLambda(values)).toBeCloseTo(1.21, 1);
    const text = textOf(values);
    expect(text).toMatch(/^The inflation factor is [\d.]+, above 1, which real effects or inflation of the test statistics make: here pi0 is [\d.]+ and no more p-values lie near 0 than inflation alone would put there, so the likelier reading is statistics larger throughout/);
    expect(text).toMatch(/model it \(or apply genomic control\) before adjusting/);
  });
});

function genomicLambda(values: ArrayLike<number>): number {
  return inspectFamily(Float64Array.from(values).sort(), 0, 20).inflation?.lambda as number;
}

describe('conservative tests: deflation', () => {
  it('null z-scores shrunk by 0.8, 0.6 and 0.5 (an overestimated variance; 10,000 each, seeded) raise it', () => {
    for (const scale of [0.8, 0.6, 0.5]) {
      const values = scaledZ(41, 10_000, scale);
      expect(genomicLambda(values)).toBeCloseTo(scale * scale, 1);
      const finding = inspectFamily(Float64Array.from(values).sort(), 0, 20).findings.find((entry) => entry.id === 'deflation');
      expect(finding?.text).toMatch(/well below 1: .* conservative .* BH and the other procedures then lose power, so check the variance model/);
    }
  });

  it('null tables and tables with real effects do not', () => {
    for (let seed = 42; seed < 47; seed++) expect(ids(scaledZ(seed, 10_000, 1))).not.toContain('deflation');
    expect(ids(shiftedZ(47, 10_000, 1, 0.1, 3))).not.toContain('deflation');
  });
});

describe('valid discrete tests with every null true raise only what discreteness explains', () => {
  it('exact Wilcoxon 8 vs 8 (2,000 tests): few distinct values, no caliper, shape or deflation finding', () => {
    const values = wilcoxonNull(51, 2000, 8, 8);
    const found = ids(values);
    expect(found).toContain('few-distinct');
    for (const id of ['excess-below-05', 'u-shape', 'hill-shape', 'deflation']) expect(found).not.toContain(id);
  });

  for (const [name, values] of [
    ['Fisher 2x2, 10 per arm (2,000 tests)', fisherNull(52, 2000, 10)],
    ['exact Wilcoxon 5 vs 5 (2,000 tests)', wilcoxonNull(53, 2000, 5, 5)],
  ] as const) {
    it(`${name}: few distinct values and a spike at 1 that names discrete tests, but no shape finding`, () => {
      const findings = inspectFamily(Float64Array.from(values).sort(), 0, 20).findings;
      const found = findings.map((finding) => finding.id);
      expect(found).toContain('few-distinct');
      for (const id of ['excess-below-05', 'u-shape', 'hill-shape', 'deflation']) expect(found).not.toContain(id);
      const spike = findings.find((finding) => finding.id === 'spike-at-one');
      if (spike) expect(spike.text).toMatch(/discrete tests/);
    });
  }

  it('exact Wilcoxon 8 vs 8 mixed with as many continuous p-values (few-distinct quiet): the atom at 0.0499 is not selective reporting', () => {
    const values = [...wilcoxonNull(54, 2000, 8, 8), ...uniform(55, 2000)];
    const found = ids(values);
    expect(found).not.toContain('few-distinct');
    expect(found).not.toContain('excess-below-05');
  });
});

describe('exact zeros: the advice depends on where the p-values came from', () => {
  const values = Float64Array.from([...uniform(61, 200), 0]).sort();
  const textOf = (pComputed: boolean): string | undefined => inspectFamily(values, 0, 20, pComputed).findings.find((finding) => finding.id === 'exact-zeros')?.text;

  it('read from the table: underflow, rounding, or 0 of B permutations; recompute', () => {
    expect(textOf(false)).toMatch(/underflowed, printed them rounded to a few decimals \(0\.000\), or counted 0 of B permutations/);
    expect(textOf(false)).toMatch(/--statistic/);
  });

  it('computed by famwise from statistics: beyond double precision, and no advice to use --statistic', () => {
    expect(textOf(true)).toMatch(/too large for double precision/);
    expect(textOf(true)).not.toMatch(/--statistic/);
  });
});
