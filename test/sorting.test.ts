// The radix sort that every procedure relies on, against the engine's own sort.
import { describe, expect, it } from 'vitest';
import { ascendingOrder, gather, scatter } from '../src/procedures/sorting.js';
import { awkwardPValues, seededRandom } from './helpers/random.js';

describe('ascendingOrder', () => {
  it('sorts like a comparator sort, stably, on awkward vectors', () => {
    const random = seededRandom(3);
    for (const size of [0, 1, 2, 3, 17, 1000, 70_000]) {
      const p = awkwardPValues(random, size);
      const order = ascendingOrder(p);
      const expected = Array.from(p.keys()).sort((a, b) => (p[a] as number) - (p[b] as number) || a - b);
      expect(Array.from(order)).toEqual(expected);
    }
  });

  it('puts -0 with 0 and keeps subnormals, 0 and 1 in place', () => {
    const p = Float64Array.of(1, -0, 5e-324, 0, 1e-310, 0.5);
    expect(Array.from(gather(p, ascendingOrder(p)))).toEqual([-0, 0, 5e-324, 1e-310, 0.5, 1]);
    expect(Array.from(ascendingOrder(p))).toEqual([1, 3, 2, 4, 5, 0]);
  });

  it('scatter undoes gather', () => {
    const p = awkwardPValues(seededRandom(5), 500);
    const order = ascendingOrder(p);
    expect(scatter(gather(p, order), order)).toEqual(p);
  });
});
