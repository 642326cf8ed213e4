// The two-stage procedure of Benjamini, Krieger & Yekutieli (2006),
// Biometrika 93:491-507, Definition 6: its adjusted values against a
// brute-force search over levels, and its decisions against statsmodels.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { adjustBenjaminiHochberg } from '../src/procedures/benjamini-hochberg.js';
import { adjustBky, bkySorted } from '../src/procedures/bky.js';
import { awkwardPValues, seededRandom } from './helpers/random.js';

/** Number rejected by BH at level q among the present p-values (m counts absent tests as p = 1): largest i with p(i) <= i q / m. */
function bhCount(sorted: readonly number[], m: number, q: number): number {
  let count = 0;
  sorted.forEach((p, i) => {
    if (p <= ((i + 1) * q) / m) count = i + 1;
  });
  // Absent tests (p = 1) are rejected only when 1 <= i q / m for some i > present, i.e. q >= 1 at i = m.
  return q >= 1 && sorted.length < m ? m : count;
}

/** Definition 6, step by step, at level alpha: how many of the ascending p-values are rejected. */
function bkyRejectedCount(sorted: readonly number[], m: number, alpha: number): number {
  const first = alpha / (1 + alpha);
  const r1 = bhCount(sorted, m, first);
  if (r1 === 0) return 0;
  if (r1 === m) return sorted.length;
  return Math.min(sorted.length, bhCount(sorted, m, (first * m) / (m - r1)));
}

describe('bky adjusted values: the smallest level that rejects', () => {
  const random = seededRandom(2006);

  it('agree with a bisection over levels of the procedure as defined, on small random vectors', () => {
    const differences: string[] = [];
    for (let trial = 0; trial < 300; trial++) {
      const n = 1 + Math.floor(random() * 12);
      const m = n + (trial % 3 === 0 ? Math.floor(random() * 5) : 0);
      const p = trial % 2 === 0 ? awkwardPValues(random, n) : Float64Array.from({ length: n }, () => random() ** 4);
      const sorted = Array.from(p).sort((a, b) => a - b);
      const adjusted = bkySorted(Float64Array.from(sorted), m);
      sorted.forEach((_, i) => {
        // The rejections grow with the level, so the smallest level rejecting i is found by bisection.
        const rejects = (alpha: number): boolean => bkyRejectedCount(sorted, m, alpha) > i;
        let expected = 1;
        if (rejects(0)) expected = 0;
        else if (rejects(1 - 1e-15)) {
          let low = 0;
          let high = 1 - 1e-15;
          for (let step = 0; step < 200; step++) {
            const mid = (low + high) / 2;
            if (rejects(mid)) high = mid;
            else low = mid;
          }
          expected = high;
        }
        const got = adjusted[i] as number;
        if (!(Math.abs(got - expected) <= 1e-12 * Math.max(expected, 1e-300) + 1e-15)) differences.push(`trial ${trial}, m ${m}, p ${sorted}: #${i} got ${got}, search ${expected}`);
      });
    }
    expect(differences).toEqual([]);
  });

  it('reject exactly where the procedure rejects, at many levels', () => {
    const mismatches: string[] = [];
    for (let trial = 0; trial < 100; trial++) {
      const n = 2 + Math.floor(random() * 30);
      const sorted = Array.from({ length: n }, () => random() ** 3).sort((a, b) => a - b);
      const adjusted = bkySorted(Float64Array.from(sorted), n);
      for (let level = 0.001; level < 0.6; level += 0.0137) {
        const expected = bkyRejectedCount(sorted, n, level);
        const got = adjusted.filter((value) => value <= level).length;
        if (got !== expected) mismatches.push(`trial ${trial} level ${level}: ${got} vs ${expected}`);
      }
    }
    expect(mismatches).toEqual([]);
  });

  it('rejects at least what BH rejects at level alpha / (1 + alpha)', () => {
    for (let trial = 0; trial < 50; trial++) {
      const p = awkwardPValues(random, 1 + Math.floor(random() * 200));
      const bky = adjustBky(p);
      const bh = adjustBenjaminiHochberg(p);
      // Stage 1 alone already rejects where BH <= alpha / (1 + alpha), that is at alpha = BH / (1 - BH).
      const above = Array.from(bky.keys()).filter((i) => (bh[i] as number) < 0.5 && (bky[i] as number) > (bh[i] as number) / (1 - (bh[i] as number)) * (1 + 1e-12));
      expect(above).toEqual([]);
    }
  });
});

interface StatsmodelsResult {
  alpha: number;
  rejected: boolean[];
  corrected: number[];
  m0: number;
  alphaStages: number[];
}

// Source: statsmodels 0.13.5 (Debian python3-statsmodels),
// fdrcorrection_twostage(p, alpha, method='bky'), written by the committed
// script fixtures/reference/make-bky-statsmodels.py; provenance inside.
const reference = JSON.parse(readFileSync(new URL('../fixtures/reference/bky-statsmodels.json', import.meta.url), 'utf8')) as {
  provenance: Record<string, string>;
  cases: { name: string; p: number[]; results: StatsmodelsResult[] }[];
};

describe('agreement with statsmodels fdrcorrection_twostage (bky)', () => {
  it('has the provenance recorded', () => {
    expect(reference.provenance.library).toBe('statsmodels.stats.multitest.fdrcorrection_twostage');
    expect(reference.provenance.version).toMatch(/^statsmodels \d/);
  });

  for (const referenceCase of reference.cases) {
    it(referenceCase.name, () => {
      const p = Float64Array.from(referenceCase.p);
      const m = p.length;
      const adjusted = adjustBky(p);
      const bh = adjustBenjaminiHochberg(p);
      for (const result of referenceCase.results) {
        const { alpha } = result;
        // The same decisions: ours are "adjusted value <= alpha".
        const ours = Array.from(adjusted, (value) => value <= alpha);
        expect(ours).toEqual(result.rejected);
        // statsmodels' corrected values hold for this alpha only: BH times
        // (1 + alpha), times m0 / m with m0 = m - r1 when the first stage
        // rejected some but not all. Rebuilt from our BH and our first stage:
        // When the first stage rejects nothing or everything, statsmodels 0.13.5
        // returns early, before putting its values back in input order: they
        // come in ascending order of p (so do its decisions, which are then
        // all equal and cannot show it).
        const r1 = bh.filter((value) => value <= alpha / (1 + alpha)).length;
        const early = r1 === 0 || r1 === m;
        const factor = (1 + alpha) * (early ? 1 : (m - r1) / m);
        const bhInTheirOrder = early ? Float64Array.from(bh).sort() : bh;
        const worst = Math.max(...result.corrected.map((value, i) => Math.abs(value - (bhInTheirOrder[i] as number) * factor) / Math.max(value, 1e-300)));
        expect(worst).toBeLessThan(1e-12);
        // Its stage levels: alpha / (1 + alpha), then that times m / (m - r1).
        expect(result.alphaStages[0]).toBeCloseTo(alpha / (1 + alpha), 15);
        if (r1 > 0 && r1 < m) expect(result.alphaStages[1]).toBeCloseTo(((alpha / (1 + alpha)) * m) / (m - r1), 14);
        // Its m0 is m minus the final rejections.
        expect(result.m0).toBe(m - ours.filter(Boolean).length);
      }
    });
  }
});
