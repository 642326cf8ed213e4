// The pi0 estimators and their dispatcher on vectors whose answer can be
// worked by hand, and the bootstrap's choice of lambda against a slow,
// literal version of the recipe of Storey, Taylor & Siegmund (2004),
// J. R. Stat. Soc. B 66:187-205, section 6 (as we remember it).
import { describe, expect, it } from 'vitest';
import { DEFAULT_PI0_SETTINGS, PI0_MIN_TESTS, type Pi0Settings, estimatePi0 } from '../src/estimators/pi0.js';
import { BOOTSTRAP_LAMBDAS, BOOTSTRAP_RESAMPLES, pi0Bootstrap } from '../src/estimators/pi0-bootstrap.js';
import { seededUniform } from '../src/random.js';
import { pi0AtLambda } from '../src/estimators/pi0-lambda.js';
import { SPLINE_READ_AT, pi0Spline } from '../src/estimators/pi0-spline.js';
import { seededRandom } from './helpers/random.js';

const settings = (estimator: Pi0Settings['estimator'], more: Partial<Pi0Settings> = {}): Pi0Settings => ({ ...DEFAULT_PI0_SETTINGS, estimator, ...more });

// 100 p-values spread evenly, (k + 0.5) / 100: above lambda = j / 100 lie
// exactly 100 - j of them, so pi0(lambda) = (100 - j) / (100 (1 - j/100)) = 1
// at every grid value.
const evenNulls = Float64Array.from({ length: 100 }, (_, k) => (k + 0.5) / 100);
// The same 100 plus 100 p-values of 0 (never above any lambda): pi0(lambda)
// = (100 - j) / (200 (1 - j/100)) = 0.5 at every grid value.
const halfNull = Float64Array.from([...new Array<number>(100).fill(0), ...evenNulls]);

describe('hand-worked vectors', () => {
  it('fixed lambda: the counting formula, capped at 1', () => {
    expect(estimatePi0(halfNull, 200, settings('fixed')).value).toBeCloseTo(0.5, 14);
    // Above 0.25 lie 75 of the 100 evenly spread values: 75 / (100 * 0.75) = 1.
    expect(estimatePi0(evenNulls, 100, settings('fixed', { lambda: 0.25 })).value).toBeCloseTo(1, 14);
    // 10 p-values all above 0.5: 10 / (10 * 0.5) = 2, capped at 1, without a warning.
    const high = Float64Array.from({ length: 10 }, (_, k) => 0.55 + k / 25);
    expect(pi0AtLambda(high, 10, 0.5)).toBe(2);
    expect(estimatePi0(high, 10, settings('fixed'))).toEqual({ value: 1, estimator: 'fixed', tuning: { lambda: 0.5 }, fallback: null });
  });

  it('spline: a constant pi0(lambda) curve is its own smooth, read at 0.95', () => {
    expect(SPLINE_READ_AT).toBe(0.95);
    expect(pi0Spline(evenNulls, 100)).toBeCloseTo(1, 10);
    expect(pi0Spline(halfNull, 200)).toBeCloseTo(0.5, 10);
    const estimate = estimatePi0(halfNull, 200, settings('spline'));
    expect(estimate.value).toBeCloseTo(0.5, 10);
    expect(estimate.tuning).toEqual({ lambda: 0.95, df: 3 });
  });

  it('spline: absent tests count as p = 1', () => {
    // 100 zeros present, m = 200: the 100 absent lie above every lambda, so
    // pi0(lambda) = 100 / (200 (1 - lambda)) = 0.5 / (1 - lambda): 1 at 0.5,
    // rising to 10 at 0.95; the smooth is far above 1, and capped.
    const zeros = new Float64Array(100);
    expect(pi0AtLambda(zeros, 200, 0.5)).toBe(1);
    expect(pi0Spline(zeros, 200)).toBeGreaterThan(1);
    expect(estimatePi0(zeros, 200, settings('spline')).value).toBe(1);
  });

  it('bootstrap: with pi0(lambda) the same at every lambda, that value whatever lambda is chosen', () => {
    const estimate = estimatePi0(halfNull, 200, settings('bootstrap-mse'));
    expect(estimate.value).toBeCloseTo(0.5, 14);
    expect(BOOTSTRAP_LAMBDAS).toContain(estimate.tuning.lambda);
    expect(estimate.tuning).toMatchObject({ seed: 1, resamples: BOOTSTRAP_RESAMPLES });
  });
});

describe('fallbacks: pi0 = 1, and the reason is given', () => {
  it('below the minimum number of tests, for every estimator', () => {
    const few = Float64Array.of(0.001, 0.002, 0.01);
    for (const estimator of ['fixed', 'spline', 'bootstrap-mse'] as const) {
      const estimate = estimatePi0(few, few.length, settings(estimator));
      expect(estimate.value).toBe(1);
      expect(estimate.fallback).toMatch(new RegExp(`from 3 tests \\(the ${estimator} estimator needs at least ${PI0_MIN_TESTS}\\); pi0 = 1 used instead`));
    }
    // Absent tests count: 3 present out of m = 10 is enough.
    expect(estimatePi0(few, 10, settings('fixed')).fallback).toBeNull();
  });

  it('when no p-value lies above lambda (the count would say pi0 = 0)', () => {
    const small = Float64Array.from({ length: 20 }, (_, k) => (k + 1) / 100);
    const estimate = estimatePi0(small, 20, settings('fixed'));
    expect(estimate.value).toBe(1);
    expect(estimate.fallback).toMatch(/the fixed estimate of pi0 is 0 at lambda = 0.5: too few p-values above lambda/);
    const zeros = new Float64Array(50);
    for (const estimator of ['spline', 'bootstrap-mse'] as const) {
      const fallen = estimatePi0(zeros, 50, settings(estimator));
      expect(fallen.value).toBe(1);
      expect(fallen.fallback).toMatch(new RegExp(`the ${estimator} estimate of pi0 is`));
    }
  });
});

describe('bootstrap choice of lambda', () => {
  const random = seededRandom(42);
  const p = Float64Array.from({ length: 400 }, (_, i) => (i < 120 ? random() ** 6 : random())).sort();

  // The recipe, literally: resample the m p-values (absent ones as 1) B times
  // with the same generator, recount pi0*(lambda) on each sorted resample, and
  // take the lambda whose mean squared distance from min pi0(lambda) is least.
  function slowChoice(sorted: Float64Array, m: number, seed: number): { value: number; lambda: number } {
    const all = Float64Array.from({ length: m }, (_, i) => (i < sorted.length ? (sorted[i] as number) : 1));
    const observed = Array.from(BOOTSTRAP_LAMBDAS, (lambda) => pi0AtLambda(sorted, m, lambda));
    const target = Math.min(...observed);
    const uniform = seededUniform(seed);
    const mse = new Array<number>(BOOTSTRAP_LAMBDAS.length).fill(0);
    for (let b = 0; b < BOOTSTRAP_RESAMPLES; b++) {
      const resample = Float64Array.from({ length: m }, () => all[Math.floor(uniform() * m)] as number).sort();
      BOOTSTRAP_LAMBDAS.forEach((lambda, k) => {
        mse[k] = (mse[k] as number) + (pi0AtLambda(resample, m, lambda) - target) ** 2;
      });
    }
    const best = mse.indexOf(Math.min(...mse));
    return { value: observed[best] as number, lambda: BOOTSTRAP_LAMBDAS[best] as number };
  }

  it('matches the slow recipe, with and without absent tests, for several seeds', () => {
    for (const seed of [1, 2, 99]) {
      expect(pi0Bootstrap(p, p.length, seed)).toEqual(slowChoice(p, p.length, seed));
      expect(pi0Bootstrap(p, p.length + 50, seed)).toEqual(slowChoice(p, p.length + 50, seed));
    }
  });

  it('is deterministic for a seed', () => {
    expect(estimatePi0(p, p.length, settings('bootstrap-mse', { seed: 7 }))).toEqual(estimatePi0(p, p.length, settings('bootstrap-mse', { seed: 7 })));
  });

  it('draws a different stream for each seed, in [0, 1)', () => {
    const firsts = new Set([0, 1, 2, 3, 4294967295].map((seed) => seededUniform(seed)()));
    expect(firsts.size).toBe(5);
    const draws = Array.from({ length: 10_000 }, seededUniform(9));
    expect(draws.every((u) => u >= 0 && u < 1)).toBe(true);
    // Uniform (common practice): the mean of 10,000 draws is 0.5 within 4 standard errors, 4 * 0.289 / 100.
    expect(Math.abs(draws.reduce((sum, u) => sum + u, 0) / draws.length - 0.5)).toBeLessThan(0.0116);
  });
});
