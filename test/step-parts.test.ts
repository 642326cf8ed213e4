// The step procedures adjusted part by part (procedures/step-parts.ts), as a
// family read and sorted in two threads is, give bit for bit what each
// procedure gives on the whole family.
import { describe, expect, it } from 'vitest';
import { METHODS } from '../src/methods.js';
import { type StepForm, adjustPart, partRunning, ranksInWhole } from '../src/procedures/step-parts.js';
import { sortAscending } from '../src/procedures/sorting.js';
import { awkwardPValues, seededRandom, withTiesAcross } from './helpers/random.js';

const bits = (values: Float64Array): number[] => Array.from(new Uint32Array(values.buffer, values.byteOffset, 2 * values.length));

/** p adjusted in two parts split at `split`, as the two threads do it; with the rejections at alpha. */
function inTwoParts(form: StepForm, p: Float64Array, split: number, m: number, alpha: number): { adjusted: Float64Array; rejected: number; threshold: number } {
  const first = sortAscending(p.subarray(0, split));
  const second = sortAscending(p.subarray(split));
  const firstRanks = ranksInWhole(first.sorted, second.sorted, true);
  const secondRanks = ranksInWhole(second.sorted, first.sorted, false);
  const firstRunning = partRunning(form, first.sorted, firstRanks, m);
  const secondRunning = partRunning(form, second.sorted, secondRanks, m);
  const adjusted = new Float64Array(p.length).fill(NaN);
  const a = adjustPart(form, first, firstRanks, firstRunning, secondRunning, m, alpha, adjusted, 0);
  const b = adjustPart(form, second, secondRanks, secondRunning, firstRunning, m, alpha, adjusted, split);
  return { adjusted, rejected: a.rejected + b.rejected, threshold: Math.max(a.threshold, b.threshold) };
}

const stepMethods = METHODS.filter((method) => method.stepForm !== undefined);

describe('step procedures in two parts', () => {
  it('cover the step-up, step-down and single-step procedures of the registry', () => {
    expect(stepMethods.map((method) => method.token)).toEqual(['bonferroni', 'holm', 'sidak', 'holm-sidak', 'hochberg', 'bh', 'by']);
  });

  for (const method of stepMethods) {
    it(`${method.token}: the same bits as on the whole family, wherever it is split, with ties across the split`, () => {
      const random = seededRandom(31 + method.token.length);
      for (const size of [1, 2, 3, 10, 11, 257, 3000]) {
        const p = withTiesAcross(awkwardPValues(random, size));
        for (const m of [size, size + 17]) {
          const whole = method.adjust(p, m);
          for (const split of new Set([0, 1, Math.floor(size / 2), size - 1, size].filter((at) => at >= 0 && at <= size))) {
            const parts = inTwoParts(method.stepForm as StepForm, p, split, m, 0.05);
            expect(bits(parts.adjusted)).toEqual(bits(whole));
            const rejected = Array.from(whole.keys()).filter((row) => (whole[row] as number) <= 0.05);
            expect(parts.rejected).toBe(rejected.length);
            expect(parts.threshold).toBe(rejected.length === 0 ? -1 : Math.max(...rejected.map((row) => p[row] as number)));
          }
        }
      }
    });
  }

  for (const method of stepMethods) {
    it(`${method.token}: measures each part's adjusted values, once per run of equal values`, () => {
      const random = seededRandom(57 + method.token.length);
      const p = withTiesAcross(awkwardPValues(random, 2000));
      const form = method.stepForm as StepForm;
      const split = 777;
      const first = sortAscending(p.subarray(0, split));
      const second = sortAscending(p.subarray(split));
      const firstRanks = ranksInWhole(first.sorted, second.sorted, true);
      const firstRunning = partRunning(form, first.sorted, firstRanks, p.length);
      const secondRunning = partRunning(form, second.sorted, ranksInWhole(second.sorted, first.sorted, false), p.length);
      const adjusted = new Float64Array(p.length).fill(NaN);
      let calls = 0;
      const measure = (value: number): number => {
        calls++;
        return String(value).length;
      };
      const part = adjustPart(form, first, firstRanks, firstRunning, secondRunning, p.length, 0.05, adjusted, 0, measure);
      const values = Array.from(adjusted.subarray(0, split));
      expect(part.measured).toBe(values.reduce((sum, value) => sum + String(value).length, 0));
      expect(calls).toBe(new Set(values).size);
      expect(adjustPart(form, first, firstRanks, firstRunning, secondRunning, p.length, 0.05, adjusted, 0).measured).toBe(0);
    });
  }

  it('ranks each value of a part in the whole family, ties going to the first part', () => {
    const first = Float64Array.of(0.1, 0.2, 0.2, 0.5);
    const second = Float64Array.of(0.05, 0.2, 0.6);
    // Merged: 0.05(s) 0.1(f) 0.2(f) 0.2(f) 0.2(s) 0.5(f) 0.6(s)
    expect(Array.from(ranksInWhole(first, second, true))).toEqual([1, 2, 3, 5]);
    expect(Array.from(ranksInWhole(second, first, false))).toEqual([0, 4, 6]);
  });
});

describe('adjustInTwoThreads', () => {
  it('gives what one thread gives, doing both parts here when there is no worker to ask (as when run from the sources)', async () => {
    const { adjustInTwoThreads } = await import('../src/io/parallel-adjust.js');
    const { adjustWithinFamilies, singleFamily } = await import('../src/families.js');
    const random = seededRandom(41);
    const p = awkwardPValues(random, 5000);
    const split = 2100;
    const parts = { first: sortAscending(p.subarray(0, split)), second: sortAscending(p.subarray(split)) };
    for (const tests of [undefined, 6000]) {
      const result = await adjustInTwoThreads(p, parts, stepMethods, 0.05, tests);
      expect(result).toEqual(adjustWithinFamilies(p, singleFamily(p.length), stepMethods, { alpha: 0.05, tests }));
    }
    // Not for a method that is no step procedure, nor for parts that are not p's; and --tests below the rows is refused as one thread refuses it.
    expect(await adjustInTwoThreads(p, parts, METHODS, 0.05, undefined)).toBeUndefined();
    expect(await adjustInTwoThreads(p.subarray(1), parts, stepMethods, 0.05, undefined)).toBeUndefined();
    await expect(adjustInTwoThreads(p, parts, stepMethods, 0.05, 4999)).rejects.toThrow('more than the 4999 tests given');
  });
});
