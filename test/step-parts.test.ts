// The step procedures adjusted part by part (procedures/step-parts.ts), as a
// family read and sorted in two threads is, give bit for bit what each
// procedure gives on the whole family.
import { describe, expect, it } from 'vitest';
import { METHODS } from '../src/methods.js';
import { type StepForm, adjustPart, partMeasure, partRunning, ranksInWhole } from '../src/procedures/step-parts.js';
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
  it('set a block of values adjusted to 1 in order, and place only the others (Holm on mostly large p-values)', () => {
    const form = METHODS.find((method) => method.token === 'holm')?.stepForm as StepForm;
    const p = Float64Array.from({ length: 400 }, (_, i) => (i % 5 === 0 ? 1e-6 * (i + 1) : 0.2 + i / 1000));
    const whole = METHODS.find((method) => method.token === 'holm')?.adjust(p) as Float64Array;
    expect(whole.filter((value) => value === 1).length).toBeGreaterThan(p.length / 2);
    expect(bits(inTwoParts(form, p, 150, p.length, 0.05).adjusted)).toEqual(bits(whole));
  });

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
            // At alpha 1 every value is rejected, those set to 1 in a block (adjustPart) too.
            for (const alpha of [0.05, 1]) {
              const parts = inTwoParts(method.stepForm as StepForm, p, split, m, alpha);
              expect(bits(parts.adjusted)).toEqual(bits(whole));
              const rejected = Array.from(whole.keys()).filter((row) => (whole[row] as number) <= alpha);
              expect(parts.rejected).toBe(rejected.length);
              expect(parts.threshold).toBe(rejected.length === 0 ? -1 : Math.max(...rejected.map((row) => p[row] as number)));
            }
          }
        }
      }
    });
  }

  for (const method of stepMethods) {
    it(`${method.token}: measures any stretch of a part's adjusted values, once per run of equal values`, () => {
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
      adjustPart(form, first, firstRanks, firstRunning, secondRunning, p.length, 0.05, adjusted, 0);
      // The first part's adjusted values in its sorted order, as they were written by row.
      const byRank = Array.from(first.order, (row) => adjusted[row] as number);
      let calls = 0;
      const measure = (value: number): number => {
        calls++;
        return String(value).length;
      };
      const textLengths = (values: number[]): number => values.reduce((sum, value) => sum + String(value).length, 0);
      for (const [from, to] of [[0, split], [0, 0], [0, 1], [1, 300], [300, split - 1], [split - 1, split]] as const) {
        calls = 0;
        expect(partMeasure(form, firstRanks, firstRunning, secondRunning, p.length, from, to, measure)).toBe(textLengths(byRank.slice(from, to)));
        expect(calls).toBe(new Set(byRank.slice(from, to)).size);
      }
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

  it("measures the text of the first part's adjusted values, in stretches claimed by either thread, and counts its rejections", async () => {
    const { MEASURE_CHUNK, adjustInTwoThreads } = await import('../src/io/parallel-adjust.js');
    const p = withTiesAcross(awkwardPValues(seededRandom(43), 3 * MEASURE_CHUNK));
    // A first part of two stretches and a bit.
    const split = 2 * MEASURE_CHUNK + 123;
    const parts = { first: sortAscending(p.subarray(0, split)), second: sortAscending(p.subarray(split)) };
    const result = await adjustInTwoThreads(p, parts, stepMethods, 0.05, undefined, true);
    expect(result?.firstPart?.rows).toBe(split);
    expect(result?.firstPart?.byMethod).toEqual(
      (result?.adjusted ?? []).map((values) => {
        const first = Array.from(values.subarray(0, split));
        return { measured: first.reduce((sum, value) => sum + String(value).length, 0), rejected: first.filter((value) => value <= 0.05).length };
      }),
    );
    expect((await adjustInTwoThreads(p, parts, stepMethods, 0.05, undefined))?.firstPart).toBeUndefined();
  });

  it("measures the first part's values the same from either part's job, whichever claims the stretches first", async () => {
    const { MEASURE_CHUNK, stepsStage } = await import('../src/io/parallel-adjust.js');
    const p = withTiesAcross(awkwardPValues(seededRandom(47), 2 * MEASURE_CHUNK));
    const split = MEASURE_CHUNK + 500;
    const first = sortAscending(p.subarray(0, split));
    const second = sortAscending(p.subarray(split));
    for (const method of stepMethods) {
      const firstRanks = new Uint32Array(split);
      const secondRanks = new Uint32Array(p.length - split);
      const firstRunning = new Float64Array(split + 1);
      const secondRunning = new Float64Array(p.length - split + 1);
      const target = new Float64Array(p.length);
      const common = { kind: 'steps' as const, withRanks: true, token: method.token, m: p.length, alpha: 0.05, target };
      const firstJob = { ...common, own: first, other: second.sorted, ranks: firstRanks, ownRunning: firstRunning, otherRunning: secondRunning, rowOffset: 0 };
      const secondJob = { ...common, own: second, other: first.sorted, ranks: secondRanks, ownRunning: secondRunning, otherRunning: firstRunning, rowOffset: split };
      stepsStage({ ...firstJob, stage: 'running' });
      stepsStage({ ...secondJob, stage: 'running' });
      const whole = method.adjust(p);
      const expected = Array.from(first.order, (row) => String(whole[row]).length).reduce((sum, length) => sum + length, 0);
      for (const order of [[firstJob, secondJob], [secondJob, firstJob]]) {
        const measureFirst = { next: new Int32Array(1), to: split, firstRanks };
        const [done, left] = order.map((job) => stepsStage({ ...job, stage: 'adjust', measureFirst }));
        // The job that ran first claimed every stretch.
        expect({ method: method.token, measured: [done?.measured, left?.measured] }).toEqual({ method: method.token, measured: [expected, 0] });
      }
    }
  });
});
