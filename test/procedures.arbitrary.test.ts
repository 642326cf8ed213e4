// The procedures' invariants on arbitrary p-value vectors (fast-check, with a
// fixed seed so that a failure repeats): ties, 0, 1, subnormal and
// near-1 values, for every method in the registry. These are facts of the
// trade (common practice, no source); the last one is what makes
// --bounds-as-values conservative.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { PI0_MIN_TESTS } from '../src/estimators/pi0.js';
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
  // Adaptive procedures (storey, bky) scale by an estimated share of true nulls and may go below the raw p-value.
  it(method.adaptive ? 'stays between 0 and 1, and counting absent tests never lowers it' : 'stays between the raw p-value and 1, and counting absent tests never lowers it', () => {
    fc.assert(
      fc.property(pVector, fc.nat(50), (p, absent) => {
        const adjusted = method.adjust(p, p.length);
        const more = method.adjust(p, p.length + absent);
        // storey falls back to pi0 = 1 for fewer than PI0_MIN_TESTS tests or no p-value above lambda (0.5);
        // counting absent tests (p = 1) can leave that fallback and lower pi0, so the comparison holds only outside it.
        const comparable = !method.adaptive || (p.length >= PI0_MIN_TESTS && p.some((value) => value > 0.5));
        p.forEach((value, i) => {
          expect(adjusted[i]).toBeGreaterThanOrEqual(method.adaptive ? 0 : value);
          expect(adjusted[i]).toBeLessThanOrEqual(1);
          if (comparable) expect(more[i]).toBeGreaterThanOrEqual(adjusted[i] as number);
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
        // storey falls back to pi0 = 1 when no p-value is above lambda (0.5 by default): raising one
        // above it then lowers pi0 from that fallback. Monotone everywhere else, which is what is checked.
        fc.pre(!method.adaptive || p.some((value) => value > 0.5));
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
