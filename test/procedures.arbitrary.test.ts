// The procedures' invariants on arbitrary p-value vectors (fast-check, with a
// fixed seed so that a failure repeats): ties, 0, 1, subnormal and
// near-1 values, for every method in the registry. These are facts of the
// trade (common practice, no source); the last one is what makes
// --bounds-as-values conservative.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { METHODS } from '../src/methods.js';

const RUNS = { seed: 20261201, numRuns: 200 };

/** p-values with the awkward ones likely: exact 0 and 1, the smallest subnormals, values a hair below 1, and any double in [0, 1]. */
const pValue = fc.oneof(
  fc.constantFrom(0, 1, 5e-324, 1e-323, 2.2250738585072014e-308, 1e-300, 0.05, 0.5, 1 - 2 ** -53),
  fc.double({ min: 0, max: 1, noNaN: true }),
  fc.double({ min: 0, max: 1e-300, noNaN: true }),
);

/** Vectors in which ties are common: values drawn from a small pool of p-values, plus fresh ones. */
const pick = fc.oneof(fc.nat(7).map((index) => ({ index })), pValue.map((value) => ({ value })));
const pVector = fc
  .tuple(fc.array(pValue, { minLength: 1, maxLength: 8 }), fc.array(pick, { minLength: 1, maxLength: 150 }))
  .map(([pool, picks]) => Float64Array.from(picks, (choice) => ('value' in choice ? choice.value : (pool[choice.index % pool.length] as number))));

/** A vector and a permutation of its indices. */
const shuffledVector = pVector.chain((p) =>
  fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: p.length, maxLength: p.length }).map((keys) => ({
    p,
    order: Array.from(p.keys()).sort((a, b) => (keys[a] as number) - (keys[b] as number) || a - b),
  })),
);

describe.each(METHODS.map((method) => [method.token, method] as const))('%s on arbitrary p-values', (_token, method) => {
  it('stays between the raw p-value and 1, and counting absent tests never lowers it', () => {
    fc.assert(
      fc.property(pVector, fc.nat(50), (p, absent) => {
        const adjusted = method.adjust(p, p.length);
        const more = method.adjust(p, p.length + absent);
        p.forEach((value, i) => {
          expect(adjusted[i]).toBeGreaterThanOrEqual(value);
          expect(adjusted[i]).toBeLessThanOrEqual(1);
          expect(more[i]).toBeGreaterThanOrEqual(adjusted[i] as number);
          expect(more[i]).toBeLessThanOrEqual(1);
        });
      }),
      RUNS,
    );
  });

  it('keeps the order of the raw p-values, and gives ties equal values', () => {
    fc.assert(
      fc.property(pVector, (p) => {
        const adjusted = method.adjust(p, p.length);
        for (let i = 0; i < p.length; i++) {
          for (let j = 0; j < p.length; j++) {
            if ((p[i] as number) === (p[j] as number)) expect(adjusted[i]).toBe(adjusted[j]);
            else if ((p[i] as number) < (p[j] as number)) expect(adjusted[i]).toBeLessThanOrEqual(adjusted[j] as number);
          }
        }
      }),
      RUNS,
    );
  });

  it('does not depend on the order of the rows, and leaves its input unchanged', () => {
    fc.assert(
      fc.property(shuffledVector, ({ p, order }) => {
        const copy = Float64Array.from(p);
        const adjusted = method.adjust(p, p.length);
        expect(p).toEqual(copy);
        const again = method.adjust(Float64Array.from(order, (i) => p[i] as number), p.length);
        order.forEach((from, to) => expect(again[to]).toBe(adjusted[from]));
      }),
      RUNS,
    );
  });

  it('never lowers any adjusted value when one raw p-value is raised', () => {
    fc.assert(
      fc.property(pVector, fc.nat(), pValue, (p, which, raisedTo) => {
        const k = which % p.length;
        const raised = Float64Array.from(p);
        raised[k] = Math.max(p[k] as number, raisedTo);
        const before = method.adjust(p, p.length);
        const after = method.adjust(raised, p.length);
        before.forEach((value, i) => expect(after[i]).toBeGreaterThanOrEqual(value));
      }),
      RUNS,
    );
  });
});
