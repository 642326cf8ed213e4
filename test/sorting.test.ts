// The radix sort that every procedure relies on, against the engine's own sort.
import { describe, expect, it } from 'vitest';
import { ascendingOrder, gather, mergeSorted, scatter, sortAscending, sortAscendingInPlace } from '../src/procedures/sorting.js';
import { awkwardPValues, seededRandom, withTiesAcross } from './helpers/random.js';

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

  it('sorts values that share their high 32 bits by the low 32, in short and long runs, shuffled', () => {
    const random = seededRandom(23);
    // Values a few units in the last place apart share the high word: runs of 2 to 5000 values
    // (insertion up to 64, radix passes above), with exact ties among them, in shuffled order.
    for (const run of [2, 31, 63, 64, 65, 66, 200, 5000]) {
      const values: number[] = [];
      for (const base of [0.5, 0.123456789, 1e-300, 3.5]) {
        for (let k = 0; k < run; k++) values.push(base + Math.floor(random() * run * 0.8) * (base * 2 ** -50));
      }
      for (let i = values.length - 1; i > 0; i--) {
        const j = Math.floor(random() * (i + 1));
        [values[i], values[j]] = [values[j] as number, values[i] as number];
      }
      const p = Float64Array.from(values.length >= 512 ? values : [...values, ...new Array<number>(512).fill(0.75)]);
      const { order, sorted } = sortAscending(p);
      const expected = Array.from(p.keys()).sort((a, b) => (p[a] as number) - (p[b] as number) || a - b);
      expect(Array.from(order)).toEqual(expected);
      expect(Array.from(sorted)).toEqual(expected.map((row) => p[row]));
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
      const p = withTiesAcross(awkwardPValues(random, size));
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
