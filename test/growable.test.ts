// The append-only typed arrays the reader keeps rows in: every value back, in
// order, across the small first block and the full-size blocks after it.
import { describe, expect, it } from 'vitest';
import { Growable } from '../src/io/growable.js';

describe('Growable', () => {
  it('gives back every value pushed, in order, at every size around its block edges', () => {
    // The first two blocks hold 16 values each, later ones 65536: sizes on either side of each edge.
    for (const size of [0, 1, 15, 16, 17, 31, 32, 33, 65567, 65568, 65569, 131_104, 131_105, 200_000]) {
      const values = new Growable((length) => new Float64Array(length));
      for (let i = 0; i < size; i++) values.push(i + 0.5);
      const out = values.toArray();
      expect(out.length).toBe(size);
      expect(values.length).toBe(size);
      const wrong = out.findIndex((value, i) => value !== i + 0.5);
      expect(wrong).toBe(-1);
    }
  });

  it('appends the array given to toArray, and later pushes do not show in an earlier copy', () => {
    const ids = new Growable((length) => new Int32Array(length));
    for (let i = 0; i < 70_000; i++) ids.push(i);
    const copy = ids.toArray(Int32Array.of(-1, -2));
    ids.push(7);
    expect(copy.length).toBe(70_002);
    expect([copy[0], copy[15], copy[16], copy[31], copy[32], copy[65_567], copy[65_568], copy[69_999], copy[70_000], copy[70_001]]).toEqual([0, 15, 16, 31, 32, 65_567, 65_568, 69_999, -1, -2]);
    expect(ids.toArray().length).toBe(70_001);
  });
});
