// The p-value diagnostics against R (fixtures/reference/make-diagnostics.R),
// against facts of the trade on seeded simulations, and by hand.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { sortedByFamily } from '../src/diagnostics/by-family.js';
import { pValueCounts } from '../src/diagnostics/counts.js';
import { discoveriesAt, discoveryCurve, thinCurve } from '../src/diagnostics/discoveries.js';
import { binOf, pValueHistogram } from '../src/diagnostics/histogram.js';
import { CHI_SQUARE_ONE_MEDIAN, chiSquareOneOfP, genomicInflation } from '../src/diagnostics/inflation.js';
import { inspectFamily } from '../src/diagnostics/inspect-family.js';
import { kolmogorovUpperTail, upperHalfUniformity } from '../src/diagnostics/uniformity.js';
import { normalUpperQuantile } from '../src/distributions/normal-quantile.js';
import { pFromStatistic } from '../src/distributions/p-from-statistic.js';
import { seededRandom } from './helpers/random.js';

const fixture = JSON.parse(readFileSync(new URL('../fixtures/reference/diagnostics.json', import.meta.url), 'utf8')) as {
  cases: { name: string; p: number[]; lambda: number; ksN: number; ksStatistic: number; ksP: number }[];
};

const tinyP = JSON.parse(readFileSync(new URL('../fixtures/reference/chi-square-tiny-p.json', import.meta.url), 'utf8')) as {
  rows: { p: number; statistic: number }[];
};

const kolmogorov = JSON.parse(readFileSync(new URL('../fixtures/reference/kolmogorov.json', import.meta.url), 'utf8')) as {
  rows: { x: number; upperTail: number }[];
};

const ascending = (values: ArrayLike<number>): Float64Array => Float64Array.from(values).sort();

function normals(random: () => number, size: number): Float64Array {
  const z = new Float64Array(size);
  for (let i = 0; i < size; i++) z[i] = Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random());
  return z;
}

describe('against R', () => {
  for (const row of fixture.cases) {
    it(`${row.name}: inflation factor to 1e-10 relative, Kolmogorov-Smirnov D to 1e-12 and its p-value to 3e-5`, () => {
      const sorted = ascending(row.p);
      expect(Math.abs((genomicInflation(sorted)?.lambda as number) / row.lambda - 1)).toBeLessThan(1e-10);
      const uniformity = upperHalfUniformity(sorted);
      expect(uniformity?.n).toBe(row.ksN);
      expect(Math.abs((uniformity?.statistic as number) - row.ksStatistic)).toBeLessThan(1e-12);
      // R computes the limiting distribution only to a tolerance of 1e-6 (off by up to 2e-5 here);
      // the sharper reference is the mpmath fixture below.
      expect(Math.abs((uniformity?.p as number) - row.ksP)).toBeLessThan(3e-5);
    });
  }
});

describe('the genomic inflation factor (Devlin & Roeder 1999)', () => {
  it('is near 1 on simulated null p-values (common practice, no source)', () => {
    const random = seededRandom(7);
    for (const size of [2_001, 50_000]) {
      const p = Float64Array.from({ length: size }, () => random());
      const lambda = genomicInflation(ascending(p))?.lambda as number;
      expect(Math.abs(lambda - 1)).toBeLessThan(size > 10_000 ? 0.03 : 0.1);
    }
  });

  it('is near 1.21 = 1.1^2 on p-values from z-scores scaled by 1.1', () => {
    const z = normals(seededRandom(11), 100_000);
    const p = z.map((value) => pFromStatistic('z', 'two', 1.1 * value));
    const lambda = genomicInflation(ascending(p))?.lambda as number;
    expect(Math.abs(lambda - 1.21)).toBeLessThan(0.03);
  });

  it('uses the median of chi-square(1), 0.4549364 (printed tables of chi-square percentage points; from memory)', () => {
    expect(CHI_SQUARE_ONE_MEDIAN).toBeCloseTo(0.4549364231195724, 12);
    expect(chiSquareOneOfP(0.05)).toBeCloseTo(3.841458820694124, 10);
    expect(chiSquareOneOfP(1e-300)).toBeGreaterThan(1370);
  });

  it('turns p-values down to the smallest subnormal into statistics as R does (qchisq(p, 1, lower.tail = FALSE), fixtures/reference/make-chi-square-tiny-p.R), to 1e-14 relative', () => {
    for (const row of tinyP.rows) expect(Math.abs(chiSquareOneOfP(row.p) / row.statistic - 1), `p = ${row.p}`).toBeLessThan(1e-14);
    // A median p-value of 5e-324 gives lambda 1481.13 / 0.45494 = 3255.7, not Infinity.
    expect(genomicInflation(ascending([5e-324, 5e-324, 5e-324]))?.lambda).toBeCloseTo(3255.7, 1);
  });

  it('is unbounded (Infinity) when half or more of the p-values are exactly 0', () => {
    expect(genomicInflation(ascending([0, 0, 0.5]))?.lambda).toBe(Infinity);
    expect(genomicInflation(ascending([0, 0, 0.5, 0.7]))?.lambda).toBe(Infinity);
    expect(genomicInflation(ascending([0, 0.3, 0.5, 0.7]))?.lambda).toBeLessThan(Infinity);
  });

  it('inverts the normal tail down to the smallest p-values', () => {
    for (const q of [0.5, 0.25, 0.025, 1e-10, 1e-100, 1e-300]) {
      const z = normalUpperQuantile(q);
      expect(Math.abs(pFromStatistic('z', 'upper', z) / q - 1)).toBeLessThan(1e-12);
    }
    // The smallest subnormal has one significant bit: only the neighbourhood can be checked.
    expect(Math.abs(normalUpperQuantile(5e-324) - 38.47)).toBeLessThan(0.1);
    expect(normalUpperQuantile(0)).toBe(Infinity);
  });
});

describe('uniformity of the upper half', () => {
  it('Kolmogorov\'s tail is continuous at the switch of series, and at its quantiles from printed tables (from memory: 1.3581 for 5%, 1.6276 for 1%)', () => {
    expect(Math.abs(kolmogorovUpperTail(1 - 1e-12) - kolmogorovUpperTail(1 + 1e-12))).toBeLessThan(1e-10);
    expect(kolmogorovUpperTail(1.3581)).toBeCloseTo(0.05, 4);
    expect(kolmogorovUpperTail(1.6276)).toBeCloseTo(0.01, 4);
    expect(kolmogorovUpperTail(0)).toBe(1);
  });

  it('Kolmogorov\'s tail agrees with mpmath to 1e-13 (fixtures/reference/make-kolmogorov.py)', () => {
    for (const row of kolmogorov.rows) expect(Math.abs(kolmogorovUpperTail(row.x) - row.upperTail), `x = ${row.x}`).toBeLessThan(1e-13);
  });

  it('is null without p-values above 0.5', () => {
    expect(upperHalfUniformity(ascending([0.1, 0.5]))).toBeNull();
  });
});

describe('counts, histogram, families', () => {
  it('counts by hand', () => {
    expect(pValueCounts(ascending([0, 0, 0.01, 0.04, 0.05, 0.5, 1, 1]), 3)).toEqual({ tested: 8, missing: 3, zeros: 2, ones: 2, distinct: 6, below05: 4 });
  });

  it('bins [k/B, (k+1)/B), the last closed at 1, with the uniform and pi0 levels', () => {
    const histogram = pValueHistogram(Float64Array.from([0, 0.049, 0.05, 0.5, 0.99, 1]), 20, 0.5);
    expect(Array.from(histogram.counts).filter((count, k) => count > 0 || k === 0)).toEqual([2, 1, 1, 2]);
    expect(histogram.counts[19]).toBe(2);
    expect(histogram.uniformLevel).toBe(0.3);
    expect(histogram.pi0Level).toBeCloseTo(0.15, 15);
  });

  it('puts values on a bin edge k/B in bin k even when p * B rounds below k (0.29 * 100 = 28.999999999999996)', () => {
    expect(binOf(0.29, 100)).toBe(29);
    for (const bins of [50, 100, 200]) {
      for (let k = 0; k < bins; k++) {
        // The edge as a table prints it (four decimals), and as the double k / bins.
        for (const edge of [Number((k / bins).toFixed(4)), k / bins]) expect(binOf(edge, bins), `${edge} with ${bins} bins`).toBe(k);
        // The largest double below the edge belongs to the bin before.
        if (k > 0) expect(binOf((k / bins) * (1 - Number.EPSILON), bins)).toBe(k - 1);
      }
      expect(binOf(1, bins)).toBe(bins - 1);
      expect(binOf(0, bins)).toBe(0);
    }
  });

  it('marks pi0 at Storey\'s estimate with lambda = 0.5, capped at 1', () => {
    const sorted = ascending([0.01, 0.02, 0.6, 0.7]);
    expect(inspectFamily(sorted, 0, 10).pi0).toBe(1);
    expect(inspectFamily(ascending([0.01, 0.02, 0.03, 0.7]), 0, 10).pi0).toBe(0.5);
  });

  it('splits by family without changing the input', () => {
    const p = Float64Array.from([0.3, NaN, 0.1, 0.2]);
    const { sorted, missing } = sortedByFamily(p, { ids: Int32Array.from([0, 1, 1, 0]), count: 2 });
    expect(sorted.map((values) => Array.from(values))).toEqual([[0.2, 0.3], [0.1]]);
    expect(Array.from(missing)).toEqual([0, 1]);
    expect(Array.from(p)).toEqual([0.3, NaN, 0.1, 0.2]);
  });
});

describe('discoveries against the level', () => {
  it('steps up at each distinct adjusted value up to the largest level, ties in one step', () => {
    const sorted = Float64Array.from([0, 0.01, 0.01, 0.04, 0.3]);
    expect(discoveryCurve(sorted, 0.25)).toEqual({ levels: [0, 0.01, 0.04], counts: [1, 3, 4] });
    expect(discoveriesAt(sorted, 0.01)).toBe(3);
    expect(discoveriesAt(sorted, 0.009)).toBe(1);
    expect(discoveryCurve(Float64Array.from([0.5]), 0.25)).toEqual({ levels: [0], counts: [0] });
  });

  it('merges steps closer than the resolution into the last of them, but keeps the one at alpha', () => {
    const sorted = Float64Array.from({ length: 1000 }, (_, i) => (i + 1) / 4000);
    const curve = discoveryCurve(sorted, 0.25);
    const thin = thinCurve(curve, 0.01, 0.0505);
    expect(thin.levels.length).toBeLessThan(40);
    // Every kept step is a step of the full curve, with its count.
    thin.levels.forEach((level, i) => expect(thin.counts[i]).toBe(discoveriesAt(sorted, level)));
    const atAlpha = thin.levels.filter((level) => level <= 0.0505).length - 1;
    expect(thin.counts[atAlpha]).toBe(discoveriesAt(sorted, 0.0505));
  });
});
