// Weighted Bonferroni, Holm and BH: equal weights give the unweighted
// procedures to the bit, and small examples give the answers worked by hand
// from the definitions in Holm (1979), Scand. J. Stat. 6:65-70, section 5,
// and Genovese, Roeder & Wasserman (2006), Biometrika 93:509-524.
import { describe, expect, it } from 'vitest';
import { ZeroWeightsError, adjustWithinFamilies } from '../src/families.js';
import { METHODS, WEIGHTED_TOKENS, adjustWeighted, findMethod, type Method } from '../src/methods.js';
import { normalisedWeights } from '../src/procedures/weights.js';
import { awkwardPValues, seededRandom } from './helpers/random.js';

const method = (token: string): Method => findMethod(token) as Method;
const weighted = (token: string, p: number[], w: number[]): number[] =>
  Array.from(adjustWeighted(method(token), Float64Array.from(p), Float64Array.from(w)));

describe('weighted procedures', () => {
  it('exist for bonferroni, holm and bh only', () => {
    expect(WEIGHTED_TOKENS).toEqual(['bonferroni', 'holm', 'bh']);
  });

  it('with all weights equal, equal the unweighted procedures bit for bit', () => {
    const random = seededRandom(2006);
    for (let round = 0; round < 60; round++) {
      const p = awkwardPValues(random, 1 + Math.floor(random() * (round < 50 ? 60 : 3000)));
      const scale = [1, 3.7, 0.1, 1e-5][round % 4] as number;
      for (const token of WEIGHTED_TOKENS) {
        const plain = method(token).adjust(p);
        const withWeights = adjustWeighted(method(token), p, new Float64Array(p.length).fill(scale));
        expect(Array.from(withWeights)).toEqual(Array.from(plain));
      }
    }
  });

  // p = 0.01, 0.02, 0.03, 0.04 with weights 2, 1, 0.5, 0.5 (mean 1, m = 4); p / w = 0.005, 0.02, 0.06, 0.08.
  const p = [0.01, 0.02, 0.03, 0.04];
  const w = [2, 1, 0.5, 0.5];

  it('weighted Bonferroni: m p / w, worked by hand', () => {
    // 4(0.01)/2, 4(0.02)/1, 4(0.03)/0.5, 4(0.04)/0.5
    expect(weighted('bonferroni', p, w)).toEqual([0.02, 0.08, 0.24, 0.32]);
  });

  it('weighted Holm: running max of (p/w) times the weight not yet rejected, worked by hand', () => {
    // Remaining weight 4, 2, 1, 0.5: 0.02, 0.04, 0.06, 0.04; running maximum 0.02, 0.04, 0.06, 0.06.
    // At alpha 0.05, step by step: 0.01 <= 0.05(2/4), 0.02 <= 0.05(1/2), 0.03 > 0.05(0.5/1): two rejected.
    const adjusted = weighted('holm', p, w);
    [0.02, 0.04, 0.06, 0.06].forEach((value, i) => expect(adjusted[i]).toBeCloseTo(value, 15));
    expect(adjusted.filter((value) => value <= 0.05)).toHaveLength(2);
  });

  it('weighted BH: running min of m (p/w) / rank, worked by hand', () => {
    // 4(0.005)/1, 4(0.02)/2, 4(0.06)/3, 4(0.08)/4 = 0.02, 0.04, 0.08, 0.08 (already non-decreasing).
    // At 0.05: the largest k with p/w <= k 0.05 / 4 is k = 2 (0.02 <= 0.025; 0.06 > 0.0375; 0.08 > 0.05).
    const adjusted = weighted('bh', p, w);
    [0.02, 0.04, 0.08, 0.08].forEach((value, i) => expect(adjusted[i]).toBeCloseTo(value, 15));
    expect(adjusted.filter((value) => value <= 0.05)).toHaveLength(2);
  });

  it('weights on any scale give the same answer (only ratios matter)', () => {
    for (const token of WEIGHTED_TOKENS) expect(weighted(token, p, [4, 2, 1, 1])).toEqual(weighted(token, p, w));
  });

  it('a weight of 0 is never rejected, even at p = 0', () => {
    for (const token of WEIGHTED_TOKENS) {
      const adjusted = weighted(token, [0, 0.001, 0.5], [0, 1, 1]);
      expect(adjusted[0]).toBe(1);
      expect(adjusted[1]).toBeLessThan(0.01);
    }
  });

  it('stay in [0, 1] and keep the order of p / w, on random weights', () => {
    const random = seededRandom(509);
    for (let round = 0; round < 40; round++) {
      const values = awkwardPValues(random, 1 + Math.floor(random() * 200));
      const weights = Float64Array.from(values, () => (random() < 0.1 ? 0 : random() * 5));
      if (weights.every((value) => value === 0)) weights[0] = 1;
      const normalised = normalisedWeights(weights);
      const ratio = Array.from(values, (value, i) => ((normalised[i] as number) > 0 ? value / (normalised[i] as number) : Infinity));
      for (const token of WEIGHTED_TOKENS) {
        const adjusted = adjustWeighted(method(token), values, weights);
        const order = ratio.map((_, i) => i).sort((a, b) => (ratio[a] as number) - (ratio[b] as number));
        for (let k = 1; k < order.length; k++) {
          expect(adjusted[order[k] as number]).toBeGreaterThanOrEqual(adjusted[order[k - 1] as number] as number);
        }
        adjusted.forEach((value) => expect(value >= 0 && value <= 1).toBe(true));
      }
    }
  });

  it('normalise to mean 1 and refuse negative, infinite, missing and all-zero weights', () => {
    expect(Array.from(normalisedWeights(Float64Array.of(1, 3)))).toEqual([0.5, 1.5]);
    expect(() => normalisedWeights(Float64Array.of(1, -1))).toThrow(RangeError);
    expect(() => normalisedWeights(Float64Array.of(1, Infinity))).toThrow(RangeError);
    expect(() => normalisedWeights(Float64Array.of(1, NaN))).toThrow(RangeError);
    expect(() => normalisedWeights(Float64Array.of(0, 0))).toThrow(RangeError);
  });

  it('are normalised within each family, and refuse a family whose weights are all zero', () => {
    // Family 0: p 0.01, 0.04 with weights 1, 3 -> 0.5, 1.5. Family 1: p 0.02 alone, weight 9 -> 1.
    const ids = Int32Array.of(0, 1, 0);
    const result = adjustWithinFamilies(Float64Array.of(0.01, 0.02, 0.04), { ids, count: 2 }, [method('bonferroni')], {
      alpha: 0.05,
      weights: Float64Array.of(1, 9, 3),
    });
    expect(Array.from(result.adjusted[0] as Float64Array)).toEqual([0.04, 0.02, 2 * (0.04 / 1.5)]);
    expect(() =>
      adjustWithinFamilies(Float64Array.of(0.01, 0.02), { ids: Int32Array.of(0, 1), count: 2 }, [method('bh')], {
        alpha: 0.05,
        weights: Float64Array.of(1, 0),
      }),
    ).toThrow(ZeroWeightsError);
    const unweightable = METHODS.find((candidate) => !WEIGHTED_TOKENS.includes(candidate.token)) as Method;
    expect(() =>
      adjustWithinFamilies(Float64Array.of(0.01), { ids: Int32Array.of(0), count: 1 }, [unweightable], { alpha: 0.05, weights: Float64Array.of(1) }),
    ).toThrow(/no weighted form/);
  });
});

describe('weights at the ends of the double range', () => {
  it('give the same answer as moderate weights in the same ratios', () => {
    const p = Float64Array.of(0.01, 0.02, 0.03);
    for (const token of WEIGHTED_TOKENS) {
      const moderate = adjustWeighted(method(token), p, Float64Array.of(1, 1, 1e-8));
      const huge = adjustWeighted(method(token), p, Float64Array.of(1e308, 1e308, 1e300));
      const tiny = adjustWeighted(method(token), Float64Array.of(0.01, 0.02, 0.03), Float64Array.of(0, 1e-320, 2e-320));
      const plain = adjustWeighted(method(token), Float64Array.of(0.01, 0.02, 0.03), Float64Array.of(0, 1, 2));
      huge.forEach((value, i) => expect(value).toBeCloseTo(moderate[i] as number, 12));
      tiny.forEach((value, i) => expect(value).toBeCloseTo(plain[i] as number, 2));
      expect(Array.from(tiny).every((value) => value >= 0 && value <= 1)).toBe(true);
    }
  });
});
