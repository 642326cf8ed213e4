// The radix sort that every procedure relies on, against the engine's own sort.
import { describe, expect, it } from 'vitest';
import { ascendingOrder, gather, mergeSorted, scatter, sortAscending, sortAscendingInPlace } from '../src/procedures/sorting.js';
import { awkwardPValues, seededRandom } from './helpers/random.js';

describe('ascendingOrder', () => {
  it('orders values as the engine\'s numeric sort does, and keeps tied rows in input order', () => {
    const random = seededRandom(3);
    // Below and above the size where the comparison sort hands over to the radix sort.
    for (const size of [0, 1, 2, 3, 17, 511, 512, 1000, 70_000]) {
      const p = awkwardPValues(random, size);
      const order = ascendingOrder(p);
      expect(Array.from(gather(p, order))).toEqual(Array.from(Float64Array.from(p).sort()));
      const tiesInOrder = Array.from(order).every((row, i) => i === 0 || p[order[i - 1] as number] !== p[row] || (order[i - 1] as number) < row);
      expect(tiesInOrder).toBe(true);
    }
  });

  it('puts -0 with 0 and keeps subnormals, 0 and 1 in place, in both sorts', () => {
    const p = Float64Array.of(1, -0, 5e-324, 0, 1e-310, 0.5);
    expect(Array.from(ascendingOrder(p))).toEqual([1, 3, 2, 4, 5, 0]);
    const large = new Float64Array(2000).fill(0.5);
    large[1500] = -0;
    large[10] = 0;
    large[700] = 5e-324;
    expect(Array.from(ascendingOrder(large).slice(0, 4))).toEqual([10, 1500, 700, 0]);
  });

  it('gives the sorted values with the order, bit for bit those the order gathers', () => {
    const random = seededRandom(11);
    // Values sharing most of their bits skip radix passes; -0 takes the slow path and stays -0.
    const withNegativeZero = awkwardPValues(random, 3000);
    withNegativeZero[7] = -0;
    for (const p of [awkwardPValues(random, 100), awkwardPValues(random, 5000), new Float64Array(4000).fill(0.25), Float64Array.from({ length: 3000 }, (_, i) => 1 - i * 2 ** -52), withNegativeZero]) {
      const { order, sorted } = sortAscending(p);
      expect(Array.from(order)).toEqual(Array.from(ascendingOrder(p)));
      const bits = (values: Float64Array): number[] => Array.from(new Uint32Array(values.buffer, values.byteOffset, 2 * values.length));
      expect(bits(sorted)).toEqual(bits(gather(p, order)));
    }
  });

  it('scatter undoes gather', () => {
    const p = awkwardPValues(seededRandom(5), 500);
    const order = ascendingOrder(p);
    expect(scatter(gather(p, order), order)).toEqual(p);
  });
});

describe('mergeSorted', () => {
  const bits = (values: Float64Array): number[] => Array.from(new Uint32Array(values.buffer, values.byteOffset, 2 * values.length));

  it('gives, from the sorts of two parts, the sort of the whole, bit for bit and with ties in input order', () => {
    const random = seededRandom(17);
    for (const size of [0, 1, 2, 600, 3000, 20_000]) {
      const p = awkwardPValues(random, size);
      // Ties across the split, and -0 beside 0 on either side of it.
      if (size > 10) {
        p[1] = -0;
        p[size - 2] = 0;
        p[size - 1] = p[0] as number;
      }
      for (const split of [0, 1, Math.floor(size / 3), size - 1, size].filter((at) => at >= 0 && at <= size)) {
        const whole = sortAscending(p);
        const merged = mergeSorted(sortAscending(p.subarray(0, split)), sortAscending(p.subarray(split)));
        expect(Array.from(merged.order)).toEqual(Array.from(whole.order));
        expect(bits(merged.sorted)).toEqual(bits(whole.sorted));
      }
    }
  });

  it('sortAscendingInPlace gives what sortAscending gives', () => {
    const p = awkwardPValues(seededRandom(19), 5000);
    const whole = sortAscending(p);
    const inPlace = sortAscendingInPlace(p.slice());
    expect(Array.from(inPlace.order)).toEqual(Array.from(whole.order));
    expect(bits(inPlace.sorted)).toEqual(bits(whole.sorted));
    // A view into a larger buffer is sorted where it lies, the rest left alone.
    const larger = new Float64Array(p.length + 8).fill(7);
    larger.set(p, 3);
    const view = sortAscendingInPlace(larger.subarray(3, 3 + p.length));
    expect(Array.from(view.order)).toEqual(Array.from(whole.order));
    expect(bits(view.sorted)).toEqual(bits(whole.sorted));
    expect([larger[0], larger[2], larger[p.length + 3], larger[p.length + 7]]).toEqual([7, 7, 7, 7]);
  });
});
