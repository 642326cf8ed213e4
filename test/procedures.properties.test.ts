// Properties every adjustment must have, on seeded random vectors with ties,
// 0, 1 and subnormal values. These are facts of the trade (common practice).
import { describe, expect, it } from 'vitest';
import { harmonicSum } from '../src/procedures/benjamini-yekutieli.js';
import { METHODS, type Method, findMethod } from '../src/methods.js';
import { awkwardPValues, seededRandom } from './helpers/random.js';

const random = seededRandom(7);
const vectors = Array.from({ length: 60 }, (_, i) => awkwardPValues(random, 1 + Math.floor(random() * (i < 50 ? 40 : 3000))));

function shuffled(p: Float64Array, rng: () => number): { values: Float64Array; order: Int32Array } {
  const order = Int32Array.from(p, (_, i) => i);
  for (let i = order.length - 1; i > 0; i--) {
    const j = Math.floor(rng() * (i + 1));
    [order[i], order[j]] = [order[j] as number, order[i] as number];
  }
  return { values: Float64Array.from(order, (i) => p[i] as number), order };
}

// Adaptive procedures estimate the share of true nulls and scale by it, so
// their adjusted values may lie below the raw p-value (storey: pi0 * BH; bky:
// t / (1 - t)); their own specs check what holds for them instead.

describe.each(METHODS.map((method) => [method.token, method] as const))('%s', (token, method) => {
  it('is never above 1, and never below the raw p-value unless adaptive', () => {
    for (const p of vectors) {
      const adjusted = method.adjust(p, p.length);
      p.forEach((value, i) => {
        if (!method.adaptive) expect(adjusted[i]).toBeGreaterThanOrEqual(value);
        expect(adjusted[i]).toBeLessThanOrEqual(1);
      });
    }
  });

  it('keeps the order of the raw p-values (ties get equal values)', () => {
    for (const p of vectors) {
      const adjusted = method.adjust(p, p.length);
      const byP = Array.from(p.keys()).sort((a, b) => (p[a] as number) - (p[b] as number));
      const broken = byP.slice(1).filter((row, k) => {
        const before = byP[k] as number;
        const sameP = p[before] === p[row];
        return sameP ? adjusted[before] !== adjusted[row] : (adjusted[before] as number) > (adjusted[row] as number);
      });
      expect(broken).toEqual([]);
    }
  });

  it('does not depend on the order of the rows', () => {
    const rng = seededRandom(11);
    for (const p of vectors) {
      const adjusted = method.adjust(p, p.length);
      const { values, order } = shuffled(p, rng);
      const again = method.adjust(values, values.length);
      order.forEach((from, to) => expect(again[to]).toBe(adjusted[from]));
    }
  });

  it('does not modify its input', () => {
    const p = vectors[3] as Float64Array;
    const copy = Float64Array.from(p);
    method.adjust(p, p.length + 5);
    expect(p).toEqual(copy);
  });

  it('with one test returns the p-value itself (bky: the smallest alpha with p <= alpha / (1 + alpha))', () => {
    for (const value of [0, 5e-324, 1e-300, 0.03, 0.5, 1]) {
      const expected = token === 'bky' ? Math.min(1, value / (1 - value)) : value;
      expect(method.adjust(Float64Array.of(value), 1)[0]).toBe(expected);
    }
  });

  it('counting more tests than are present never lowers an adjusted value', () => {
    for (const p of vectors.slice(0, 20)) {
      const exact = method.adjust(p, p.length);
      const more = method.adjust(p, p.length * 3);
      exact.forEach((value, i) => expect(more[i]).toBeGreaterThanOrEqual(value));
    }
  });

  it('refuses p-values outside [0, 1], NaN and an m below the count', () => {
    expect(() => method.adjust(Float64Array.of(0.1, NaN), 2)).toThrow(RangeError);
    expect(() => method.adjust(Float64Array.of(0.1, 1.5), 2)).toThrow(RangeError);
    expect(() => method.adjust(Float64Array.of(-0.1), 1)).toThrow(RangeError);
    expect(() => method.adjust(Float64Array.of(0.1, 0.2), 1)).toThrow(RangeError);
  });
});

describe('relations between procedures', () => {
  const bonferroni = findMethod('bonferroni');
  const holm = findMethod('holm');
  const hochberg = findMethod('hochberg');
  const bh = findMethod('bh');
  const by = findMethod('by');

  it('match their textbook definitions, computed the slow way on small vectors', () => {
    // Definitions as stated in the sources (common practice): with p(1) <= ... <= p(m),
    // Holm: max over j <= i of (m - j + 1) p(j); Hochberg: min over j >= i of (m - j + 1) p(j);
    // BH: min over j >= i of m p(j) / j; BY: BH with c(m) = sum 1/k; all capped at 1.
    for (const p of vectors.filter((vector) => vector.length <= 40)) {
      const m = p.length + 3;
      const sorted = Array.from(p).sort((a, b) => a - b);
      const c = Array.from({ length: m }, (_, k) => 1 / (k + 1)).reduce((sum, term) => sum + term, 0);
      const rank = (value: number): number => sorted.indexOf(value);
      const slow: Record<string, (value: number) => number> = {
        bonferroni: (value) => Math.min(1, m * value),
        holm: (value) => Math.min(1, Math.max(...sorted.slice(0, rank(value) + 1).map((q, j) => (m - j) * q))),
        hochberg: (value) => Math.min(1, ...sorted.map((q, j) => (m - j) * q).slice(rank(value))),
        bh: (value) => Math.min(1, ...sorted.map((q, j) => (m * q) / (j + 1)).slice(rank(value))),
        by: (value) => Math.min(1, ...sorted.map((q, j) => (c * m * q) / (j + 1)).slice(rank(value))),
        // Šidák: 1 - (1 - p)^m; Holm–Šidák: max over j <= i of 1 - (1 - p(j))^(m - j + 1).
        // Written this way they cancel for tiny p (an absolute error up to about m ulps of 1),
        // so they are compared with that allowance below; the fixture from statsmodels covers tiny p.
        sidak: (value) => (m === 1 ? value : 1 - (1 - value) ** m),
        'holm-sidak': (value) => Math.max(...sorted.slice(0, rank(value) + 1).map((q, j) => 1 - (1 - q) ** (m - j))),
      };
      for (const [token, definition] of Object.entries(slow)) {
        const fast = (findMethod(token) as Method).adjust(p, m);
        p.forEach((value, i) => {
          const expected = definition(value);
          const cancellation = token.includes('sidak') ? m * Number.EPSILON : 0;
          expect(Math.abs((fast[i] as number) - expected)).toBeLessThanOrEqual(Math.max(1e-14 * Math.max(expected, 1e-300), cancellation));
        });
      }
    }
  });

  it('Bonferroni >= Holm >= Hochberg >= BH, value by value', () => {
    for (const p of vectors) {
      const values = [bonferroni, holm, hochberg, bh].map((method) => method?.adjust(p, p.length) as Float64Array);
      for (let i = 0; i < p.length; i++) {
        for (let k = 1; k < values.length; k++) {
          expect((values[k] as Float64Array)[i]).toBeLessThanOrEqual((values[k - 1] as Float64Array)[i] as number);
        }
      }
    }
  });

  it('the harmonic sum is exact for small m, and its expansion for large m agrees with summing', () => {
    expect(harmonicSum(1)).toBe(1);
    expect(harmonicSum(4)).toBeCloseTo(25 / 12, 15);
    const summed = (m: number): number => {
      let sum = 0;
      for (let i = m; i >= 1; i--) sum += 1 / i;
      return sum;
    };
    for (const m of [99_999, 100_000, 100_001, 250_000, 3_000_000]) {
      expect(Math.abs(harmonicSum(m) - summed(m)) / summed(m)).toBeLessThan(1e-14);
    }
    // Fast however large m is (for --tests up to 2^53).
    expect(harmonicSum(2 ** 53 - 1)).toBeCloseTo(Math.log(2 ** 53) + 0.5772156649015329, 12);
  });
});
