// Properties every adjustment must have, on seeded random vectors with ties,
// 0, 1 and subnormal values. These are facts of the trade (common practice).
import { describe, expect, it } from 'vitest';
import { harmonicSum } from '../src/procedures/benjamini-yekutieli.js';
import { METHODS, findMethod } from '../src/methods.js';
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

describe.each(METHODS.map((method) => [method.token, method] as const))('%s', (_token, method) => {
  it('is never below the raw p-value and never above 1', () => {
    for (const p of vectors) {
      const adjusted = method.adjust(p, p.length);
      p.forEach((value, i) => {
        expect(adjusted[i]).toBeGreaterThanOrEqual(value);
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

  it('with one test returns the p-value itself', () => {
    for (const value of [0, 5e-324, 1e-300, 0.03, 0.5, 1]) expect(method.adjust(Float64Array.of(value), 1)[0]).toBe(value);
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

  it('BY equals BH times the harmonic sum c(m), capped at 1, to the last bit', () => {
    for (const p of vectors) {
      const c = harmonicSum(p.length);
      const viaBH = bh?.adjust(p, p.length).map((value) => Math.min(1, c * value));
      expect(by?.adjust(p, p.length)).toEqual(viaBH);
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

  it('the harmonic sum is exact for small m and near ln m + 0.5772 for large m', () => {
    expect(harmonicSum(1)).toBe(1);
    expect(harmonicSum(4)).toBeCloseTo(25 / 12, 15);
    const m = 10_000_000;
    // Euler-Maclaurin: ln m + gamma + 1/(2m) - 1/(12 m^2) (common practice).
    expect(harmonicSum(m)).toBeCloseTo(Math.log(m) + 0.5772156649015329 + 1 / (2 * m), 12);
  });
});
