// The cubic smoothing spline against R's stats::smooth.spline, and the
// properties any smoothing spline has (common practice, no source).
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { smoothingForDegreesOfFreedom, smoothingSplineFit, splineDegreesOfFreedom } from '../src/estimators/smoothing-spline.js';
import { SPLINE_LAMBDAS, pi0SplineCurve } from '../src/estimators/pi0-spline.js';
import { seededRandom } from './helpers/random.js';

interface SplineCase {
  name: string;
  p: number[];
  pi0: number[];
  allKnots: { fitted: number[]; df: number };
  defaultKnots: { fitted: number[]; df: number; knots: number };
}

// Source: R 4.2.2 stats::smooth.spline (Debian r-base-core), written by the
// committed script fixtures/reference/make-smooth-spline.R; provenance inside.
const reference = JSON.parse(readFileSync(new URL('../fixtures/reference/smooth-spline.json', import.meta.url), 'utf8')) as {
  provenance: Record<string, string>;
  lambda: number[];
  cases: SplineCase[];
};

function largestDifference(a: ArrayLike<number>, b: ArrayLike<number>): number {
  expect(a.length).toBe(b.length);
  let largest = 0;
  for (let i = 0; i < a.length; i++) largest = Math.max(largest, Math.abs((a[i] as number) - (b[i] as number)));
  return largest;
}

describe('agreement with R smooth.spline on pi0(lambda) curves', () => {
  it('has the provenance recorded and the same lambda grid', () => {
    expect(reference.provenance.library).toBe('R stats::smooth.spline');
    expect(reference.provenance.version).toMatch(/^R version/);
    expect(largestDifference(SPLINE_LAMBDAS, reference.lambda)).toBe(0);
  });

  for (const splineCase of reference.cases) {
    it(splineCase.name, () => {
      const sorted = Float64Array.from(splineCase.p).sort();
      const { raw, smoothed } = pi0SplineCurve(sorted, sorted.length);
      // pi0(lambda) itself: the same counts, so the same doubles.
      expect(largestDifference(raw, splineCase.pi0)).toBe(0);
      // At the df R reached (3 to its tolerance), the same spline: R's knots are every lambda here.
      const atRDf = smoothingSplineFit(SPLINE_LAMBDAS, raw, smoothingForDegreesOfFreedom(SPLINE_LAMBDAS, splineCase.allKnots.df));
      expect(largestDifference(atRDf, splineCase.allKnots.fitted)).toBeLessThan(1e-6);
      // At exactly 3 df, R's df tolerance (3.0003) is all that separates the two.
      expect(largestDifference(smoothed, splineCase.allKnots.fitted)).toBeLessThan(1e-4);
      // R's default call thins the knots to 61; still within 1e-4 of the exact spline.
      expect(splineCase.defaultKnots.knots).toBeLessThan(96);
      expect(largestDifference(smoothed, splineCase.defaultKnots.fitted)).toBeLessThan(1e-4);
    });
  }
});

describe('smoothing spline properties (common practice, no source)', () => {
  const random = seededRandom(3);
  const x = Float64Array.from({ length: 30 }, (_, i) => i / 10 + random() * 0.05);

  it('has n degrees of freedom with no smoothing, falling towards 2 as smoothing grows', () => {
    expect(splineDegreesOfFreedom(x, 0)).toBeCloseTo(30, 12);
    let previous = 30;
    for (const alpha of [1e-6, 1e-4, 1e-2, 1, 100, 1e4, 1e8]) {
      const df = splineDegreesOfFreedom(x, alpha);
      expect(df).toBeLessThan(previous);
      expect(df).toBeGreaterThan(2);
      previous = df;
    }
    expect(previous).toBeCloseTo(2, 3);
  });

  it('finds the smoothing for a requested df', () => {
    for (const df of [2.5, 3, 7.25, 20]) expect(splineDegreesOfFreedom(x, smoothingForDegreesOfFreedom(x, df))).toBeCloseTo(df, 9);
    expect(() => smoothingForDegreesOfFreedom(x, 2)).toThrow(RangeError);
    expect(() => smoothingForDegreesOfFreedom(x, 30)).toThrow(RangeError);
  });

  it('leaves a straight line unchanged at any smoothing, and interpolates with none', () => {
    const line = x.map((value) => 0.3 - 0.7 * value);
    const noisy = x.map(() => random());
    for (const alpha of [1e-3, 1, 1e3]) expect(largestDifference(smoothingSplineFit(x, line, alpha), line)).toBeLessThan(1e-12);
    expect(largestDifference(smoothingSplineFit(x, noisy, 0), noisy)).toBeLessThan(1e-12);
  });

  it('keeps the mean of the data (the residuals sum to zero) and does not modify its inputs', () => {
    const y = x.map(() => random());
    const copy = Float64Array.from(y);
    const fitted = smoothingSplineFit(x, y, 0.5);
    expect(y).toEqual(copy);
    const residual = y.reduce((sum, value, i) => sum + value - (fitted[i] as number), 0);
    expect(Math.abs(residual)).toBeLessThan(1e-12);
  });
});
