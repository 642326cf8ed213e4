// Storey q-values: exactly BH when pi0 = 1, pi0 times BH otherwise, and a
// worked example (Storey & Tibshirani 2003, PNAS 100:9440-9445, Remark B:
// q(p(m)) = pi0 p(m), q(p(i)) = min(pi0 m p(i) / i, q(p(i+1)))).
import { describe, expect, it } from 'vitest';
import { benjaminiHochbergSorted } from '../src/procedures/benjamini-hochberg.js';
import { storeyQValuesSorted } from '../src/procedures/storey.js';
import { DEFAULT_SETTINGS, findMethod } from '../src/methods.js';
import { awkwardPValues, seededRandom } from './helpers/random.js';

const random = seededRandom(2002);
const vectors = Array.from({ length: 40 }, (_, i) => awkwardPValues(random, 1 + Math.floor(random() * (i < 30 ? 50 : 5000))).sort());

describe('storey q-values', () => {
  it('equal BH to the last bit when pi0 = 1, with and without absent tests', () => {
    for (const sorted of vectors) {
      for (const m of [sorted.length, sorted.length * 2 + 3]) {
        const q = storeyQValuesSorted(sorted, m, 1);
        const bh = benjaminiHochbergSorted(sorted, m);
        expect(q.filter((value, i) => !Object.is(value, bh[i]))).toHaveLength(0);
      }
    }
  });

  it('are pi0 times BH: monotone, at most pi0, ties equal', () => {
    for (const sorted of vectors) {
      const pi0 = 0.1 + 0.9 * random();
      const q = storeyQValuesSorted(sorted, sorted.length + 2, pi0);
      const bh = benjaminiHochbergSorted(sorted, sorted.length + 2);
      const broken = Array.from(q.keys()).filter((i) => {
        const value = q[i] as number;
        const previous = i > 0 ? (q[i - 1] as number) : 0;
        const tieBroken = i > 0 && sorted[i] === sorted[i - 1] && value !== previous;
        return value !== (bh[i] as number) * pi0 || value > pi0 || value < previous || tieBroken;
      });
      expect(broken).toEqual([]);
    }
  });

  it('worked by hand: 5 p-values, pi0 = 0.6', () => {
    // pi0 m p(i) / i = 3 p(i) / i: 0.03, 0.03, 0.03, 0.03, 0.3; the running
    // minimum from the top leaves them as they are.
    const q = storeyQValuesSorted(Float64Array.of(0.01, 0.02, 0.03, 0.04, 0.5), 5, 0.6);
    const expected = [0.03, 0.03, 0.03, 0.03, 0.3];
    q.forEach((value, i) => expect(value).toBeCloseTo(expected[i] as number, 15));
  });

  it('refuses pi0 outside (0, 1]', () => {
    expect(() => storeyQValuesSorted(Float64Array.of(0.1), 1, 0)).toThrow(RangeError);
    expect(() => storeyQValuesSorted(Float64Array.of(0.1), 1, 1.2)).toThrow(RangeError);
  });

  it('the registry entry estimates pi0 per family and reports it', () => {
    const storey = findMethod('storey');
    const sorted = Float64Array.from({ length: 100 }, (_, k) => (k < 40 ? k / 10_000 : (k - 39.5) / 60)).sort();
    const result = storey?.run({ sorted, m: 100 }, DEFAULT_SETTINGS);
    // Above 0.5 lie the (k - 39.5) / 60 > 0.5, k = 70..99: 30 of them; 30 / (100 * 0.5) = 0.6.
    expect(result?.pi0).toEqual({ value: 0.6, estimator: 'fixed', tuning: { lambda: 0.5 }, fallback: null });
    const bh = benjaminiHochbergSorted(sorted, 100);
    result?.adjusted.forEach((value, i) => expect(value).toBe((bh[i] as number) * 0.6));
  });
});
