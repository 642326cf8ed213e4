// Hommel's procedure: the O(m log m) algorithm against two slow oracles
// that follow the definitions, on seeded random vectors with ties.
import { describe, expect, it } from 'vitest';
import { adjustHochberg } from '../src/procedures/hochberg.js';
import { adjustHommel } from '../src/procedures/hommel.js';
import { awkwardPValues, seededRandom } from './helpers/random.js';

/** Simes' p-value of a set: min over j of k p(j) / j, for its k values ascending. */
function simes(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return Math.min(...sorted.map((value, j) => (sorted.length * value) / (j + 1)));
}

/**
 * Closed testing itself (Marcus, Peritz & Gabriel (1976), Biometrika 63:655-660;
 * Hommel (1988), Biometrika 75:383-386): the adjusted p-value of H_k is the
 * largest Simes p-value over all sets of hypotheses that contain it. Every
 * subset is visited, so only for m up to about 10.
 */
function closedTesting(p: number[], m: number): number[] {
  const all = [...p, ...Array<number>(m - p.length).fill(1)];
  const adjusted = p.map(() => 0);
  for (let subset = 1; subset < 1 << m; subset++) {
    const members = all.flatMap((_, i) => ((subset >> i) & 1 ? [i] : []));
    const value = simes(members.map((i) => all[i] as number));
    for (const i of members) if (i < p.length) adjusted[i] = Math.max(adjusted[i] as number, value);
  }
  return adjusted.map((value) => Math.min(1, value));
}

/**
 * The usual quadratic algorithm, stage by stage for every set size (Hommel
 * 1988, in the form R's stats::p.adjust computes it; translated here, test
 * use only).
 */
function quadraticHommel(p: Float64Array, m: number): Float64Array {
  const order = Array.from(p.keys()).sort((a, b) => (p[a] as number) - (p[b] as number));
  const sorted = [...order.map((i) => p[i] as number), ...Array<number>(m - p.length).fill(1)];
  const n = m;
  const initial = Math.min(...sorted.map((value, i) => (n * value) / (i + 1)));
  const q = Array<number>(n).fill(initial);
  const pa = Array<number>(n).fill(initial);
  for (let size = n - 1; size >= 2; size--) {
    const lower = n - size + 1; // positions 1..lower keep their own bound, the rest share one
    let q1 = Infinity;
    for (let j = 2; j <= size; j++) q1 = Math.min(q1, (size * (sorted[lower + j - 2] as number)) / j);
    for (let i = 1; i <= lower; i++) q[i - 1] = Math.min(size * (sorted[i - 1] as number), q1);
    for (let i = lower + 1; i <= n; i++) q[i - 1] = q[lower - 1] as number;
    for (let i = 0; i < n; i++) pa[i] = Math.max(pa[i] as number, q[i] as number);
  }
  const adjusted = new Float64Array(p.length);
  order.forEach((row, rank) => {
    adjusted[row] = Math.max(pa[rank] as number, sorted[rank] as number);
  });
  return adjusted;
}

function expectClose(actual: Float64Array, expected: ArrayLike<number>, where: string): void {
  for (let i = 0; i < actual.length; i++) {
    const a = actual[i] as number;
    const e = expected[i] as number;
    if (!(Math.abs(a - e) <= 1e-13 * Math.max(e, 1e-300))) expect.fail(`${where}, row ${i}: got ${a}, expected ${e}`);
  }
}

describe('Hommel', () => {
  const random = seededRandom(1988);

  it('equals closed testing with Simes tests on every small vector', () => {
    for (let round = 0; round < 300; round++) {
      const present = 1 + Math.floor(random() * 7);
      const m = present + (round % 3 === 0 ? Math.floor(random() * 3) : 0);
      const p = awkwardPValues(random, present);
      expectClose(adjustHommel(p, m), closedTesting(Array.from(p), m), `round ${round}, m = ${m}`);
    }
  });

  it('equals the quadratic stagewise algorithm on random vectors with ties, up to m = 3000', () => {
    for (let round = 0; round < 40; round++) {
      const present = 1 + Math.floor(random() * (round < 30 ? 200 : 3000));
      const p = awkwardPValues(random, present);
      const coarse = round % 2 === 0 ? p.map((value) => Math.round(value * 100) / 100) : p;
      const m = present + (round % 4 === 0 ? Math.floor(random() * 50) : 0);
      expectClose(adjustHommel(coarse, m), quadraticHommel(coarse, m), `round ${round}, m = ${m}`);
    }
  });

  it('never rejects less than Hochberg (Hommel 1988; common practice)', () => {
    for (let round = 0; round < 50; round++) {
      const p = awkwardPValues(random, 1 + Math.floor(random() * 500));
      const hommel = adjustHommel(p);
      const hochberg = adjustHochberg(p);
      hommel.forEach((value, i) => expect(value).toBeLessThanOrEqual((hochberg[i] as number) * (1 + 1e-15)));
    }
  });

  it('handles one test, all equal values, zeros and a family padded with many absent tests', () => {
    expect(Array.from(adjustHommel(Float64Array.of(0.03)))).toEqual([0.03]);
    expect(Array.from(adjustHommel(Float64Array.of(0.3, 0.3, 0.3)))).toEqual([0.3, 0.3, 0.3]);
    expect(Array.from(adjustHommel(Float64Array.of(0, 0, 0.5)))).toEqual([0, 0, 0.5]);
    // Two present p-values among a million tests: absent ones are p = 1 and cost nothing.
    const padded = adjustHommel(Float64Array.of(1e-9, 2e-8), 1_000_000);
    expectClose(padded, twoAmongMany(Float64Array.of(1e-9, 2e-8), 1_000_000), 'padded');
  });
});

/**
 * Worked by hand from the closed-testing definition, for two present p-values
 * among m tests (the rest at 1; in these sets the ones are never the minimum).
 */
function twoAmongMany(p: Float64Array, m: number): number[] {
  const [p1, p2] = [p[0] as number, p[1] as number];
  // Sets containing H1 but not H2: worst is {H1} plus m - 2 absent: (m - 1) p1 / 1 (ones never the minimum).
  // Sets containing both: worst has m - 2 absent: min(m p1, m p2 / 2).
  const h1 = Math.max((m - 1) * p1, Math.min(m * p1, (m * p2) / 2));
  const h2 = Math.max((m - 1) * p2, Math.min(m * p1, (m * p2) / 2));
  return [Math.min(1, h1), Math.min(1, h2)];
}
